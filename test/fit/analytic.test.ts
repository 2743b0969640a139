/**
 * Fits with a known answer. y = a x + b with a uniform prior on x and one Gaussian observation of
 * y gives a posterior for x that is a normal (mean (y_obs - b) / a, sd sd_obs / a) truncated to the
 * swept range (analytic solution; closed form in normal.ts).
 */
import { describe, expect, it } from 'vitest';
import { fitTable } from '../../src/fit/index.js';
import type { FitPrior, FitResult, FitSummary } from '../../src/fit/index.js';
import { truncatedNormal } from './normal.js';

const KEYS = ['mean', 'sd', 'p2_5', 'p16', 'p50', 'p84', 'p97_5'] as const;

function expectClose(got: FitSummary, want: FitSummary, rel: number): void {
  for (const k of KEYS) {
    const scale = Math.abs(want[k]);
    expect(Math.abs(got[k] - want[k]), `${k}: got ${got[k]}, want ${want[k]}`).toBeLessThanOrEqual(rel * scale);
  }
}

const LO = 1250;
const HI = 1450;
const A = 0.05;
const B = -60;

function linearGrid(points: number) {
  const x = Float64Array.from({ length: points }, (_, i) => LO + ((HI - LO) * i) / (points - 1));
  const y = x.map((v) => A * v + B);
  const prior: FitPrior = { kind: 'grid', axes: [{ name: 'x', values: Array.from(x), min: LO, max: HI, scale: 'linear' }] };
  return { x, y, prior };
}

describe('y = a x + b, one Gaussian observation: a truncated normal', () => {
  // observation 3.0 +- 0.4 -> x ~ N(1260, 8^2) truncated at 1250 (1.25 sd below the mean) and 1450
  const yObs = 3.0;
  const sdObs = 0.4;
  const want = truncatedNormal((yObs - B) / A, sdObs / A, LO, HI);

  it('fine uniform grid: mean, sd and quantiles agree with the closed form to 1e-3 relative', () => {
    const { x, y, prior } = linearGrid(8001);
    const fit = fitTable({ rows: x.length, inputs: { x }, outputs: { y } }, { observations: [{ output: 'y', value: yObs, sd: sdObs }], prior });
    expectClose(fit.posterior.x, want, 1e-3);
    // the weights are a normalised density on the rows
    expect(fit.weights.reduce((s, w) => s + w, 0)).toBeCloseTo(1, 12);
    expect(fit.rowsUsed).toBe(8001);
  });

  it('sampled design (evenly stratified samples): the same to 1e-3 relative', () => {
    const n = 20_000;
    // one sample in the middle of each of n equal strata, in a scrambled order
    const x = new Float64Array(n);
    for (let i = 0; i < n; i++) x[i] = LO + ((HI - LO) * (((i * 7919) % n) + 0.5)) / n;
    const y = x.map((v) => A * v + B);
    const prior: FitPrior = { kind: 'latin-hypercube', axes: [{ name: 'x', values: [LO, HI], min: LO, max: HI, scale: 'linear' }] };
    const fit = fitTable({ rows: n, inputs: { x }, outputs: { y } }, { observations: [{ output: 'y', value: yObs, sd: sdObs }], prior });
    expectClose(fit.posterior.x, want, 1e-3);
  });

  it('the prior of a uniform grid is uniform: mean, sd (range / sqrt 12) and quantiles', () => {
    const { x, y, prior } = linearGrid(8001);
    const fit = fitTable({ rows: x.length, inputs: { x }, outputs: { y } }, { observations: [{ output: 'y', value: yObs, sd: sdObs }], prior });
    // uniform on [1250, 1450]: mean 1350, sd 200 / sqrt(12), p-quantile 1250 + 200 p (analytic)
    expectClose(fit.prior.x, { mean: 1350, sd: 200 / Math.sqrt(12), p2_5: 1255, p16: 1282, p50: 1350, p84: 1418, p97_5: 1445 }, 1e-3);
  });
});

