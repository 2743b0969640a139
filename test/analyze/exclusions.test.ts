import { describe, expect, it } from 'vitest';
import { analyzeSensitivity, includeFromStatus, type SensitivityReport, type SensitivityMeasure } from '../../src/analyze/index.js';
import { discreteVariance, gridTable, ishigami, lcg, linspace, saltelliTable } from './helpers.js';

function rec(report: SensitivityReport, input: string, measure: SensitivityMeasure, output = 'y') {
  const r = report.records.find((q) => q.output === output && q.input === input && q.measure === measure);
  if (r === undefined) throw new Error(`no ${measure} for ${input}`);
  return r;
}

describe('grid rows left out', () => {
  const coef = [1.5, -2, 0.75];
  const axes = [
    { name: 'a', values: linspace(0, 5, 6) },
    { name: 'b', values: linspace(-1, 1, 5) },
    { name: 'c', values: [1, 2, 4, 8] },
  ];
  const f = (x: Float64Array): number => coef[0] * x[0] + coef[1] * x[1] + coef[2] * x[2];
  const g = gridTable(axes, f);

  it('a whole slab left out leaves the exact indices of the smaller grid, counted by reason', () => {
    // rows with a = 5 (the last value) are left out as "no_melt" and carry garbage
    const include = new Uint8Array(g.n);
    const y = g.y.slice();
    let left = 0;
    for (let r = 0; r < g.n; r++) {
      if (g.inputs.a[r] === 5) {
        y[r] = -1e9;
        left++;
      } else include[r] = 1;
    }
    const report = analyzeSensitivity({ inputs: g.inputs, outputs: { y }, include, excludedReasons: { no_melt: left }, layout: { kind: 'grid', axes } });
    // analytic: a now takes 0..4 (5 values); S_i = a_i^2 var_i / sum (additive model)
    const vars = [discreteVariance([0, 1, 2, 3, 4]), discreteVariance(axes[1].values), discreteVariance(axes[2].values)];
    const parts = coef.map((c, i) => c * c * vars[i]);
    const V = parts.reduce((s, p) => s + p, 0);
    axes.forEach((axis, i) => {
      expect(Math.abs(rec(report, axis.name, 'S1').value! - parts[i] / V)).toBeLessThan(1e-12);
      expect(Math.abs(rec(report, axis.name, 'ST').value! - parts[i] / V)).toBeLessThan(1e-12);
      expect(rec(report, axis.name, 'S1').n).toBe(g.n - left);
    });
    expect(report.counts).toMatchObject({ rows: g.n, included: g.n - left, leftOut: { no_melt: left } });
    expect(report.counts.perOutput.y.used).toBe(g.n - left);
    const curve = report.mainEffects.find((c) => c.input === 'a')!;
    expect(curve.count[5]).toBe(0);
    expect(Number.isNaN(curve.mean[5])).toBe(true);
    expect(report.notes.some((n) => n.startsWith('y: grid incomplete (100 of 120 rows usable)'))).toBe(true);
  });

  it('results do not depend on the values in left-out rows; nulls in included rows are counted per output', () => {
    const rnd = lcg(5);
    const include = new Uint8Array(g.n).fill(1);
    const status: string[] = new Array<string>(g.n).fill('ok');
    for (let r = 0; r < g.n; r++) {
      const u = rnd();
      if (u < 0.08) status[r] = 'failed';
      else if (u < 0.15) status[r] = 'onset_beyond_range';
    }
    const mask = includeFromStatus(status);
    include.set(mask.include);
    const yA = g.y.map((v, r) => (include[r] ? v * v : 1e6));
    const yB = g.y.map((v, r) => (include[r] ? v * v : -3));
    const z = g.y.slice();
    z[7] = NaN; // a null value of an included row (row 7 is ok with this seed, checked below)
    expect(include[7]).toBe(1);
    const run = (y: Float64Array) =>
      analyzeSensitivity({ inputs: g.inputs, outputs: { y, z }, include, excludedReasons: mask.excludedReasons, layout: { kind: 'grid', axes } });
    const ra = run(yA);
    const rb = run(yB);
    expect(ra.records).toEqual(rb.records);
    expect(ra.mainEffects).toEqual(rb.mainEffects);
    const failed = status.filter((s) => s === 'failed').length;
    const beyond = status.filter((s) => s === 'onset_beyond_range').length;
    expect(failed).toBeGreaterThan(0);
    expect(beyond).toBeGreaterThan(0);
    expect(ra.counts.leftOut).toEqual({ failed, onset_beyond_range: beyond });
    expect(ra.counts.included).toBe(g.n - failed - beyond);
    expect(ra.counts.perOutput.z).toMatchObject({ used: g.n - failed - beyond - 1, nullValues: 1 });
    expect(ra.notes).toContain('z: 1 included rows have a null value and are left out for this output.');
    // indices stay in [0, 1] (law of total variance over the usable rows)
    for (const r of ra.records.filter((q) => q.measure === 'S1' || q.measure === 'ST')) {
      expect(r.value!).toBeGreaterThanOrEqual(0);
      expect(r.value!).toBeLessThanOrEqual(1 + 1e-12);
    }
  });

  it('a line with one usable point is skipped for ST and reported', () => {
    // leave out every row with b != 0 where a = 0 and c = 1: that line along b keeps one point
    const include = new Uint8Array(g.n).fill(1);
    for (let r = 0; r < g.n; r++) if (g.inputs.a[r] === 0 && g.inputs.c[r] === 1 && g.inputs.b[r] !== 0) include[r] = 0;
    const report = analyzeSensitivity({ inputs: g.inputs, outputs: { y: g.y }, include, layout: { kind: 'grid', axes } });
    expect(report.counts.leftOut).toEqual({ unspecified: 4 });
    expect(rec(report, 'b', 'ST').n).toBe(g.n - 5);
    expect(report.notes).toContain('y: ST for b skips 1 of 24 lines with a single usable point.');
  });
});

