import { describe, expect, it } from 'vitest';
import { analyzeSensitivity, type SensitivityReport, type SensitivityMeasure } from '../../src/analyze/index.js';
import { ISHIGAMI, gridTable, ishigami, latinHypercube, lcg, midpoints, radicalInverse, saltelliTable } from './helpers.js';

const NAMES = ['x1', 'x2', 'x3'];
const f = (x: Float64Array): number => ishigami(x[0], x[1], x[2]);
const toRange = (u: number): number => -Math.PI + 2 * Math.PI * u;

function rec(report: SensitivityReport, input: string, measure: SensitivityMeasure) {
  const r = report.records.find((q) => q.output === 'y' && q.input === input && q.measure === measure);
  if (r === undefined) throw new Error(`no ${measure} for ${input}`);
  return r;
}

describe('Ishigami reference values', () => {
  it('the documented values follow from the analytic variance decomposition', () => {
    // Partial variances of the Ishigami function (Ishigami & Homma 1990; also Sobol & Levitan 1999):
    // V1 = (1 + b pi^4 / 5)^2 / 2, V2 = a^2 / 8, V13 = b^2 pi^8 (1/18 - 1/50), V = V1 + V2 + V13.
    const a = 7;
    const b = 0.1;
    const V1 = (1 + (b * Math.PI ** 4) / 5) ** 2 / 2;
    const V2 = a ** 2 / 8;
    const V13 = b ** 2 * Math.PI ** 8 * (1 / 18 - 1 / 50);
    const V = V1 + V2 + V13;
    expect(V1 / V).toBeCloseTo(ISHIGAMI.S1[0], 4);
    expect(V2 / V).toBeCloseTo(ISHIGAMI.S1[1], 4);
    expect((V1 + V13) / V).toBeCloseTo(ISHIGAMI.ST[0], 4);
    expect(V13 / V).toBeCloseTo(ISHIGAMI.ST[2], 4);
  });
});

describe('saltelli design on Ishigami', () => {
  // Base samples: a Halton sequence (bases 2, 3, 5 for A and 7, 11, 13 for B), N = 2^14.
  const N = 2 ** 14;
  const A = new Float64Array(N * 3);
  const B = new Float64Array(N * 3);
  const primes = [2, 3, 5, 7, 11, 13];
  for (let j = 0; j < N; j++) {
    for (let c = 0; c < 3; c++) {
      A[j * 3 + c] = toRange(radicalInverse(j + 1, primes[c]));
      B[j * 3 + c] = toRange(radicalInverse(j + 1, primes[c + 3]));
    }
  }
  const t = saltelliTable(A, B, N, NAMES, f);
  const report = analyzeSensitivity({ inputs: t.inputs, outputs: { y: t.y }, layout: { kind: 'saltelli', base: N, inputs: NAMES } });

  it('S1 (Saltelli 2010) and ST (Jansen 1999) bracket the analytic values in their bootstrap intervals', () => {
    NAMES.forEach((name, i) => {
      for (const [measure, truth] of [['S1', ISHIGAMI.S1[i]], ['ST', ISHIGAMI.ST[i]]] as const) {
        const r = rec(report, name, measure);
        expect(r.ci_low).not.toBeNull();
        expect(r.ci_high).not.toBeNull();
        expect(r.ci_low!).toBeLessThanOrEqual(truth);
        expect(r.ci_high!).toBeGreaterThanOrEqual(truth);
        expect(Math.abs(r.value! - truth)).toBeLessThan(0.02);
        expect(r.n).toBe(N);
      }
    });
  });

  it('is deterministic for a seed and the intervals move with the seed', () => {
    const again = analyzeSensitivity({ inputs: t.inputs, outputs: { y: t.y }, layout: { kind: 'saltelli', base: N, inputs: NAMES } }, { resamples: 100 });
    const same = analyzeSensitivity({ inputs: t.inputs, outputs: { y: t.y }, layout: { kind: 'saltelli', base: N, inputs: NAMES } }, { resamples: 100 });
    const other = analyzeSensitivity({ inputs: t.inputs, outputs: { y: t.y }, layout: { kind: 'saltelli', base: N, inputs: NAMES } }, { resamples: 100, seed: 7 });
    expect(same.records).toEqual(again.records);
    expect(other.records.map((r) => r.value)).toEqual(again.records.map((r) => r.value));
    expect(other.records.map((r) => r.ci_low)).not.toEqual(again.records.map((r) => r.ci_low));
  });

  it('main-effect curve of x2 follows E[y | x2] = 7 sin^2(x2)', () => {
    // E[sin x1 (1 + b x3^4)] = 0 over the symmetric x1 range, leaving a sin^2(x2).
    const curve = report.mainEffects.find((c) => c.output === 'y' && c.input === 'x2')!;
    expect(curve.binned).toBe(true);
    expect(curve.x.length).toBe(20);
    expect(curve.count.reduce((s, c) => s + c, 0)).toBe(2 * N);
    curve.x.forEach((x, i) => expect(Math.abs(curve.mean[i] - 7 * Math.sin(x) ** 2)).toBeLessThan(0.35));
  });
});

