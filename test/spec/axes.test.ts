import { describe, expect, it } from 'vitest';
import { validateSweep } from '../../src/spec/index.js';

/** The normalized axis of a one-axis grid sweep (tp_c fixed unless it is the axis). */
function axis(name: string, body: Record<string, unknown>, design: Record<string, unknown> = { kind: 'grid' }) {
  const raw = { axes: { [name]: body }, fixed: name === 'tp_c' ? {} : { tp_c: 1350 }, design };
  return validateSweep(raw).axes[0];
}

describe('axis ranges', () => {
  it('step includes the endpoint without floating drift: 1280 to 1420 step 20 is 8 values', () => {
    const a = axis('tp_c', { from: 1280, to: 1420, step: 20 });
    expect(a.values).toEqual([1280, 1300, 1320, 1340, 1360, 1380, 1400, 1420]);
    expect(a.min).toBe(1280);
    expect(a.max).toBe(1420);
    expect(a.scale).toBe('linear');
  });

  it('decimal steps give clean decimals and land on the endpoint', () => {
    expect(axis('lid_km', { from: 0, to: 1, step: 0.1 }).values).toEqual([0, 0.1, 0.2, 0.3, 0.4, 0.5, 0.6, 0.7, 0.8, 0.9, 1]);
    expect(axis('upwelling_mm_yr', { from: 0.3, to: 0.9, step: 0.2 }).values).toEqual([0.3, 0.5, 0.7, 0.9]);
  });

  it('a step that does not land on `to` is refused (ranges include `to`), naming the last value it would reach', () => {
    expect(() => axis('lid_km', { from: 0, to: 10, step: 3 })).toThrow(
      'axes.lid_km.step: 3 does not divide the range 0 to 10: the values would stop at 9 and leave 10 out; give a step that lands on 10, use count, or write to: 9 if that is what you want',
    );
    expect(axis('lid_km', { from: 0, to: 9, step: 3 }).values).toEqual([0, 3, 6, 9]);
  });

  it('descending ranges with a negative step', () => {
    const a = axis('lid_km', { from: 40, to: 0, step: -10 });
    expect(a.values).toEqual([40, 30, 20, 10, 0]);
    expect([a.min, a.max]).toEqual([0, 40]);
  });

  it('count includes both ends, evenly spaced', () => {
    expect(axis('lid_km', { from: 0, to: 40, count: 5 }).values).toEqual([0, 10, 20, 30, 40]);
    expect(axis('tp_c', { from: 1300, to: 1300, count: 1 }).values).toEqual([1300]);
  });

  it('log count spacing is geometric, ends exact', () => {
    const v = axis('upwelling_mm_yr', { from: 2, to: 80, count: 6, scale: 'log' }).values;
    expect(v).toHaveLength(6);
    expect(v[0]).toBe(2);
    expect(v[5]).toBe(80);
    const ratio = (80 / 2) ** (1 / 5);
    for (let i = 1; i < v.length; i++) expect(v[i] / v[i - 1]).toBeCloseTo(ratio, 12);
    expect(axis('water_ppm', { from: 1, to: 1000, count: 4, scale: 'log' }).values).toEqual([1, 10, 100, 1000]);
  });

  it('values keep file order', () => {
    expect(axis('water_ppm', { values: [200, 0, 50] }).values).toEqual([200, 0, 50]);
    const a = axis('water_ppm', { values: [200, 0, 50] });
    expect([a.min, a.max]).toEqual([0, 200]);
  });

  it('random designs sample [min, max]: a values axis contributes its span, a bare from/to is allowed', () => {
    const lhs = { kind: 'latin-hypercube', samples: 10, seed: 1 };
    const v = axis('water_ppm', { values: [50, 0, 400, 100] }, lhs);
    expect([v.min, v.max]).toEqual([0, 400]);
    const r = axis('tp_c', { from: 1300, to: 1450 }, lhs);
    expect(r.values).toEqual([1300, 1450]);
    expect([r.min, r.max]).toEqual([1300, 1450]);
  });
});
