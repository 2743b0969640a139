import { describe, expect, it } from 'vitest';
import { makeSobolTable, sobolDirectionNumbers, sobolUnit, SOBOL_MAX_DIMENSIONS } from '../../src/plan/index.js';
import { JOE_KUO_2008_ROWS } from '../../src/plan/sobol-directions.js';
import { sobolWord } from '../../src/plan/sobol.js';
import { fillPieces, fillRange, planSweep, specWith } from './helpers.js';

/** The first n points of dimension dim (0-based) of the unshifted sequence. */
function firstPoints(dim: number, n: number): number[] {
  const table = makeSobolTable(dim + 1);
  return Array.from({ length: n }, (_, j) => sobolUnit(table, dim, j));
}

describe('Sobol sequence (Joe & Kuo 2008 direction numbers)', () => {
  it('reproduces the published first points of dimensions 1-3', () => {
    // Gray-code order Sobol points, dims 1 and 2 (Bratley & Fox 1988; Joe & Kuo 2008), from memory
    expect(firstPoints(0, 8)).toEqual([0, 0.5, 0.75, 0.25, 0.375, 0.875, 0.625, 0.125]);
    expect(firstPoints(1, 8)).toEqual([0, 0.5, 0.25, 0.75, 0.375, 0.875, 0.125, 0.625]);
    // dim 3 (s = 2, a = 1, m = 1, 3), worked out by hand from the recurrence; matches memory
    expect(firstPoints(2, 8)).toEqual([0, 0.5, 0.25, 0.75, 0.625, 0.125, 0.875, 0.375]);
  });

  it('every table row is a primitive polynomial with valid initial numbers, all distinct', () => {
    const seen = new Set<string>();
    for (const [d, s, a, ...m] of JOE_KUO_2008_ROWS) {
      expect(m).toHaveLength(s);
      m.forEach((mi, i) => {
        expect(mi % 2).toBe(1);
        expect(mi).toBeLessThan(2 ** (i + 1));
      });
      // polynomial x^s + c_1 x^(s-1) + ... + c_(s-1) x + 1 as a bit mask
      const poly = (1 << s) | (a << 1) | 1;
      // primitive: the order of x modulo poly is 2^s - 1
      let x = 1;
      let order = 0;
      do {
        x <<= 1;
        if (x & (1 << s)) x ^= poly;
        order++;
      } while (x !== 1 && order <= 2 ** s);
      expect(order, `dimension ${d}`).toBe(2 ** s - 1);
      seen.add(`${s}/${a}`);
    }
    expect(seen.size).toBe(JOE_KUO_2008_ROWS.length);
    expect(JOE_KUO_2008_ROWS.length).toBe(SOBOL_MAX_DIMENSIONS - 1);
  });

  it('every dimension puts one of the first 2^m points in each interval of width 2^-m', () => {
    for (let dim = 0; dim < 8; dim++) {
      for (const m of [3, 6, 10]) {
        const hits = new Uint8Array(2 ** m);
        for (const u of firstPoints(dim, 2 ** m)) hits[Math.floor(u * 2 ** m)]++;
        expect(hits.every((h) => h === 1)).toBe(true);
      }
    }
  });

  it('dimensions 1-2 form a (0, m, 2)-net: one point per elementary box of area 2^-m', () => {
    const m = 8;
    const n = 2 ** m;
    const x = firstPoints(0, n);
    const y = firstPoints(1, n);
    for (let a = 0; a <= m; a++) {
      const hits = new Uint16Array(n);
      for (let j = 0; j < n; j++) hits[Math.floor(x[j] * 2 ** a) * 2 ** (m - a) + Math.floor(y[j] * 2 ** (m - a))]++;
      expect(hits.every((h) => h === 1)).toBe(true);
    }
  });

  it('the direct formula and the Gray-code stepping agree anywhere below 2^32', () => {
    const v = sobolDirectionNumbers(5);
    for (const start of [0, 1000, 2 ** 31 - 3, 2 ** 32 - 9]) {
      let x = sobolWord(v, start);
      for (let j = start + 1; j < start + 8; j++) {
        x = (x ^ v[31 - Math.clz32(j & -j)]) >>> 0;
        expect(x).toBe(sobolWord(v, j));
      }
    }
  });
});

describe('sobol design', () => {
  const spec = specWith({ kind: 'sobol', samples: 1000 });
  const plan = planSweep(spec);

  it('maps dimension a + 1 to axis a, skip shifting the index', () => {
    expect(plan.count).toBe(1000);
    expect(plan.layout).toEqual({ kind: 'sobol', samples: 1000, inputs: ['tp_c', 'water_ppm', 'lid_km', 'upwelling_mm_yr'] });
    const b = fillRange(plan, 0, 4);
    expect(Array.from(b.inputs.tp_c)).toEqual([1280, 1350, 1385, 1315]);
    expect(Array.from(b.inputs.water_ppm)).toEqual([0, 100, 50, 150]);
    const skipped = fillRange(planSweep(specWith({ kind: 'sobol', samples: 1000, skip: 2 })), 0, 2);
    expect(Array.from(skipped.inputs.tp_c)).toEqual([1385, 1315]);
  });

  it('samples log axes log-uniformly', () => {
    const b = fillRange(plan, 0, 2);
    expect(b.inputs.upwelling_mm_yr[0]).toBe(2);
    expect(b.inputs.upwelling_mm_yr[1]).toBeCloseTo(Math.sqrt(2 * 80), 10);
  });

  it('gives the same points for any split of the range', () => {
    expect(fillPieces(plan, [0, 1, 2, 3, 500, 999, 1000])).toEqual(fillRange(plan, 0, 1000));
  });

  it('a seed applies a reproducible digital shift that keeps the stratification', () => {
    const a = fillRange(planSweep(specWith({ kind: 'sobol', samples: 256, seed: 7 })), 0, 256);
    const again = fillRange(planSweep(specWith({ kind: 'sobol', samples: 256, seed: 7 })), 0, 256);
    const other = fillRange(planSweep(specWith({ kind: 'sobol', samples: 256, seed: 8 })), 0, 256);
    expect(again).toEqual(a);
    expect(other.inputs.tp_c).not.toEqual(a.inputs.tp_c);
    expect(a.inputs.tp_c[0]).not.toBe(1280);
    const hits = new Uint8Array(256);
    for (const v of a.inputs.tp_c) hits[Math.floor(((v - 1280) / 140) * 256)]++;
    expect(hits.every((h) => h === 1)).toBe(true);
  });
});
