/**
 * Latin hypercube design (McKay, Beckman & Conover 1979): N samples; on every axis each of the
 * N equal-probability strata holds exactly one sample. Computed point by point:
 *   u(i, axis) = (perm_axis(i) + jitter(axis, i)) / N,
 * where perm_axis is a seeded bijection of [0, N) (Feistel network with cycle walking, no table)
 * and jitter is a counter-based hash in [0, 1). Memory is O(1) per axis whatever N; the same
 * seed gives the same points on every machine and for any split of the index range.
 * Strata are equal in u, so on a log axis they are equal in ln x.
 */
import { inputsOfSpec } from '../process/registry.js';
import type { SweepSpec } from '../spec/types.js';
import { buildPlan } from './build-plan.js';
import { deriveKey, hashUnit } from './mix.js';
import { makePermutation } from './permutation.js';
import type { Plan } from './types.js';
import { mapUnitsToAxis } from './unit-to-axis.js';

/** Stream tags: keep permutation keys and jitter keys of one seed independent. */
const STREAM_PERMUTATION = 0x1a7e;
const STREAM_JITTER = 0x0b17;

/** Plan of a `latin-hypercube` design. Keys depend on the seed and the input name (not its axis position). */
export function planLatinHypercube(spec: SweepSpec): Plan {
  const design = spec.design;
  if (design.kind !== 'latin-hypercube') throw new TypeError(`planLatinHypercube needs a latin-hypercube design, got ${design.kind}`);
  const n = design.samples;
  // the tag of an input is its position in the process's input list (decompression: tp_c 0 .. upwelling_mm_yr 3)
  const inputNames = inputsOfSpec(spec).map((i) => i.name);
  const axes = spec.axes.map((axis) => {
    const tag = inputNames.indexOf(axis.name);
    return {
      name: axis.name,
      perm: makePermutation(n, deriveKey(design.seed, STREAM_PERMUTATION, tag)),
      jitterKey: deriveKey(design.seed, STREAM_JITTER, tag),
      axis,
    };
  });
  const inputs = Object.freeze(spec.axes.map((a) => a.name));
  return buildPlan({
    spec,
    count: n,
    layout: Object.freeze({ kind: 'latin-hypercube', samples: n, inputs }),
    hasBlocks: false,
    fillSwept(start, end, out) {
      for (const { name, perm, jitterKey, axis } of axes) {
        const col = out.inputs[name];
        for (let i = start, o = 0; i < end; i++, o++) col[o] = (perm.apply(i) + hashUnit(jitterKey, i)) / n;
        mapUnitsToAxis(axis, col, 0, end - start);
      }
    },
  });
}
