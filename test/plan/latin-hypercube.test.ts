import { describe, expect, it } from 'vitest';
import { makePermutation } from '../../src/plan/permutation.js';
import { fillPieces, fillRange, planSweep, specWith } from './helpers.js';

describe('latin-hypercube design', () => {
  const N = 1000;
  const spec = specWith({ kind: 'latin-hypercube', samples: N, seed: 42 });
  const plan = planSweep(spec);
  const all = fillRange(plan, 0, N);

  it('puts exactly one sample in each of the N strata of every axis (N = 1000)', () => {
    for (const axis of spec.axes) {
      const hits = new Uint16Array(N);
      const values = Array.from(all.inputs[axis.name]);
      expect(values.every((v) => v >= axis.min && v <= axis.max), axis.name).toBe(true);
      for (const v of values) {
        const u = axis.scale === 'log' ? Math.log(v / axis.min) / Math.log(axis.max / axis.min) : (v - axis.min) / (axis.max - axis.min);
        hits[Math.min(N - 1, Math.floor(u * N))]++;
      }
      expect(hits.every((h) => h === 1), axis.name).toBe(true);
    }
  });

  it('is reproducible for a seed and differs between seeds', () => {
    expect(fillRange(planSweep(specWith({ kind: 'latin-hypercube', samples: N, seed: 42 })), 0, N)).toEqual(all);
    const other = fillRange(planSweep(specWith({ kind: 'latin-hypercube', samples: N, seed: 43 })), 0, N);
    for (const name of plan.axisNames) expect(other.inputs[name]).not.toEqual(all.inputs[name]);
  });

  it('axes are not coupled (different permutations per input)', () => {
    const order = (a: Float64Array) => Array.from(a.keys()).sort((i, j) => a[i] - a[j]);
    expect(order(all.inputs.tp_c)).not.toEqual(order(all.inputs.lid_km));
  });

  it('gives the same points for any split of the range', () => {
    expect(fillPieces(plan, [0, 1, 333, 334, 999, 1000])).toEqual(all);
  });

  it('10 million samples need no per-sample memory: any range is filled directly', () => {
    const big = planSweep(specWith({ kind: 'latin-hypercube', samples: 10_000_000, seed: 1 }));
    const tail = fillRange(big, 9_999_990, 10_000_000);
    expect(fillPieces(big, [9_999_990, 9_999_995, 10_000_000])).toEqual(tail);
    expect(Array.from(tail.inputs.tp_c).every((v) => v >= 1280 && v <= 1420)).toBe(true);
  });
});

describe('keyed permutation (Feistel network with cycle walking)', () => {
  it('is a bijection of [0, size) for awkward sizes', () => {
    for (const size of [1, 2, 3, 5, 64, 1000, 1025, 4097]) {
      const p = makePermutation(size, 12345);
      const seen = new Uint8Array(size);
      for (let i = 0; i < size; i++) seen[p.apply(i)]++;
      expect(seen.every((s) => s === 1), `size ${size}`).toBe(true);
    }
  });

  it('differs between keys and scrambles the order', () => {
    const a = makePermutation(100, 1);
    const b = makePermutation(100, 2);
    const ia = Array.from({ length: 100 }, (_, i) => a.apply(i));
    const ib = Array.from({ length: 100 }, (_, i) => b.apply(i));
    expect(ia).not.toEqual(ib);
    expect(ia.filter((v, i) => v === i).length).toBeLessThan(10);
  });

  it('handles sizes up to 2^40', () => {
    const p = makePermutation(2 ** 40, 9);
    const v = p.apply(2 ** 40 - 1);
    expect(Number.isInteger(v) && v >= 0 && v < 2 ** 40).toBe(true);
  });
});
