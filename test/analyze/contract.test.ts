import { describe, expect, expectTypeOf, it } from 'vitest';
import type { DesignLayout } from '../../src/plan/types.js';
import { InputError } from '../../src/errors.js';
import { analyzeSensitivity, type AnalysisLayout } from '../../src/analyze/index.js';
import { gridTable, linspace, saltelliTable } from './helpers.js';

describe('layout contract with the planner', () => {
  it("the plan's DesignLayout is accepted as an analysis layout (checked by tsc)", () => {
    expectTypeOf<DesignLayout>().toExtend<AnalysisLayout>();
    const axes = [
      { name: 'tp_c', values: linspace(1300, 1400, 3) },
      { name: 'lid_km', values: [0, 10] },
    ] as const;
    const layout: DesignLayout = { kind: 'grid', axes: axes.map((a) => ({ name: a.name, values: [...a.values] })) };
    const g = gridTable(axes.map((a) => ({ name: a.name, values: [...a.values] })), (x) => x[0] - x[1]);
    const r = analyzeSensitivity({ inputs: g.inputs, outputs: { crust_km: g.y }, layout });
    expect(r.inputs).toEqual(['tp_c', 'lid_km']);
    expect(r.records.filter((q) => q.measure === 'S1').length).toBe(2);
  });

  it('records come per output, per input in layout order, per measure', () => {
    const axes = [{ name: 'b', values: [1, 2, 3] }, { name: 'a', values: [1, 2] }];
    const g = gridTable(axes, (x) => x[0] + x[1]);
    const r = analyzeSensitivity({ inputs: g.inputs, outputs: { y: g.y, z: g.y } , layout: { kind: 'grid', axes } }, { outputs: ['z'] });
    expect(r.outputs).toEqual(['z']);
    expect(r.records.map((q) => `${q.output}.${q.input}.${q.measure}`)).toEqual(
      ['b', 'a'].flatMap((i) =>
        ['S1', 'ST', 'elasticity_median', 'elasticity_p10', 'elasticity_p90', 'slope_norm_median', 'slope_norm_p10', 'slope_norm_p90'].map((m) => `z.${i}.${m}`),
      ),
    );
    const noLocal = analyzeSensitivity({ inputs: g.inputs, outputs: { y: g.y }, layout: { kind: 'grid', axes } }, { local: false });
    expect(noLocal.records.map((q) => q.measure)).toEqual(['S1', 'ST', 'S1', 'ST']);
  });
});

describe('named errors with hints', () => {
  const axes = [{ name: 'a', values: [1, 2, 3] }, { name: 'b', values: [10, 20] }];
  const g = gridTable(axes, (x) => x[0] * x[1]);

  function errorOf(f: () => unknown): InputError {
    try {
      f();
    } catch (e) {
      if (e instanceof InputError) return e;
      throw e;
    }
    throw new Error('expected an InputError');
  }

  it('a column of the wrong length', () => {
    const e = errorOf(() => analyzeSensitivity({ inputs: g.inputs, outputs: { y: g.y.slice(1) }, layout: { kind: 'grid', axes } }));
    expect(e.message).toBe('analyze: output column "y" has 5 rows but the design layout (grid a(3) x b(2)) has 6 rows. Hint: pass the whole table in design row order.');
  });

  it('a missing input column and an unknown output', () => {
    const e = errorOf(() => analyzeSensitivity({ inputs: { a: g.inputs.a }, outputs: { y: g.y }, layout: { kind: 'grid', axes } }, { outputs: ['y', 'w'] }));
    expect(e.problems).toEqual(['analyze: input column "b" is missing; the layout sweeps a, b.', 'analyze: output "w" is not in the table (outputs: y).']);
  });

  it('grid rows in another order than the layout', () => {
    const swapped = [axes[1], axes[0]];
    const e = errorOf(() => analyzeSensitivity({ inputs: g.inputs, outputs: { y: g.y }, layout: { kind: 'grid', axes: swapped } }));
    expect(e.message).toBe(
      'analyze: grid input "b" at row 1 is 20 but the layout gives 10 there. Hint: grid rows are mixed-radix over the axes in layout order, the last axis fastest.',
    );
  });

  it('a saltelli table whose length is not base x (inputs + 2)', () => {
    const col = new Float64Array(9);
    const e = errorOf(() => analyzeSensitivity({ inputs: { a: col, b: col }, outputs: { y: col }, layout: { kind: 'saltelli', base: 2, inputs: ['a', 'b'] } }));
    expect(e.message).toContain('has 9 rows but the design layout (saltelli base 2 x (2 inputs + 2)) has 8 rows');
  });

  it('saltelli blocks in another input order than the layout', () => {
    const N = 4;
    const A = Float64Array.from({ length: 2 * N }, (_, i) => i);
    const B = Float64Array.from({ length: 2 * N }, (_, i) => 100 + i);
    const t = saltelliTable(A, B, N, ['p', 'q'], (x) => x[0] + 2 * x[1]);
    const e = errorOf(() => analyzeSensitivity({ inputs: t.inputs, outputs: { y: t.y }, layout: { kind: 'saltelli', base: N, inputs: ['q', 'p'] } }));
    expect(e.message).toBe(
      'analyze: saltelli row 8 (block AB of "q", base sample 0) has q = 1 but B has 101. Hint: block 2 + i must be A with column i taken from B, i over the inputs in layout order.',
    );
    expect(() => analyzeSensitivity({ inputs: t.inputs, outputs: { y: t.y }, layout: { kind: 'saltelli', base: N, inputs: ['p', 'q'] } })).not.toThrow();
  });

  it('options out of range', () => {
    const e = errorOf(() => analyzeSensitivity({ inputs: g.inputs, outputs: { y: g.y }, layout: { kind: 'grid', axes } }, { confidence: 95, bins: 1 }));
    expect(e.problems).toEqual([
      'analyze: confidence must lie between 0 and 1 (e.g. 0.95), got 95.',
      'analyze: bins must be a whole number >= 2, got 1.',
    ]);
  });

  it('a grid axis with repeated values', () => {
    const e = errorOf(() => analyzeSensitivity({ inputs: g.inputs, outputs: { y: g.y }, layout: { kind: 'grid', axes: [{ name: 'a', values: [1, 1, 3] }, axes[1]] } }));
    expect(e.message).toBe('analyze: grid axis "a" repeats a value. Hint: grid axis values must be distinct.');
  });
});