describe('saltelli rows left out', () => {
  const N = 512;
  const names = ['x1', 'x2', 'x3'];
  const rnd = lcg(11);
  const A = Float64Array.from({ length: N * 3 }, () => -Math.PI + 2 * Math.PI * rnd());
  const B = Float64Array.from({ length: N * 3 }, () => -Math.PI + 2 * Math.PI * rnd());
  const t = saltelliTable(A, B, N, names, (x) => ishigami(x[0], x[1], x[2]));

  it('a base sample is dropped for input i when A, B or AB_i is left out, and only then', () => {
    const include = new Uint8Array(t.y.length).fill(1);
    include[3] = 0; // A row 3 -> dropped for every input
    include[N + 10] = 0; // B row 10 -> dropped for every input
    include[2 * N + 20] = 0; // AB_1 row 20 -> dropped for x1 only
    include[4 * N + 30] = 0; // AB_3 row 30 -> dropped for x3 only
    include[4 * N + 3] = 0; // AB_3 row 3: already dropped through A
    const garbage = (v: number) => {
      const y = t.y.slice();
      for (let r = 0; r < y.length; r++) if (!include[r]) y[r] = v;
      return y;
    };
    const run = (y: Float64Array) =>
      analyzeSensitivity(
        { inputs: t.inputs, outputs: { y }, include, excludedReasons: { failed: 5 }, layout: { kind: 'saltelli', base: N, inputs: names } },
        { resamples: 50 },
      );
    const r1 = run(garbage(1e8));
    const r2 = run(garbage(-77));
    expect(r1.records).toEqual(r2.records);
    expect(rec(r1, 'x1', 'S1').n).toBe(N - 3);
    expect(rec(r1, 'x2', 'ST').n).toBe(N - 2);
    expect(rec(r1, 'x3', 'ST').n).toBe(N - 3);
    expect(r1.counts.leftOut).toEqual({ failed: 5 });
    // base samples 3, 10, 20 and 30 are dropped for at least one input: 4 of 512, below the warning level
    expect(r1.counts.perOutput.y.droppedBaseSamples).toBe(4);
    expect(r1.notes).toContain('y: 4 of 512 base samples (0.8 %) are dropped because a row of their A, B or AB block has no value; the indices use the rest.');
    expect(r1.warnings).toEqual([]);

    // the same estimate computed on the reduced base set directly (rows of every block renumbered)
    const keep = Array.from({ length: N }, (_, j) => j).filter((j) => j !== 3 && j !== 10 && j !== 20);
    const sub = (M: Float64Array) => Float64Array.from(keep.flatMap((j) => [M[j * 3], M[j * 3 + 1], M[j * 3 + 2]]));
    const ts = saltelliTable(sub(A), sub(B), keep.length, names, (x) => ishigami(x[0], x[1], x[2]));
    const rs = analyzeSensitivity({ inputs: ts.inputs, outputs: { y: ts.y }, layout: { kind: 'saltelli', base: keep.length, inputs: names } }, { resamples: 0 });
    expect(rec(r1, 'x1', 'S1').value!).toBeCloseTo(rec(rs, 'x1', 'S1').value!, 12);
    expect(rec(r1, 'x1', 'ST').value!).toBeCloseTo(rec(rs, 'x1', 'ST').value!, 12);
  });
});

