/** `meltsweep fit` through the built CLI: the JSON shape, files, overwrites, and bad input (exit 2). */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import fs from 'node:fs';
import path from 'node:path';
import { readTable, runCliSync, tmpDir } from '../helpers.js';
import { gridSweepFile } from '../report/helpers.js';

const dir = tmpDir('fit-cli');
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));

let results = '';
beforeAll(async () => {
  results = await gridSweepFile(dir, 'r7.arrow');
}, 60_000);

describe('meltsweep fit', () => {
  it('--json prints exactly the documented object, and writes the fit table, the page and the refined sweep', () => {
    const r = runCliSync(['fit', results, '--observe', 'crust_km=7.1+-0.8', '--discrepancy', 'crust_km=0.5', '--predict', 'f_max,onset_depth_km', '--json', '--refine', path.join(dir, 'next.yaml')]);
    expect(r.status, r.stderr).toBe(0);
    const out = JSON.parse(r.stdout) as Record<string, unknown>;
    expect(Object.keys(out)).toEqual(['rows_used', 'rows_left_out', 'ess', 'posterior', 'predict', 'best']);
    expect(out.rows_used).toBe(45);
    expect(out.rows_left_out).toEqual({});
    const posterior = out.posterior as Record<string, Record<string, number>>;
    expect(Object.keys(posterior)).toEqual(['tp_c', 'water_ppm', 'lid_km']);
    expect(Object.keys(posterior.tp_c)).toEqual(['mean', 'sd', 'p2_5', 'p16', 'p50', 'p84', 'p97_5']);
    expect(Object.keys(out.predict as object)).toEqual(['f_max', 'onset_depth_km']);
    const best = out.best as Record<string, unknown>;
    expect(Math.abs((best.crust_km as number) - 7.1)).toBeLessThan(3 * 0.8);
    expect(typeof best.scenario_id).toBe('number');
    expect(best.status).toBe('ok');
    expect(fs.existsSync(path.join(dir, 'r7.fit.html'))).toBe(true);
    expect(fs.readFileSync(path.join(dir, 'next.yaml'), 'utf8')).toMatch(/^# Refined sweep written by meltsweep fit from r7.arrow/);
    const t = readTable(path.join(dir, 'r7.fit.arrow'));
    expect(t.numRows).toBe(45);
  });

  it('refuses to replace its files without --force (exit 2), replaces them with it, and prints the text summary', () => {
    const again = runCliSync(['fit', results, '--observe', 'crust_km=7.1+-0.8']);
    expect(again.status).toBe(2);
    expect(again.stderr).toContain(`fit table: ${path.join(dir, 'r7.fit.arrow')} already exists; use --force to replace it`);
    const obs = path.join(dir, 'S-4.yaml');
    fs.writeFileSync(obs, '# seismic line S-4\ncrust_km: { value: 6.3, sd: 0.6 }\nf_max: 0.18+-0.03\n');
    const forced = runCliSync(['fit', results, '--observations', obs, '--force']);
    expect(forced.status, forced.stderr).toBe(0);
    expect(forced.stdout).toContain('observed: crust_km = 6.3 +- 0.6 km');
    expect(forced.stdout).toContain('observed: f_max = 0.18 +- 0.03 fraction');
    expect(forced.stdout).toMatch(/prior: the sweep's own design: grid of 5 x 3 x 3 = 45 points, each equally likely/);
    expect(forced.stdout).toMatch(/effective sample size: [\d.]+/);
  });

  it('bad observations exit 2 with every problem named', () => {
    const r = runCliSync(['fit', results, '--observe', 'crust_km=7.1+-', '--observe', 'f_max=0.2+--0.1', '--observe', 'onset_depth_km=deep+-5', '--force']);
    expect(r.status).toBe(2);
    expect(r.stderr).toContain('--observe crust_km: the standard deviation after "+-" is missing');
    expect(r.stderr).toContain('--observe f_max: standard deviation -0.1 is not allowed; it must be above 0');
    expect(r.stderr).toContain('--observe onset_depth_km: "deep" is not a number');
    const unknown = runCliSync(['fit', results, '--observe', 'crust=7.1+-0.8', '--predict', 'fmax', '--force']);
    expect(unknown.status).toBe(2);
    expect(unknown.stderr).toContain('--observe: "crust" is not an output column of r7.arrow; did you mean crust_km?');
    expect(unknown.stderr).toContain('--predict: "fmax" is not an output column of r7.arrow; did you mean f_max?');
    expect(runCliSync(['fit', results, '--force']).stderr).toContain('--observe: no observation given');
  });
});
