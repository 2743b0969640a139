/** Which rows count, what the fit warns about, and the refined ranges. */
import { describe, expect, it } from 'vitest';
import { InputError } from '../../src/errors.js';
import { FitAccumulator, finishFit, fitTable, refineAxes, refinedSweepData } from '../../src/fit/index.js';
import type { FitPrior } from '../../src/fit/index.js';

const STATUSES = ['ok', 'no_melt', 'onset_beyond_range', 'failed'];

function line(n: number, lo: number, hi: number) {
  const x = Float64Array.from({ length: n }, (_, i) => lo + ((hi - lo) * i) / (n - 1));
  const prior: FitPrior = { kind: 'grid', axes: [{ name: 'x', values: Array.from(x), min: lo, max: hi, scale: 'linear' }] };
  return { x, prior };
}

describe('rows by status', () => {
  it('no_melt rows count with their values (crust 0 is evidence); failed and onset_beyond_range rows are left out and counted', () => {
    const { x, prior } = line(10, 0, 9);
    // rows 0-2 no melt (y = 0), 3 failed, 8 onset beyond range, the rest ok
    const y = Float64Array.from(x, (v) => (v < 3 ? 0 : v));
    y[3] = NaN;
    y[8] = NaN;
    const status = Uint8Array.from([1, 1, 1, 3, 0, 0, 0, 0, 2, 0]);
    const fit = fitTable({ rows: 10, inputs: { x }, outputs: { y }, status }, { observations: [{ output: 'y', value: 0, sd: 1 }], prior, statuses: STATUSES });
    expect(fit.rowsUsed).toBe(8);
    expect(fit.usedByStatus).toEqual({ ok: 5, no_melt: 3 });
    expect(fit.rowsLeftOut).toEqual({ onset_beyond_range: 1, failed: 1 });
    // the three no_melt rows fit y = 0 exactly and carry most of the weight
    expect(fit.weights[0] + fit.weights[1] + fit.weights[2]).toBeGreaterThan(0.9);
    expect(Number.isNaN(fit.weights[3])).toBe(true);
    expect(Number.isNaN(fit.logLikelihood[8])).toBe(true);
  });

  it('an ok row without a value of an observed output is left out with the output named', () => {
    const { x, prior } = line(5, 0, 4);
    const y = Float64Array.from(x);
    y[2] = NaN;
    const fit = fitTable({ rows: 5, inputs: { x }, outputs: { y } }, { observations: [{ output: 'y', value: 2, sd: 1 }], prior });
    expect(fit.rowsLeftOut).toEqual({ 'ok: y is null': 1 });
    expect(fit.rowsUsed).toBe(4);
  });

  it('no usable row is an InputError naming the reasons', () => {
    const { x, prior } = line(3, 0, 2);
    const y = new Float64Array(3).fill(NaN);
    expect(() => fitTable({ rows: 3, inputs: { x }, outputs: { y }, status: Uint8Array.from([3, 3, 3]) }, { observations: [{ output: 'y', value: 2, sd: 1 }], prior, statuses: STATUSES })).toThrow(
      new InputError('fit: none of the 3 rows can be used (3 failed); the observed outputs need values in rows whose status counts'),
    );
  });

  it('batches give the same answer as one table (the running maximum is rescaled between batches)', () => {
    const { x, prior } = line(1001, 0, 100);
    const y = x.map((v) => Math.sin(v / 7) * 10 + v);
    const setup = { observations: [{ output: 'y', value: 80, sd: 2 }], prior };
    const whole = fitTable({ rows: 1001, inputs: { x }, outputs: { y } }, setup);
    const acc = new FitAccumulator(setup);
    // the best rows come late, so the maximum rises from batch to batch
    for (let s = 0; s < 1001; s += 97) {
      const e = Math.min(1001, s + 97);
      acc.add({ rows: e - s, inputs: { x: x.subarray(s, e) }, outputs: { y: y.subarray(s, e) } });
    }
    const split = finishFit(acc);
    expect(split.ess).toBeCloseTo(whole.ess, 9);
    for (const k of ['mean', 'sd', 'p2_5', 'p50', 'p97_5'] as const) expect(split.posterior.x[k]).toBeCloseTo(whole.posterior.x[k], 9);
    expect(split.best.row).toBe(whole.best.row);
  });
});