describe('left-out bookkeeping', () => {
  const axes = [{ name: 'a', values: [1, 2, 3, 4] }];
  const g = gridTable(axes, (x) => x[0] ** 2);

  it('rows the reasons do not account for are counted as unspecified', () => {
    const include = Uint8Array.from([1, 0, 0, 1]);
    const r = analyzeSensitivity({ inputs: g.inputs, outputs: { y: g.y }, include, excludedReasons: { no_melt: 1 }, layout: { kind: 'grid', axes } });
    expect(r.counts.leftOut).toEqual({ no_melt: 1, unspecified: 1 });
  });

  it('reasons that claim more rows than the mask leaves out are noted', () => {
    const include = Uint8Array.from([1, 1, 0, 1]);
    const r = analyzeSensitivity({ inputs: g.inputs, outputs: { y: g.y }, include, excludedReasons: { failed: 3 }, layout: { kind: 'grid', axes } });
    expect(r.notes).toContain('The left-out reasons add up to 3 rows but the include mask leaves out 1; the mask decides which rows are used.');
  });

  it('includeFromStatus keeps ok rows and counts the others by status', () => {
    expect(includeFromStatus(['ok', 'no_melt', 'ok', 'failed', 'no_melt', null])).toEqual({
      include: Uint8Array.from([1, 0, 1, 0, 0, 0]),
      excludedReasons: { no_melt: 2, failed: 1, null: 1 },
    });
  });
});

describe('saltelli: dropped base samples above a few percent', () => {
  const N = 256;
  const names = ['x1', 'x2'];
  const rnd = lcg(5);
  const A = Float64Array.from({ length: N * 2 }, () => rnd());
  const B = Float64Array.from({ length: N * 2 }, () => rnd());
  // y has no value where x1 + x2 < 0.3 (like a column that does not melt): about 4.5 % of the rows
  // and, through the A, B and AB blocks, a larger share of the base samples
  const t = saltelliTable(A, B, N, names, (x) => (x[0] + x[1] < 0.3 ? NaN : x[0] + 2 * x[1]));

  it('counts them and warns that the indices are biased, saying what to do', () => {
    const r = analyzeSensitivity({ inputs: t.inputs, outputs: { y: t.y }, layout: { kind: 'saltelli', base: N, inputs: names } }, { resamples: 0 });
    let expected = 0;
    for (let j = 0; j < N; j++) {
      const rows = [j, N + j, 2 * N + j, 3 * N + j];
      if (rows.some((q) => Number.isNaN(t.y[q]))) expected++;
    }
    expect(expected).toBeGreaterThan(0.03 * N);
    expect(r.counts.perOutput.y.droppedBaseSamples).toBe(expected);
    expect(r.warnings).toHaveLength(1);
    expect(r.warnings[0]).toContain(`y: ${expected} of ${N} base samples`);
    expect(r.warnings[0]).toMatch(/biased/);
    expect(r.warnings[0]).toMatch(/Narrow the swept ranges/);
  });
});