describe('combining observations', () => {
  // a 2-D grid; y1 depends on x1 only, y2 on x2 only
  const n1 = 81;
  const n2 = 61;
  const rows = n1 * n2;
  const x1 = new Float64Array(rows);
  const x2 = new Float64Array(rows);
  for (let i = 0; i < n1; i++) for (let j = 0; j < n2; j++) {
    x1[i * n2 + j] = i / (n1 - 1);
    x2[i * n2 + j] = 10 + (20 * j) / (n2 - 1);
  }
  const y1 = x1.map((v) => 2 * v + 1);
  const y2 = x2.map((v) => v * v);
  const prior: FitPrior = {
    kind: 'grid',
    axes: [
      { name: 'x1', values: Array.from({ length: n1 }, (_, i) => i / (n1 - 1)), min: 0, max: 1, scale: 'linear' },
      { name: 'x2', values: Array.from({ length: n2 }, (_, j) => 10 + (20 * j) / (n2 - 1)), min: 10, max: 30, scale: 'linear' },
    ],
  };
  const table = { rows, inputs: { x1, x2 }, outputs: { y1, y2 } };
  const o1 = { output: 'y1', value: 2.0, sd: 0.1 };
  const o2 = { output: 'y2', value: 400, sd: 30 };
  const one = fitTable(table, { observations: [o1], prior });
  const two = fitTable(table, { observations: [o2], prior });
  const both = fitTable(table, { observations: [o1, o2], prior });

  it('two observations of independent outputs multiply: log-likelihoods add, weights are the normalised product', () => {
    let z = 0;
    for (let r = 0; r < rows; r++) z += one.weights[r] * two.weights[r];
    for (let r = 0; r < rows; r += 37) {
      expect(both.logLikelihood[r]).toBeCloseTo(one.logLikelihood[r] + two.logLikelihood[r], 9);
      expect(both.weights[r]).toBeCloseTo((one.weights[r] * two.weights[r]) / z, 12);
    }
    // independence: each input's posterior is that of its own observation alone
    for (const k of KEYS) {
      expect(both.posterior.x1[k]).toBeCloseTo(one.posterior.x1[k], 9);
      expect(both.posterior.x2[k]).toBeCloseTo(two.posterior.x2[k], 9);
    }
  });

  it('a huge sd returns the prior', () => {
    const flat = fitTable(table, { observations: [{ output: 'y1', value: 2, sd: 1e9 }], prior });
    for (const name of ['x1', 'x2']) for (const k of KEYS) expect(flat.posterior[name][k]).toBeCloseTo(flat.prior[name][k], 6);
    expect(flat.ess).toBeCloseTo(rows, 3);
    expect(flat.warnings).toEqual([]);
  });

  it('the log-likelihood is the Gaussian log density (constants included)', () => {
    const r = 1234;
    const d1 = (y1[r] - o1.value) / o1.sd;
    // ln N(y; mu, sd) = -ln(sd) - ln(2 pi) / 2 - z^2 / 2 (definition)
    expect(one.logLikelihood[r]).toBeCloseTo(-Math.log(o1.sd) - 0.5 * Math.log(2 * Math.PI) - 0.5 * d1 * d1, 10);
  });
});

describe('weights in log space', () => {
  it('an observation a thousand sd from every row: weights stay finite, sum to 1, the closest row takes it all', () => {
    const x = Float64Array.from({ length: 101 }, (_, i) => i);
    const y = x.map((v) => v);
    const prior: FitPrior = { kind: 'grid', axes: [{ name: 'x', values: Array.from(x), min: 0, max: 100, scale: 'linear' }] };
    // ll = -(y - 1100)^2 / 2 ~ -5e5: exp(ll) underflows to 0 in double precision
    const fit: FitResult = fitTable({ rows: 101, inputs: { x }, outputs: { y } }, { observations: [{ output: 'y', value: 1100, sd: 1 }], prior });
    expect(Math.exp(fit.logLikelihood[100])).toBe(0);
    expect(fit.weights[100]).toBeCloseTo(1, 12);
    expect(fit.weights.every((w) => Number.isFinite(w))).toBe(true);
    expect(fit.best.inputs.x).toBe(100);
    expect(fit.warnings.map((w) => w.kind).sort()).toEqual(['edge', 'low-ess', 'no-fit']);
  });
});
