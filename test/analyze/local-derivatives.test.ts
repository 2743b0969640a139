import { describe, expect, it } from 'vitest';
import { analyzeSensitivity, type SensitivityReport, type SensitivityMeasure } from '../../src/analyze/index.js';
import { gridTable, linspace } from './helpers.js';

function rec(report: SensitivityReport, input: string, measure: SensitivityMeasure) {
  const r = report.records.find((q) => q.output === 'y' && q.input === input && q.measure === measure);
  if (r === undefined) throw new Error(`no ${measure} for ${input}`);
  return r;
}

/** Percentile by linear interpolation between order statistics (Hyndman & Fan 1996, definition 7), on a sorted copy. */
function percentile(values: number[], p: number): number {
  const s = [...values].sort((a, b) => a - b);
  const h = (s.length - 1) * p;
  const k = Math.floor(h);
  return k + 1 < s.length ? s[k] + (h - k) * (s[k + 1] - s[k]) : s[k];
}

describe('elasticities of y = x1^2 exp(x2) on a grid', () => {
  // d ln y / d ln x1 = 2 everywhere; d ln y / d ln x2 = x2 (analytic).
  const x1 = linspace(0.5, 3, 26);
  const x2 = linspace(0.1, 2, 39); // h = 0.05
  const axes = [
    { name: 'x1', values: x1 },
    { name: 'x2', values: x2 },
  ];
  const f = (x: Float64Array): number => x[0] ** 2 * Math.exp(x[1]);
  const g = gridTable(axes, f);

  it('elasticity in x1 is 2 at every point (3-point stencils are exact for quadratics, edges included)', () => {
    const r = analyzeSensitivity({ inputs: g.inputs, outputs: { y: g.y }, layout: { kind: 'grid', axes } });
    for (const m of ['elasticity_p10', 'elasticity_median', 'elasticity_p90'] as const) expect(rec(r, 'x1', m).value!).toBeCloseTo(2, 10);
    expect(rec(r, 'x1', 'elasticity_median').n).toBe(g.n);
  });

  it('elasticity in x2 matches x2 percentiles over the grid within the O(h^2) stencil error', () => {
    const r = analyzeSensitivity({ inputs: g.inputs, outputs: { y: g.y }, layout: { kind: 'grid', axes } });
    // every grid point carries its x2 value; each x2 value appears once per x1 value
    const pointsX2 = x1.flatMap(() => x2);
    // 3-point derivative error of exp: h^2/6 relative (central), h^2/3 (one-sided) -> < 1e-3 * x2
    expect(Math.abs(rec(r, 'x2', 'elasticity_median').value! - percentile(pointsX2, 0.5))).toBeLessThan(2e-3);
    expect(Math.abs(rec(r, 'x2', 'elasticity_p10').value! - percentile(pointsX2, 0.1))).toBeLessThan(2e-3);
    expect(Math.abs(rec(r, 'x2', 'elasticity_p90').value! - percentile(pointsX2, 0.9))).toBeLessThan(2e-3);
  });

  it("edges: 'skip' uses central differences only and leaves the axis ends out", () => {
    const r = analyzeSensitivity({ inputs: g.inputs, outputs: { y: g.y }, layout: { kind: 'grid', axes } }, { edges: 'skip' });
    expect(rec(r, 'x1', 'elasticity_median').n).toBe((26 - 2) * 39);
    expect(rec(r, 'x2', 'elasticity_median').n).toBe(26 * (39 - 2));
    expect(rec(r, 'x1', 'elasticity_p10').value!).toBeCloseTo(2, 10);
    expect(r.localNotes.some((n) => n.includes('no derivative at 78 usable points'))).toBe(true);
  });

  it('axis values listed in descending order give the same elasticities', () => {
    const rev = [axes[0], { name: 'x2', values: [...x2].reverse() }];
    const gr = gridTable(rev, f);
    const a = analyzeSensitivity({ inputs: g.inputs, outputs: { y: g.y }, layout: { kind: 'grid', axes } });
    const b = analyzeSensitivity({ inputs: gr.inputs, outputs: { y: gr.y }, layout: { kind: 'grid', axes: rev } });
    for (const m of ['elasticity_p10', 'elasticity_median', 'elasticity_p90', 'slope_norm_median'] as const) {
      expect(rec(b, 'x2', m).value!).toBeCloseTo(rec(a, 'x2', m).value!, 12);
    }
  });

  it('a left-out point is skipped and no stencil uses it', () => {
    const include = new Uint8Array(g.n).fill(1);
    const row = 13 * 39 + 20; // x1 index 13, x2 index 20
    include[row] = 0;
    const y = g.y.slice();
    y[row] = 1e12; // garbage that would show in any stencil touching it
    const r = analyzeSensitivity({ inputs: g.inputs, outputs: { y }, include, excludedReasons: { failed: 1 }, layout: { kind: 'grid', axes } });
    expect(rec(r, 'x1', 'elasticity_median').n).toBe(g.n - 1);
    for (const m of ['elasticity_p10', 'elasticity_p90'] as const) expect(rec(r, 'x1', m).value!).toBeCloseTo(2, 10);
    const pointsX2 = x1.flatMap(() => x2);
    expect(Math.abs(rec(r, 'x2', 'elasticity_p90').value! - percentile(pointsX2, 0.9))).toBeLessThan(2e-3);
  });

  it('elasticities skip points where x or y is not positive, and say how many', () => {
    const axesNeg = [{ name: 'x1', values: linspace(-1, 1, 5) }, { name: 'x2', values: [0.5, 1] }];
    const gn = gridTable(axesNeg, f);
    const r = analyzeSensitivity({ inputs: gn.inputs, outputs: { y: gn.y }, layout: { kind: 'grid', axes: axesNeg } });
    // x1 in {-1, -0.5, 0, 0.5, 1}: x1 <= 0 at 3 of 5 values, and y = 0 at x1 = 0 -> 6 of 10 points skipped
    expect(rec(r, 'x1', 'elasticity_median').n).toBe(4);
    expect(rec(r, 'x1', 'elasticity_median').value!).toBeCloseTo(2, 10);
    expect(r.localNotes).toContain('y vs x1: elasticity left out at 6 of 10 points where x <= 0 or y <= 0.');
    // along x2 every x2 > 0 but y = 0 on the x1 = 0 line (2 points)
    expect(rec(r, 'x2', 'elasticity_median').n).toBe(8);
  });
});