describe('saltelli design on Ishigami, pseudo-random base samples', () => {
  it('estimates lie near the analytic values and the intervals have a plausible width', () => {
    const N = 2 ** 13;
    const rnd = lcg(2024);
    const A = Float64Array.from({ length: N * 3 }, () => toRange(rnd()));
    const B = Float64Array.from({ length: N * 3 }, () => toRange(rnd()));
    const t = saltelliTable(A, B, N, NAMES, f);
    const report = analyzeSensitivity({ inputs: t.inputs, outputs: { y: t.y }, layout: { kind: 'saltelli', base: N, inputs: NAMES } }, { resamples: 300 });
    NAMES.forEach((name, i) => {
      for (const [measure, truth] of [['S1', ISHIGAMI.S1[i]], ['ST', ISHIGAMI.ST[i]]] as const) {
        const r = rec(report, name, measure);
        // Monte Carlo standard errors at N = 8192 are about 0.01-0.02 for these indices
        expect(Math.abs(r.value! - truth)).toBeLessThan(0.06);
        const width = r.ci_high! - r.ci_low!;
        expect(width).toBeGreaterThan(0.005);
        expect(width).toBeLessThan(0.15);
        expect(r.ci_low!).toBeLessThanOrEqual(r.value!);
        expect(r.ci_high!).toBeGreaterThanOrEqual(r.value!);
      }
    });
  });
});

describe('fine grid on Ishigami', () => {
  // Midpoints of 64 cells per axis: the grid's discrete uniform distribution converges to the
  // continuous one (midpoint rule), so its exact indices approach the analytic values.
  const axes = NAMES.map((name) => ({ name, values: midpoints(-Math.PI, Math.PI, 64) }));
  const g = gridTable(axes, f);
  const report = analyzeSensitivity({ inputs: g.inputs, outputs: { y: g.y }, layout: { kind: 'grid', axes } });

  it('S1 and ST are within 0.01 of the analytic values', () => {
    NAMES.forEach((name, i) => {
      expect(Math.abs(rec(report, name, 'S1').value! - ISHIGAMI.S1[i])).toBeLessThan(0.01);
      expect(Math.abs(rec(report, name, 'ST').value! - ISHIGAMI.ST[i])).toBeLessThan(0.01);
      expect(rec(report, name, 'S1').ci_low).toBeNull();
    });
  });

  it('main effect of x2 is exactly 7 sin^2(x2) (the x1 terms average to zero over symmetric midpoints)', () => {
    const curve = report.mainEffects.find((c) => c.input === 'x2')!;
    expect(curve.binned).toBe(false);
    expect(curve.x).toEqual(axes[1].values);
    curve.x.forEach((x, i) => expect(curve.mean[i]).toBeCloseTo(7 * Math.sin(x) ** 2, 9));
    expect(curve.count.every((c) => c === 64 * 64)).toBe(true);
  });

  it('says that elasticities skip non-positive points', () => {
    expect(report.localNotes.some((n) => /elasticity left out at \d+ of \d+ points where x <= 0 or y <= 0/.test(n))).toBe(true);
  });
});

describe('latin-hypercube and sobol designs on Ishigami', () => {
  const N = 2 ** 14;
  const U = latinHypercube(N, 3, 99);
  const inputs: Record<string, Float64Array> = {};
  NAMES.forEach((name, c) => (inputs[name] = Float64Array.from({ length: N }, (_, j) => toRange(U[j * 3 + c]))));
  const y = Float64Array.from({ length: N }, (_, j) => ishigami(inputs.x1[j], inputs.x2[j], inputs.x3[j]));
  const lhs = analyzeSensitivity({ inputs, outputs: { y }, layout: { kind: 'latin-hypercube', samples: N, inputs: NAMES } });

  it('binned first-order estimates are within 0.02 of the analytic S1', () => {
    NAMES.forEach((name, i) => {
      const r = rec(lhs, name, 'S1');
      expect(Math.abs(r.value! - ISHIGAMI.S1[i])).toBeLessThan(0.02);
      expect(r.n).toBe(N);
    });
  });

  it('total indices are null with a note that they need a saltelli design', () => {
    for (const name of NAMES) expect(rec(lhs, name, 'ST').value).toBeNull();
    expect(lhs.notes.some((n) => n.includes('ST needs a saltelli design'))).toBe(true);
  });

  it('a sobol layout goes through the same estimator', () => {
    const sobol = analyzeSensitivity({ inputs, outputs: { y }, layout: { kind: 'sobol', samples: N, inputs: NAMES } });
    expect(sobol.records.map((r) => r.value)).toEqual(lhs.records.map((r) => r.value));
    expect(sobol.design).toBe('sobol');
  });
});
