/** `meltsweep inspect`: schema with units, sweep metadata, counts and first rows; bad files exit 2. */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import fs from 'node:fs';
import path from 'node:path';
import { runCliSync, tmpDir, writeSweep } from '../helpers.js';

const dir = tmpDir('inspect');
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));

const SWEEP = `name: inspect check I-1
axes:
  tp_c: { values: [1300, 1500] }
  water_ppm: { values: [0, 1000] }
design: { kind: grid }
model: { thermal: isentropic }
`;

let hash = '';
beforeAll(() => {
  const sweep = writeSweep(dir, 'i.yaml', SWEEP);
  const r = runCliSync(['run', sweep, '-o', path.join(dir, 'r.parquet'), '-q', '--profiles', '0:4:0.5', '-w', '1']);
  expect(r.status, r.stderr).toBe(0);
  const c = runCliSync(['run', sweep, '-o', path.join(dir, 'r.csv'), '-q', '--no-summary', '-w', '1']);
  expect(c.status, c.stderr).toBe(0);
  const plan = runCliSync(['plan', sweep, '-w', '1']);
  hash = /sweep hash: ([0-9a-f]{64})/.exec(plan.stdout)![1];
});

describe('meltsweep inspect', () => {
  it('shows units, the sweep hash, counts by status and the first rows of a Parquet results table', () => {
    const r = runCliSync(['inspect', path.join(dir, 'r.parquet')]);
    expect(r.status, r.stderr).toBe(0);
    expect(r.stdout).toContain('format: parquet');
    expect(r.stdout).toContain('table: results');
    expect(r.stdout).toContain('rows: 4');
    expect(r.stdout).toContain('sweep: inspect check I-1');
    expect(r.stdout).toContain(`sweep hash: ${hash}`);
    expect(r.stdout).toMatch(/rows by status: .*ok \d/);
    expect(r.stdout).toMatch(/crust_km\s+Float64\?\s+km\s+crust thickness/);
    expect(r.stdout).toMatch(/tp_c\s+Float64\s+degC/);
    expect(r.stdout).toContain('first 4 row(s):');
  });

  it('reads profile and sensitivity tables and CSV through its sidecar', () => {
    const p = runCliSync(['inspect', path.join(dir, 'r.profiles.parquet'), '--rows', '2']);
    expect(p.status, p.stderr).toBe(0);
    expect(p.stdout).toContain('table: profiles');
    expect(p.stdout).toContain('rows: 36');
    expect(p.stdout).toContain('profile grid (GPa): 0:4:0.5');
    expect(p.stdout).toMatch(/productivity_pct_per_gpa\s+Float64\?\s+%\/GPa/);
    expect(p.stdout).toContain('first 2 row(s):');
    const s = runCliSync(['inspect', path.join(dir, 'r.sensitivity.arrow'), '--rows', '0']);
    expect(s.status, s.stderr).toBe(0);
    expect(s.stdout).toContain('table: sensitivity');
    expect(s.stdout).toContain(`sweep hash: ${hash}`);
    const c = runCliSync(['inspect', path.join(dir, 'r.csv'), '--json']);
    expect(c.status, c.stderr).toBe(0);
    const x = JSON.parse(c.stdout) as { format: string; rows: number; columns: Array<{ name: string; unit: string }>; statusCounts: Record<string, number> };
    expect(x.format).toBe('csv');
    expect(x.rows).toBe(4);
    expect(x.columns.find((col) => col.name === 'water_ppm')!.unit).toBe('ppm');
    expect(Object.values(x.statusCounts).reduce((a, b) => a + b, 0)).toBe(4);
  });

  it('refuses files it cannot read with a clear message and exit 2', () => {
    const missing = runCliSync(['inspect', path.join(dir, 'nope.arrow')]);
    expect(missing.status).toBe(2);
    expect(missing.stderr).toContain('nope.arrow does not exist');
    const text = path.join(dir, 'notes.txt');
    fs.writeFileSync(text, 'just text\n');
    const bad = runCliSync(['inspect', text]);
    expect(bad.status).toBe(2);
    expect(bad.stderr).toContain('is not a table meltsweep can read: expected an Arrow IPC file, a Parquet file, or a CSV file with its sidecar');
    const truncated = path.join(dir, 'cut.parquet');
    fs.writeFileSync(truncated, fs.readFileSync(path.join(dir, 'r.parquet')).subarray(0, 64));
    const cut = runCliSync(['inspect', truncated]);
    expect(cut.status).toBe(2);
    expect(cut.stderr).toMatch(/cut\.parquet: cannot read/);
    const badRows = runCliSync(['inspect', path.join(dir, 'r.csv'), '--rows', 'many']);
    expect(badRows.status).toBe(2);
    expect(badRows.stderr).toContain('--rows');
  });
});