describe('warnings with the next step', () => {
  const { x, prior } = line(201, 0, 100);
  const y = Float64Array.from(x);

  it('a posterior inside the range with many rows: no warning', () => {
    const fit = fitTable({ rows: 201, inputs: { x }, outputs: { y } }, { observations: [{ output: 'y', value: 50, sd: 10 }], prior });
    expect(fit.warnings).toEqual([]);
  });

  it('piled against the upper edge: an edge warning naming the input and how to extend it', () => {
    const fit = fitTable({ rows: 201, inputs: { x }, outputs: { y } }, { observations: [{ output: 'y', value: 99, sd: 5 }], prior });
    const edge = fit.warnings.filter((w) => w.kind === 'edge');
    expect(edge).toHaveLength(1);
    expect(edge[0].input).toBe('x');
    expect(edge[0].message).toMatch(/^x: the posterior piles against the upper edge of the swept range \(100\)/);
    expect(edge[0].nextStep).toMatch(/extend x beyond 100/);
  });

  it('effective sample size under 50: says so and points to --refine', () => {
    const fit = fitTable({ rows: 201, inputs: { x }, outputs: { y } }, { observations: [{ output: 'y', value: 50, sd: 0.5 }], prior });
    expect(fit.ess).toBeLessThan(50);
    const w = fit.warnings.find((v) => v.kind === 'low-ess');
    expect(w?.nextStep).toMatch(/--refine NEXT.yaml/);
  });

  it('no row within 3 sd: names the closest row and how far it is', () => {
    const fit = fitTable({ rows: 201, inputs: { x }, outputs: { y } }, { observations: [{ output: 'y', value: 130, sd: 5 }], prior });
    const w = fit.warnings.find((v) => v.kind === 'no-fit');
    expect(w?.message).toBe('no row fits every observation within 3 sd: the closest row (scenario 200) is 6 sd from y = 130');
    expect(fit.rowsWithin3Sd).toBe(0);
  });
});

describe('refined ranges', () => {
  const { x, prior } = line(201, 0, 100);
  const y = Float64Array.from(x);

  it('cover the posterior 0.5-99.5 % range with a margin, keep the grid size, stay in the old range unless an edge warns', () => {
    const fit = fitTable({ rows: 201, inputs: { x }, outputs: { y } }, { observations: [{ output: 'y', value: 40, sd: 4 }], prior });
    const [a] = refineAxes(prior, fit);
    // N(40, 4): 0.5-99.5 % is 40 -+ 2.576 x 4 (normal quantiles, common practice); a 10 % margin each side
    expect(a.from).toBeGreaterThan(40 - 1.2 * 2.576 * 4 - 0.5);
    expect(a.from).toBeLessThan(40 - 2.576 * 4);
    expect(a.to).toBeGreaterThan(40 + 2.576 * 4);
    expect(a.count).toBe(201);
    const edge = fitTable({ rows: 201, inputs: { x }, outputs: { y } }, { observations: [{ output: 'y', value: 99, sd: 5 }], prior });
    const [b] = refineAxes(prior, edge, { x: { min: 0, max: 110 } });
    expect(b.to).toBe(110);
    expect(b.note).toMatch(/extended above the old range; held at the allowed maximum 110/);
  });

  it('keeps every other key of the sweep and marks the name', () => {
    const data = refinedSweepData({ name: 'ridge R-7', axes: [], fixed: { lid_km: 0 }, design: { kind: 'grid' } }, [{ name: 'x', from: 1, to: 2, count: 5, scale: 'linear', note: null }]);
    expect(data).toEqual({ name: 'ridge R-7-refined', axes: { x: { from: 1, to: 2, count: 5 } }, fixed: { lid_km: 0 }, design: { kind: 'grid' } });
  });
});
