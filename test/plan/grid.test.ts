import { describe, expect, it } from 'vitest';
import { allocatePointBatch } from '../../src/plan/index.js';
import { fillPieces, fillRange, planSweep, rows, specWith } from './helpers.js';

describe('grid design', () => {
  const spec = specWith({ kind: 'grid' });
  const plan = planSweep(spec);

  it('counts the full factorial', () => {
    expect(plan.count).toBe(8 * 4 * 5 * 6);
    expect(plan.design).toBe('grid');
    expect(plan.axisNames).toEqual(['tp_c', 'water_ppm', 'lid_km', 'upwelling_mm_yr']);
    expect(plan.hasBlocks).toBe(false);
    expect(plan.layout).toEqual({ kind: 'grid', axes: spec.axes.map((a) => ({ name: a.name, values: a.values })) });
  });

  it('varies the last axis fastest (mixed radix in spec order)', () => {
    const all = rows(fillRange(plan, 0, plan.count));
    const [tp, w, lid, up] = spec.axes.map((a) => a.values);
    let i = 0;
    for (const a of tp) for (const b of w) for (const c of lid) for (const d of up) expect(all[i++]).toEqual([a, b, c, d]);
    expect(all[0]).toEqual([1280, 0, 0, 2]);
    expect(all[1][3]).toBeCloseTo(2 * 40 ** (1 / 5), 12);
    expect(all[6]).toEqual([1280, 0, 10, 2]);
  });

  it('gives the same points for any split of the range', () => {
    const whole = fillRange(plan, 0, plan.count);
    const pieces = fillPieces(plan, [0, 1, 7, 29, 30, 31, 400, 959, 960]);
    expect(pieces).toEqual(whole);
    expect(fillRange(plan, 123, 456)).toEqual(fillPieces(plan, [123, 200, 201, 456]));
  });

  it('fills constant columns with the fixed value or the default (NaN for no upwelling)', () => {
    const p = planSweep(specWith({ kind: 'grid' }, { tp_c: { values: [1300, 1400] } }));
    const b = fillRange(p, 0, 2);
    expect(Array.from(b.inputs.tp_c)).toEqual([1300, 1400]);
    expect(Array.from(b.inputs.water_ppm)).toEqual([0, 0]);
    expect(Array.from(b.inputs.lid_km)).toEqual([0, 0]);
    expect(Array.from(b.inputs.upwelling_mm_yr).every(Number.isNaN)).toBe(true);
  });

  it('checks the range and the batch', () => {
    expect(() => plan.fill(-1, 3, allocatePointBatch(plan.inputNames, 4, false))).toThrow(RangeError);
    expect(() => plan.fill(0, plan.count + 1, allocatePointBatch(plan.inputNames, plan.count + 1, false))).toThrow(RangeError);
    expect(() => plan.fill(0, 10, allocatePointBatch(plan.inputNames, 5, false))).toThrow(/out.inputs.tp_c holds 5 rows, needs 10/);
    plan.fill(5, 5, allocatePointBatch(plan.inputNames, 0, false));
  });

  it('a 10-million-point grid is planned and filled lazily at any offset', () => {
    const big = planSweep(
      specWith(
        { kind: 'grid' },
        {
          tp_c: { from: 1100, to: 1800, count: 100 },
          water_ppm: { from: 0, to: 1000, count: 100 },
          lid_km: { from: 0, to: 100, count: 100 },
          upwelling_mm_yr: { from: 1, to: 100, count: 10 },
        },
      ),
    );
    expect(big.count).toBe(10_000_000);
    const last = rows(fillRange(big, big.count - 2, big.count));
    expect(last[1]).toEqual([1800, 1000, 100, 100]);
    expect(last[0]).toEqual([1800, 1000, 100, 89]);
  });
});
