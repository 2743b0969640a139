import { describe, expect, it } from 'vitest';
import { affineCopy, analyzeSensitivity, formatIndex, formatSensitivitySummary, needsMoreSamples } from '../../src/analyze/index.js';
import { gridTable, ishigami, lcg, linspace, midpoints, saltelliTable } from './helpers.js';

describe('formatSensitivitySummary', () => {
  const names = ['x1', 'x2', 'x3'];

  it('one line per output: grid inputs ranked by ST with S1 in brackets, three decimals (exact indices)', () => {
    const axes = names.map((name) => ({ name, values: midpoints(-Math.PI, Math.PI, 16) }));
    const g = gridTable(axes, (x) => ishigami(x[0], x[1], x[2]));
    const include = new Uint8Array(g.n).fill(1);
    include[0] = 0;
    include[1] = 0;
    const text = formatSensitivitySummary(
      analyzeSensitivity({ inputs: g.inputs, outputs: { y: g.y }, include, excludedReasons: { failed: 2 }, layout: { kind: 'grid', axes } }),
    );
    const lines = text.split('\n');
    expect(lines[0]).toBe('Sensitivity (grid design): 4,096 rows, 4,094 used (left out: failed 2); 3 input(s); 1 output(s)');
    // Ishigami: S_T1 > S_T2 > S_T3, S1 of x3 is 0 (analytic values, from memory, docs/physics.md)
    expect(text).toMatch(/^ {2}y {2}x1 0\.\d{3} \(0\.\d{3}\) > x2 0\.\d{3} \(0\.\d{3}\) > x3 0\.\d{3} \(0\.000\)$/m);
  });

  it('saltelli: rounded to the bootstrap precision, "needs more samples" for noisy indices', () => {
    const N = 256;
    const rnd = lcg(3);
    const A = Float64Array.from({ length: N * 3 }, () => rnd());
    const B = Float64Array.from({ length: N * 3 }, () => rnd());
    // y depends mostly on x3, then x1, not on x2
    const t = saltelliTable(A, B, N, names, (x) => 5 * x[2] + x[0]);
    const report = analyzeSensitivity({ inputs: t.inputs, outputs: { y: t.y }, layout: { kind: 'saltelli', base: N, inputs: names } }, { resamples: 200 });
    const text = formatSensitivitySummary(report);
    // x2 has no effect: its estimates are noise around 0 and print as 0 at their precision
    expect(text).toMatch(/^ {2}y {2}x3 \d\.\d+ \(\d\.\d+\) > x1 0\.\d+ \(0\.\d+\) > x2 0\.0+ \(0\.0+\)$/m);
    expect(text).not.toMatch(/e-\d/);

    // the same with a tiny base: wide intervals are flagged
    const n = 8;
    const small = saltelliTable(A.slice(0, n * 3), B.slice(0, n * 3), n, names, (x) => 5 * x[2] + x[0] + Math.sin(40 * x[1]));
    const noisy = formatSensitivitySummary(
      analyzeSensitivity({ inputs: small.inputs, outputs: { y: small.y }, layout: { kind: 'saltelli', base: n, inputs: names } }, { resamples: 200 }),
    );
    expect(noisy).toContain('Needs more samples');
    expect(noisy).toMatch(/ {2}y \/ x\d: S[1T] -?\d\.\d\d \[-?\d\.\d\d, -?\d\.\d\d\]: .*(outside \[0, 1\]|wider than 0\.25)/);
  });

  it('latin-hypercube: ranked by S1, no totals', () => {
    const N = 512;
    const rnd = lcg(9);
    const cols = names.map(() => Float64Array.from({ length: N }, () => rnd()));
    const y = Float64Array.from({ length: N }, (_, r) => 5 * cols[2][r] + cols[0][r]);
    const text = formatSensitivitySummary(
      analyzeSensitivity({ inputs: { x1: cols[0], x2: cols[1], x3: cols[2] }, outputs: { y }, layout: { kind: 'latin-hypercube', samples: N, inputs: names } }),
    );
    expect(text).toContain('Inputs ranked by first-order index S1');
    // 1/sqrt(512) = 0.044: two decimals
    expect(text).toMatch(/^ {2}y {2}x3 0\.\d\d > x1 0\.\d\d > x2 0\.\d\d$/m);
  });

  it('prints one line for outputs that are affine copies and names the copies', () => {
    const axes = [{ name: 'a', values: linspace(1, 2, 5) }, { name: 'b', values: linspace(-1, 1, 3) }];
    const g = gridTable(axes, (x) => x[0] * x[0] + x[1]);
    // a pressure and the depth computed from it; a constant; an unrelated output
    const outputs = { p: g.y, depth: g.y.map((v) => (v * 1e9) / (3300 * 9.81) / 1000), flat: g.y.map(() => 3), q: g.y.map((v) => v * v) };
    const report = analyzeSensitivity({ inputs: g.inputs, outputs, layout: { kind: 'grid', axes } });
    expect(Object.keys(report.copies)).toEqual(['depth']);
    expect(report.copies.depth.of).toBe('p');
    const text = formatSensitivitySummary(report);
    expect(text.split('\n')[0]).toContain('4 output(s), 3 distinct');
    expect(text).toMatch(/^ {2}p {5}a .* \(same as depth\)$/m);
    expect(text).not.toMatch(/^ {2}depth /m);
    expect(text).toMatch(/^ {2}flat {2}constant over the used rows$/m);
  });

  it('caps the notes', () => {
    const N = 64;
    const rnd = lcg(4);
    const a = Float64Array.from({ length: N }, () => rnd());
    const b = Float64Array.from({ length: N }, () => rnd());
    const outputs = { p: a.map((v, r) => v * b[r]), q: a.map((v, r) => v + b[r] * b[r]), r: a.map((v, r) => Math.sin(v + b[r])) };
    const report = analyzeSensitivity({ inputs: { a, b }, outputs, layout: { kind: 'latin-hypercube', samples: N, inputs: ['a', 'b'] } });
    expect(report.notes.length).toBeGreaterThan(2);
    const text = formatSensitivitySummary(report, { maxNotes: 2 });
    expect(text).toContain(`  ... and ${report.notes.length - 2} more in the sensitivity table's metadata`);
  });
});

