import { describe, expect, it } from 'vitest';
import { analyzeSensitivity, type SensitivityReport, type SensitivityMeasure } from '../../src/analyze/index.js';
import { discreteVariance, gridTable, linspace } from './helpers.js';

function value(report: SensitivityReport, input: string, measure: SensitivityMeasure, output = 'y'): number | null {
  const r = report.records.find((q) => q.output === output && q.input === input && q.measure === measure);
  if (r === undefined) throw new Error(`no ${measure} for ${input}`);
  return r.value;
}

describe('additive linear model on a grid: y = sum a_i x_i', () => {
  // For independent inputs, V = sum a_i^2 var_i and S_i = S_Ti = a_i^2 var_i / V (Sobol 1993,
  // additive functions). On a grid the inputs are independent and discrete uniform, so var_i is
  // the discrete variance of the axis values: for n evenly spaced values with step h,
  // var = h^2 (n^2 - 1) / 12.
  const coef = [2, -3, 0.5, 1.25];
  const axes = [
    { name: 'a', values: linspace(0, 4, 5) }, // h = 1
    { name: 'b', values: linspace(-1, 2, 7) }, // h = 0.5
    { name: 'c', values: linspace(10, 40, 4) }, // h = 10
    { name: 'd', values: [0.1, 0.2, 0.7, 1.5, 4.0, 9.0] }, // uneven
  ];
  const g = gridTable(axes, (x) => coef[0] * x[0] + coef[1] * x[1] + coef[2] * x[2] + coef[3] * x[3] + 100);
  const variances = [(1 * (25 - 1)) / 12, (0.25 * (49 - 1)) / 12, (100 * (16 - 1)) / 12, discreteVariance(axes[3].values)];
  const parts = coef.map((a, i) => a * a * variances[i]);
  const V = parts.reduce((s, p) => s + p, 0);
  const report = analyzeSensitivity({ inputs: g.inputs, outputs: { y: g.y }, layout: { kind: 'grid', axes } });

  it('S1 = S_T = a_i^2 var_i / V to 1e-12', () => {
    axes.forEach((axis, i) => {
      expect(Math.abs(value(report, axis.name, 'S1')! - parts[i] / V)).toBeLessThan(1e-12);
      expect(Math.abs(value(report, axis.name, 'ST')! - parts[i] / V)).toBeLessThan(1e-12);
    });
    expect(report.counts.perOutput.y.variance!).toBeCloseTo(V, 9);
  });

  it('normalised slopes are a_i sd_i / sd_y at every grid point (their squares are S_i)', () => {
    axes.forEach((axis, i) => {
      const expected = (coef[i] * Math.sqrt(variances[i])) / Math.sqrt(V);
      for (const m of ['slope_norm_p10', 'slope_norm_median', 'slope_norm_p90'] as const) {
        expect(value(report, axis.name, m)!).toBeCloseTo(expected, 10);
      }
    });
  });

  it("with slopeScale 'range', slopes are a_i range(x_i) / range(y)", () => {
    const ranged = analyzeSensitivity({ inputs: g.inputs, outputs: { y: g.y }, layout: { kind: 'grid', axes } }, { slopeScale: 'range' });
    const ranges = axes.map((a) => Math.max(...a.values) - Math.min(...a.values));
    const yRange = coef.reduce((s, a, i) => s + Math.abs(a) * ranges[i], 0);
    axes.forEach((axis, i) => expect(value(ranged, axis.name, 'slope_norm_median')!).toBeCloseTo((coef[i] * ranges[i]) / yRange, 10));
  });

  it('main-effect curves are the lines a_i x + const with every other axis averaged', () => {
    const means = axes.map((a) => a.values.reduce((s, v) => s + v, 0) / a.values.length);
    const rest = (i: number): number => 100 + coef.reduce((s, a, j) => (j === i ? s : s + a * means[j]), 0);
    axes.forEach((axis, i) => {
      const curve = report.mainEffects.find((c) => c.input === axis.name)!;
      curve.x.forEach((x, t) => expect(curve.mean[t]).toBeCloseTo(coef[i] * x + rest(i), 9));
      expect(curve.count.every((c) => c === g.n / axis.values.length)).toBe(true);
    });
  });

  it('an axis with a single value gets S1 = ST = 0 and no derivatives', () => {
    const axes1 = [axes[0], { name: 'fixed', values: [3] }, axes[1]];
    const g1 = gridTable(axes1, (x) => x[0] + x[1] * x[2]);
    const r = analyzeSensitivity({ inputs: g1.inputs, outputs: { y: g1.y }, layout: { kind: 'grid', axes: axes1 } });
    expect(Math.abs(value(r, 'fixed', 'S1')!)).toBeLessThan(1e-12);
    expect(value(r, 'fixed', 'ST')).toBe(0);
    expect(value(r, 'fixed', 'elasticity_median')).toBeNull();
    expect(r.notes.some((n) => n.includes('fixed has a single grid value'))).toBe(true);
  });
});

describe('a constant output', () => {
  it('has null indices and a note', () => {
    const axes = [{ name: 'a', values: [1, 2, 3] }, { name: 'b', values: [1, 2] }];
    const g = gridTable(axes, () => 4.2);
    const r = analyzeSensitivity({ inputs: g.inputs, outputs: { y: g.y }, layout: { kind: 'grid', axes } });
    expect(value(r, 'a', 'S1')).toBeNull();
    expect(value(r, 'b', 'ST')).toBeNull();
    expect(value(r, 'a', 'slope_norm_median')).toBeNull();
    expect(value(r, 'a', 'elasticity_median')).toBeCloseTo(0, 12);
    expect(r.notes.some((n) => n.startsWith('y: constant'))).toBe(true);
  });
});
