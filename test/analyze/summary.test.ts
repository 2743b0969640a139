import { describe, expect, it } from 'vitest';
import { analyzeSensitivity, formatSensitivitySummary } from '../../src/analyze/index.js';
import { gridTable, ishigami, lcg, linspace, midpoints, saltelliTable } from './helpers.js';

describe('formatSensitivitySummary', () => {
  const names = ['x1', 'x2', 'x3'];

  it('ranks grid inputs by ST, prints S1 and elasticities, and lists left-out rows and notes', () => {
    const axes = names.map((name) => ({ name, values: midpoints(-Math.PI, Math.PI, 16) }));
    const g = gridTable(axes, (x) => ishigami(x[0], x[1], x[2]));
    const include = new Uint8Array(g.n).fill(1);
    include[0] = 0;
    include[1] = 0;
    const text = formatSensitivitySummary(
      analyzeSensitivity({ inputs: g.inputs, outputs: { y: g.y }, include, excludedReasons: { no_melt: 2 }, layout: { kind: 'grid', axes } }),
    );
    const lines = text.split('\n');
    expect(lines[0]).toBe('Sensitivity of 1 output(s) to 3 input(s), grid design: 4,096 rows, 4,094 included');
    expect(lines[1]).toBe('Left out: no_melt 2');
    expect(text).toMatch(/^y {2}\(4,094 rows used; mean [\d.]+, sd [\d.]+\)$/m);
    expect(text).toMatch(/^ {2}input {2}ST +S1 +elasticity \(p10 \/ median \/ p90\)$/m);
    // Ishigami: S_T1 > S_T2 > S_T3
    const order = ['x1', 'x2', 'x3'].map((n) => lines.findIndex((l) => l.startsWith(`  ${n} `)));
    expect(order.every((i) => i > 0)).toBe(true);
    expect(order[0]).toBeLessThan(order[1]);
    expect(order[1]).toBeLessThan(order[2]);
    expect(text).toContain('Notes:');
    expect(text).toMatch(/ {2}x1 +0\.\d{3} +0\.\d{3} +-?[\d.e-]+ \/ /);
  });

  it('prints bootstrap intervals for saltelli designs and "-" for missing totals', () => {
    const N = 256;
    const rnd = lcg(3);
    const A = Float64Array.from({ length: N * 3 }, () => rnd());
    const B = Float64Array.from({ length: N * 3 }, () => rnd());
    // y depends mostly on x3, then x1, not on x2
    const t = saltelliTable(A, B, N, names, (x) => 5 * x[2] + x[0]);
    const text = formatSensitivitySummary(analyzeSensitivity({ inputs: t.inputs, outputs: { y: t.y }, layout: { kind: 'saltelli', base: N, inputs: names } }, { resamples: 50 }));
    const lines = text.split('\n');
    const at = (n: string) => lines.findIndex((l) => l.startsWith(`  ${n} `));
    expect(at('x3')).toBeLessThan(at('x1'));
    expect(at('x1')).toBeLessThan(at('x2'));
    expect(lines[at('x3')]).toMatch(/^ {2}x3 +\d\.\d{3} \[\d\.\d{3}, \d\.\d{3}\] +\d\.\d{3} \[\d\.\d{3}, \d\.\d{3}\]$/);
    expect(text).not.toContain('elasticity');

    const lhsInputs: Record<string, Float64Array> = { x1: t.inputs.x1.slice(0, N), x2: t.inputs.x2.slice(0, N), x3: t.inputs.x3.slice(0, N) };
    const lhs = formatSensitivitySummary(
      analyzeSensitivity({ inputs: lhsInputs, outputs: { y: t.y.slice(0, N) }, layout: { kind: 'latin-hypercube', samples: N, inputs: names } }),
    );
    expect(lhs).toMatch(/^ {2}x3 +- +\d\.\d{3}$/m);
  });

  it('caps the notes', () => {
    const axes = [{ name: 'a', values: linspace(-2, 2, 5) }, { name: 'b', values: linspace(-1, 1, 3) }];
    const g = gridTable(axes, (x) => x[0] * x[1]);
    const outputs = { p: g.y, q: g.y.map((v) => -v), r: g.y.map((v) => v - 1) };
    const report = analyzeSensitivity({ inputs: g.inputs, outputs, layout: { kind: 'grid', axes } });
    expect(report.notes.length).toBeGreaterThan(2);
    const text = formatSensitivitySummary(report, { maxNotes: 2 });
    expect(text).toContain(`  ... and ${report.notes.length - 2} more in the report`);
  });
});
