/**
 * The library API: `import ... from 'meltsweep'` resolves through package.json "exports" to the
 * built dist/src/index.js (checked by node itself, in a folder where meltsweep is installed as a
 * dependency), and src/index.ts lists the public names.
 */
import { afterAll, describe, expect, it } from 'vitest';
import { spawnSync } from 'node:child_process';
import fs from 'node:fs';
import path from 'node:path';
import * as api from '../../src/index.js';
import { ROOT, tmpDir } from '../helpers.js';

const dir = tmpDir('package');
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));

describe('library API', () => {
  it('exports the documented names', () => {
    for (const name of [
      'meltColumn', 'defaultModel', 'resolveParams', 'DEFAULT_PARAMS', 'PARAM_INFO', 'validateSweep', 'loadSweepFile', 'parseSweepText',
      'planSweep', 'runSweep', 'mergeShards', 'analyzeSensitivity', 'analyzeResultsFile', 'INPUT_FIELDS', 'RESULT_NUMERIC_FIELDS',
      'PROFILE_TABLE_FIELDS', 'readTableBatches', 'readTableSchema', 'inspectTable', 'InputError', 'RunError', 'TOOL_VERSION',
      'fitTable', 'FitAccumulator', 'finishFit', 'fitResultsFile', 'parseObserveOption', 'refineAxes',
    ]) {
      expect(api, name).toHaveProperty(name);
    }
  });

  it('is importable by package name from an installed copy (node, dist build)', () => {
    expect(fs.existsSync(path.join(ROOT, 'dist', 'src', 'index.js')), 'run npm run build first').toBe(true);
    expect(fs.existsSync(path.join(ROOT, 'dist', 'src', 'index.d.ts'))).toBe(true);
    fs.mkdirSync(path.join(dir, 'node_modules'));
    fs.symlinkSync(ROOT, path.join(dir, 'node_modules', 'meltsweep'), 'dir');
    const script = path.join(dir, 'use.mjs');
    fs.writeFileSync(
      script,
      `import { meltColumn, defaultModel, validateSweep, planSweep, RESULT_NUMERIC_FIELDS } from 'meltsweep';
const r = meltColumn({ tp_c: 1350, water_ppm: 100, lid_km: 10, upwelling_mm_yr: NaN }, defaultModel({ thermal: 'isentropic' }));
const plan = planSweep(validateSweep({ name: 'pkg', axes: { tp_c: { from: 1300, to: 1400, count: 3 } }, design: { kind: 'grid' } }));
console.log(JSON.stringify({ status: r.status, crust: r.crust_km, count: plan.count, unit: RESULT_NUMERIC_FIELDS.find((f) => f.name === 'crust_km').unit }));
`,
    );
    const out = spawnSync(process.execPath, [script], { cwd: dir, encoding: 'utf8' });
    expect(out.status, out.stderr).toBe(0);
    const got = JSON.parse(out.stdout) as { status: string; crust: number; count: number; unit: string };
    expect(got).toMatchObject({ status: 'ok', count: 3, unit: 'km' });
    expect(got.crust).toBeGreaterThan(0);
  });
});