describe('precision and flags', () => {
  const rec = (value: number, lo: number | null, hi: number | null, n = 100) => ({ output: 'y', input: 'x', measure: 'ST' as const, value, ci_low: lo, ci_high: hi, n });

  it('rounds to the interval half-width and prints noise around 0 as 0', () => {
    expect(formatIndex(rec(-2.42e-12, -0.01, 0.01), 'saltelli')).toBe('0.00');
    expect(formatIndex(rec(0.4567, 0.43, 0.48), 'saltelli')).toBe('0.46');
    expect(formatIndex(rec(0.4567, 0.2, 0.7), 'saltelli')).toBe('0.5');
    expect(formatIndex(rec(0.4567, null, null), 'grid')).toBe('0.457');
  });

  it('flags values outside [0, 1] beyond their precision and wide intervals', () => {
    expect(needsMoreSamples(rec(1.17, 0.79, 1.86), 'saltelli')).toMatch(/outside \[0, 1\].*wider than 0\.25/);
    expect(needsMoreSamples(rec(-0.01, -0.03, 0.01), 'saltelli')).toBeNull();
    expect(needsMoreSamples(rec(0.5, 0.45, 0.55), 'saltelli')).toBeNull();
    expect(needsMoreSamples(rec(1.2, null, null, 10000), 'latin-hypercube')).toMatch(/outside/);
  });
});

describe('affine copies', () => {
  it('finds y = s x + o on the same usable rows and rejects near-copies', () => {
    const x = Float64Array.from({ length: 200 }, (_, i) => Math.sin(i) + 2);
    expect(affineCopy(x, x.map((v) => 3 * v - 1))).toEqual({ scale: expect.closeTo(3, 12), offset: expect.closeTo(-1, 12) });
    const bent = x.map((v, i) => 3 * v - 1 + (i === 150 ? 1e-6 : 0));
    expect(affineCopy(x, bent)).toBeNull();
    const holes = x.map((v, i) => (i === 7 ? NaN : 3 * v));
    expect(affineCopy(x, holes)).toBeNull();
    expect(affineCopy(x, x.map(() => 1))).toBeNull();
  });
});

describe('a single swept input', () => {
  it('reports S1 = ST = 1 exactly for every design, with a note, instead of a noisy estimate', () => {
    const N = 8;
    const rnd = lcg(2);
    const A = Float64Array.from({ length: N }, () => rnd());
    const B = Float64Array.from({ length: N }, () => rnd());
    const t = saltelliTable(A, B, N, ['x'], (x) => Math.exp(x[0]));
    const r = analyzeSensitivity({ inputs: t.inputs, outputs: { y: t.y, c: t.y.map(() => 2) }, layout: { kind: 'saltelli', base: N, inputs: ['x'] } });
    const get = (o: string, m: string) => r.records.find((q) => q.output === o && q.measure === m)!;
    expect(get('y', 'S1').value).toBe(1);
    expect(get('y', 'ST').value).toBe(1);
    expect(get('y', 'ST').ci_low).toBeNull();
    expect(get('c', 'S1').value).toBeNull();
    expect(r.notes.some((n) => n.startsWith('x is the only swept input'))).toBe(true);
    const lhs = analyzeSensitivity({ inputs: { x: A }, outputs: { y: A.map(Math.exp) }, layout: { kind: 'latin-hypercube', samples: N, inputs: ['x'] } });
    expect(lhs.records.filter((q) => q.output === 'y').map((q) => q.value)).toEqual([1, 1]);
  });
});
