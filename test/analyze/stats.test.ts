import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { percentilesByBracket, percentilesInPlace, selectInPlace } from '../../src/analyze/stats.js';
import { percentileInterval } from '../../src/analyze/bootstrap.js';
import { createRng, deriveSeed } from '../../src/analyze/rng.js';
import { lcg } from './helpers.js';

/** Reference: definition 7 of Hyndman & Fan (1996) on a fully sorted copy. */
function reference(values: ArrayLike<number>, p: number): number {
  const s = Array.from(values).sort((a, b) => a - b);
  const h = (s.length - 1) * p;
  const k = Math.floor(h);
  return k + 1 < s.length ? s[k] + (h - k) * (s[k + 1] - s[k]) : s[k];
}

const PS = [0.1, 0.5, 0.9];

describe('selection and percentiles', () => {
  it('selectInPlace puts the rank-k value at k with smaller values before it', () => {
    fc.assert(
      fc.property(fc.array(fc.integer({ min: -5, max: 5 }), { minLength: 1, maxLength: 60 }), fc.nat(), (arr, kk) => {
        const a = Float64Array.from(arr);
        const k = kk % a.length;
        selectInPlace(a, 0, a.length - 1, k);
        const sorted = [...arr].sort((x, y) => x - y);
        expect(a[k]).toBe(sorted[k]);
        for (let i = 0; i < k; i++) expect(a[i]).toBeLessThanOrEqual(a[k]);
        for (let i = k + 1; i < a.length; i++) expect(a[i]).toBeGreaterThanOrEqual(a[k]);
      }),
    );
  });

  it('small arrays (selection path) match the sorted reference, ties included', () => {
    fc.assert(
      fc.property(fc.array(fc.oneof(fc.integer({ min: -3, max: 3 }), fc.double({ min: -1e6, max: 1e6, noNaN: true })), { minLength: 1, maxLength: 80 }), (arr) => {
        const got = percentilesInPlace(Float64Array.from(arr), arr.length, PS);
        PS.forEach((p, i) => expect(got[i]).toBeCloseTo(reference(arr, p), 6));
      }),
    );
  });

  // arrays of >= 65536 values take the one-pass bracketing path
  const big = 100_003;
  const cases: [string, (r: () => number, i: number) => number][] = [
    ['continuous', (r) => r()],
    ['few distinct values', (r) => Math.floor(r() * 4)],
    ['one value', () => 2],
    ['heavy tail', (r) => 1 / (r() + 1e-9)],
    ['sorted', (_, i) => i * 0.5],
    ['mostly one value with a spread tail', (r, i) => (i % 10 === 0 ? r() * 100 : 7)],
  ];
  for (const [label, gen] of cases) {
    it(`large arrays (bracketing path): ${label}`, () => {
      const rnd = lcg(label.length);
      const values = Float64Array.from({ length: big }, (_, i) => gen(rnd, i));
      const sorted = values.slice().sort(); // typed-array sort is numeric
      const expected = PS.map((p) => {
        const h = (big - 1) * p;
        const k = Math.floor(h);
        return sorted[k] + (h - k) * (sorted[k + 1] - sorted[k]);
      });
      const got = percentilesInPlace(values.slice(), big, PS);
      PS.forEach((_, i) => expect(got[i]).toBe(expected[i]));
      // the bracketing itself succeeds on these shapes (no fallback) and is exact
      const direct = percentilesByBracket(values.slice(), big, PS);
      expect(direct).not.toBeNull();
      PS.forEach((_, i) => expect(direct![i]).toBe(expected[i]));
    });
  }

  it('an empty array gives NaN', () => {
    expect(percentilesInPlace(new Float64Array(0), 0, PS).every(Number.isNaN)).toBe(true);
  });
});

describe('bootstrap helpers', () => {
  it('percentile interval of 0..100 at 90 % is [5, 95] and ignores non-finite replicates', () => {
    const reps = Float64Array.from([...Array.from({ length: 101 }, (_, i) => 100 - i), NaN, Infinity]);
    const ci = percentileInterval(reps, 0.9)!;
    expect(ci[0]).toBeCloseTo(5, 10);
    expect(ci[1]).toBeCloseTo(95, 10);
    expect(percentileInterval(Float64Array.from([1, NaN]), 0.95)).toBeNull();
  });

  it('generators are reproducible, independent per instance, and uniform enough', () => {
    const a = createRng(42);
    const b = createRng(42);
    const xs = Array.from({ length: 1000 }, () => a.next());
    expect(Array.from({ length: 1000 }, () => b.next())).toEqual(xs);
    expect(createRng(43).next()).not.toBe(xs[0]);
    // mean of 1000 uniforms: sd 0.0091
    expect(Math.abs(xs.reduce((s, x) => s + x, 0) / 1000 - 0.5)).toBeLessThan(0.04);
    const c = createRng(1);
    const counts = [0, 0, 0];
    for (let i = 0; i < 3000; i++) counts[c.below(3)]++;
    for (const k of counts) expect(Math.abs(k - 1000)).toBeLessThan(150);
    expect(deriveSeed(1, 'y', 'x1')).toBe(deriveSeed(1, 'y', 'x1'));
    expect(deriveSeed(1, 'y', 'x1')).not.toBe(deriveSeed(1, 'yx', '1'));
    expect(deriveSeed(1, 'y', 'x1')).not.toBe(deriveSeed(2, 'y', 'x1'));
  });
});
