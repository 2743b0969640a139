import { describe, expect, it } from 'vitest';
import { spawnSync } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { PROFILE_FIELDS, RESULT_NUMERIC_FIELDS, RESULT_NUMERIC_NAMES } from '../../src/physics/fields.js';

const CLI = fileURLToPath(new URL('../../dist/src/cli/main.js', import.meta.url));

function cli(...args: string[]) {
  return spawnSync(process.execPath, [CLI, ...args], { encoding: 'utf8' });
}

function json(...args: string[]): Record<string, unknown> {
  const r = cli('column', ...args, '--json');
  expect(r.status, r.stderr).toBe(0);
  return JSON.parse(r.stdout) as Record<string, unknown>;
}

describe('meltsweep column', () => {
  it('--json prints one object whose keys are status, reason and the registry names, in order', () => {
    const out = json('--tp', '1350', '--water', '100', '--lid', '10');
    expect(Object.keys(out)).toEqual(['status', 'reason', ...RESULT_NUMERIC_NAMES, 'inputs', 'model']);
    expect(out.status).toBe('ok');
    expect(out.reason).toBeNull();
    expect(typeof out.crust_km).toBe('number');
    expect(out.melt_flux_kg_m2_yr).toBeNull(); // no upwelling rate
    expect(out.surface_heat_flow_mw_m2).toBeNull(); // isentropic
    expect(out.top_depth_km as number).toBeCloseTo(10, 9);
  });

  it('--json echoes the inputs (null where not given) and the model options it ran with', () => {
    const out = json('--tp', '1350', '--water', '100', '--lid', '10', '--mode', 'fractional', '--step', '0.02');
    expect(out.inputs).toEqual({ tp_c: 1350, water_ppm: 100, lid_km: 10, upwelling_mm_yr: null });
    expect(out.model).toEqual({
      process: 'decompression',
      thermal: 'auto',
      water: 'fractional',
      params: {},
      step_gpa: 0.02,
      resolved: 'model: isentropic (auto: no upwelling rate), water fractional',
    });
    const conductive = json('--tp', '1350', '--upwelling', '5');
    expect(conductive.inputs).toEqual({ tp_c: 1350, water_ppm: 0, lid_km: 0, upwelling_mm_yr: 5 });
    expect((conductive.model as Record<string, unknown>).resolved).toBe('model: conductive (auto: an upwelling rate is given), water batch');
  });

  it('--upwelling with --thermal isentropic gives the melt flux rho_s w F_max', () => {
    const out = json('--tp', '1350', '--upwelling', '20', '--thermal', 'isentropic');
    expect(out.melt_flux_kg_m2_yr as number).toBeCloseTo(3300 * 0.02 * (out.f_max as number), 9);
  });

  it('no_melt rows: crust 0 and null onset, exit 0', () => {
    const out = json('--tp', '1150', '--lid', '30');
    expect(out.status).toBe('no_melt');
    expect(out.crust_km).toBe(0);
    expect(out.onset_p_gpa).toBeNull();
  });

  it('prints a readable table with the registry units', () => {
    const r = cli('column', '--tp', '1350', '--mode', 'fractional', '--water', '200');
    expect(r.status, r.stderr).toBe(0);
    const lines = r.stdout.trim().split('\n');
    expect(lines[0]).toBe('model: isentropic (auto: no upwelling rate), water fractional');
    expect(lines[1]).toMatch(/^status\s+ok$/);
    for (const f of RESULT_NUMERIC_FIELDS) {
      const line = lines.find((l) => l.startsWith(`${f.name} `));
      expect(line, f.name).toBeDefined();
      if (!line!.trim().endsWith('-')) expect(line!.endsWith(` ${f.unit}`), line).toBe(true);
    }
  });

  it('a bad --tp exits 2 and names the option, the value and the allowed range', () => {
    for (const [value, pattern] of [
      ['abc', /--tp: "abc" is not a number; allowed 1100-1800 degC/],
      ['1900', /--tp: 1900 is above the model's range 1100-1800 degC/],
      ['1099', /--tp: 1099 is below/],
    ] as const) {
      const r = cli('column', '--tp', value);
      expect(r.status).toBe(2);
      expect(r.stderr).toMatch(pattern);
    }
  });

  it('other bad values exit 2 naming their option', () => {
    for (const [args, option] of [
      [['--water', '60000'], '--water'],
      [['--lid', '-1'], '--lid'],
      [['--upwelling', '0'], '--upwelling'],
      [['--upwelling', '20000'], '--upwelling'],
      [['--mode', 'partial'], '--mode'],
      [['--thermal', 'hot'], '--thermal'],
      [['--step', '0'], '--step'],
      [['--thermal', 'conductive'], '--thermal'],
    ] as const) {
      const r = cli('column', '--tp', '1350', ...args);
      expect(r.status, args.join(' ')).toBe(2);
      expect(r.stderr).toContain(option);
    }
    expect(cli('column').status).toBe(2); // --tp is required
  });

  it('--profile writes a CSV from the onset to the top with units in the column names', () => {
    const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'meltsweep-column-'));
    try {
      const file = path.join(dir, 'profile.csv');
      const out = json('--tp', '1400', '--water', '150', '--lid', '12', '--profile', file);
      const lines = fs.readFileSync(file, 'utf8').trim().split('\n');
      expect(lines[0]).toBe('p_gpa,depth_km,t_c,f,h2o_melt_wt_pct');
      expect(lines[0]).toBe(PROFILE_FIELDS.map((f) => f.name).join(','));
      const rows = lines.slice(1).map((l) => l.split(',').map(Number));
      expect(rows[0][0]).toBe(out.onset_p_gpa);
      expect(rows[rows.length - 1][0]).toBe(out.top_p_gpa);
      expect(rows[rows.length - 1][3]).toBe(out.f_max);
      for (const row of rows) for (const v of row) expect(Number.isFinite(v)).toBe(true);
    } finally {
      fs.rmSync(dir, { recursive: true, force: true });
    }
  });
});
