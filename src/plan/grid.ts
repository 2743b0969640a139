/**
 * Grid design: the full factorial of the axis values. Row index is mixed-radix over the axes
 * in spec order, the last axis fastest. fill() writes one column at a time: axis a repeats each
 * of its values for a run of (product of the later axis sizes) rows, starting from the digit of
 * `start`, so a fill costs one pass per axis and nothing proportional to the grid.
 */
import type { SweepSpec } from '../spec/types.js';
import { buildPlan } from './build-plan.js';
import type { Plan } from './types.js';

/** Plan of a `grid` design: count = product of the axis lengths (1 with no axes). */
export function planGrid(spec: SweepSpec): Plan {
  if (spec.design.kind !== 'grid') throw new TypeError(`planGrid needs a grid design, got ${spec.design.kind}`);
  const k = spec.axes.length;
  const sizes = spec.axes.map((a) => a.values.length);
  const values = spec.axes.map((a) => Float64Array.from(a.values));
  const count = sizes.reduce((n, s) => n * s, 1);
  const layout = Object.freeze({
    kind: 'grid' as const,
    axes: Object.freeze(spec.axes.map((a) => Object.freeze({ name: a.name, values: a.values }))),
  });
  return buildPlan({
    spec,
    count,
    layout,
    hasBlocks: false,
    fillSwept(start, end, out) {
      const n = end - start;
      // axis a holds each value for a run of `stride` rows (the product of the later axis sizes)
      let stride = 1;
      for (let a = k - 1; a >= 0; a--) {
        const size = sizes[a];
        const vals = values[a];
        const col = out.inputs[spec.axes[a].name];
        let idx = Math.floor(start / stride) % size;
        let row = 0;
        let run = stride - (start % stride);
        while (row < n) {
          const stop = Math.min(n, row + run);
          const v = vals[idx];
          for (let i = row; i < stop; i++) col[i] = v;
          row = stop;
          run = stride;
          if (++idx === size) idx = 0;
        }
        stride *= size;
      }
    },
  });
}
