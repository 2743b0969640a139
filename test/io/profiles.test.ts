/**
 * The profile table (`run --profiles`): agreement with `meltsweep column --profile`, the row rule
 * (null above the top, F = 0 on the adiabat below the onset), resume and merge keep it consistent.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import fs from 'node:fs';
import path from 'node:path';
import * as arrow from 'apache-arrow';
import { validateSweep } from '../../src/spec/index.js';
import { runSweep } from '../../src/run/run-sweep.js';
import { mergeShards } from '../../src/run/merge.js';
import { adiabatTempC } from '../../src/physics/adiabat.js';
import { DEFAULT_PARAMS } from '../../src/physics/params.js';
import { PROFILE_FIELDS, PROFILE_TABLE_FIELDS, RESULT_NUMERIC_FIELDS } from '../../src/physics/fields.js';
import type { ColumnResult } from '../../src/physics/types.js';
import { parseProfileGrid, profileGridPressures } from '../../src/run/profile-grid.js';
import { allocateProfileSamples, sampleColumnProfile } from '../../src/run/profile-sampling.js';
import { readTableBatches, readTableSchema } from '../../src/io/table-reader.js';
import { profilesPathFor } from '../../src/io/output-format.js';
import { InputError } from '../../src/errors.js';
import { profileColumnsMarkdown } from '../../src/io/field-table.js';
import { runCliSync, tableColumns, tmpDir } from '../helpers.js';

const dir = tmpDir('profiles');
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));

// 2 x 2 x 2 scenarios; the hot wet ones start melting beyond the model range
const spec = validateSweep({
  name: 'profile check P-1',
  axes: { tp_c: { values: [1350, 1500] }, water_ppm: { values: [100, 1000] }, lid_km: { values: [0, 10] } },
  design: { kind: 'grid' },
  model: { thermal: 'isentropic', water: 'batch' },
});
const GRID = parseProfileGrid('0:8:0.05');
const P = profileGridPressures(GRID);

async function readAll(file: string): Promise<Record<string, unknown[]>> {
  const batches: arrow.RecordBatch[] = [];
  for await (const b of readTableBatches(file)) batches.push(b);
  return tableColumns(new arrow.Table(batches));
}

const whole = path.join(dir, 'whole.arrow');
beforeAll(async () => {
  await runSweep({ spec, outPath: whole, workers: 2, profiles: GRID });
});

describe('profile grid', () => {
  it('parses FROM:TO:STEP in GPa and refuses what it cannot use', () => {
    expect(P.length).toBe(161);
    expect(P[3]).toBe(0.15);
    expect(P[160]).toBe(8);
    expect(() => parseProfileGrid('0:8')).toThrow(InputError);
    expect(() => parseProfileGrid('0:9:0.1')).toThrow(/leaves the model range 0 to 8 GPa/);
    expect(() => parseProfileGrid('2:1:0.1')).toThrow(/lower to a higher pressure/);
    expect(() => parseProfileGrid('0:8:0')).toThrow(/positive step/);
    expect(() => parseProfileGrid('0:8:1e-6')).toThrow(/at most 100001/);
  });
});

describe('profile table', () => {
  it('has every grid pressure for every scenario, in order, with units from the registry', async () => {
    const file = profilesPathFor(whole);
    expect(file).toBe(path.join(dir, 'whole.profiles.arrow'));
    const schema = await readTableSchema(file);
    expect(schema.fields.map((f) => f.name)).toEqual(['scenario_id', ...PROFILE_TABLE_FIELDS.map((f) => f.name)]);
    for (const f of PROFILE_TABLE_FIELDS) expect(schema.fields.find((x) => x.name === f.name)!.metadata.get('unit')).toBe(f.unit);
    // units agree with the column profile and the results registry
    for (const f of PROFILE_FIELDS) expect(PROFILE_TABLE_FIELDS.find((x) => x.name === f.name)!.unit).toBe(f.unit);
    expect(PROFILE_TABLE_FIELDS.find((x) => x.name === 'productivity_pct_per_gpa')!.unit).toBe(
      RESULT_NUMERIC_FIELDS.find((x) => x.name === 'productivity_pct_per_gpa')!.unit,
    );
    expect(schema.metadata.get('meltsweep.table')).toBe('profiles');
    expect(schema.metadata.get('meltsweep.profile_grid')).toBe('0:8:0.05');
    const t = await readAll(file);
    expect(t.scenario_id).toHaveLength(8 * 161);
    for (let i = 0; i < 8; i++) {
      for (let j = 0; j < 161; j++) {
        expect(t.scenario_id[i * 161 + j]).toBe(i);
        expect(t.p_gpa[i * 161 + j]).toBe(P[j]);
      }
    }
    expect(t.depth_km[161 + 20]).toBeCloseTo((1e9 * P[20]) / (DEFAULT_PARAMS.rho_s * DEFAULT_PARAMS.g) / 1000, 9);
  });

  it('agrees with `meltsweep column --profile` for the same scenario', async () => {
    const results = await readAll(whole);
    const table = await readAll(profilesPathFor(whole));
    // scenario 1: tp 1350, water 100, lid 10 (grid order, the last axis fastest)
    expect([results.tp_c[1], results.water_ppm[1], results.lid_km[1], results.status[1]]).toEqual([1350, 100, 10, 'ok']);
    const csv = path.join(dir, 'column.csv');
    const r = runCliSync(['column', '--tp', '1350', '--water', '100', '--lid', '10', '--thermal', 'isentropic', '--mode', 'batch', '--tolerance', '0.0001', '--profile', csv]);
    expect(r.status, r.stderr).toBe(0);
    const [header, ...lines] = fs.readFileSync(csv, 'utf8').trim().split('\n');
    const names = header.split(',');
    const path_ = Object.fromEntries(names.map((n, c) => [n, lines.map((l) => Number(l.split(',')[c]))]));
    const pp = path_.p_gpa; // onset (deepest) first
    const onset = pp[0];
    const top = pp[pp.length - 1];
    expect(onset).toBe(results.onset_p_gpa[1]);
    expect(top).toBe(results.top_p_gpa[1]);
    let inside = 0;
    for (let j = 0; j < P.length; j++) {
      const at = 161 + j;
      const p = P[j];
      const got = { t: table.t_c[at], f: table.f[at], w: table.h2o_melt_wt_pct[at], prod: table.productivity_pct_per_gpa[at] };
      if (p < top) {
        expect(got, `p ${p}`).toEqual({ t: null, f: null, w: null, prod: null });
      } else if (p > onset) {
        expect(got.f).toBe(0);
        expect(got.prod).toBe(0);
        expect(got.w).toBeNull();
        expect(got.t as number).toBeCloseTo(adiabatTempC(1350, p, DEFAULT_PARAMS), 9);
      } else {
        inside++;
        // the path segment holding p; the table is the linear interpolant of the same doubles, so
        // the only difference allowed is rounding
        let k = pp.length - 1;
        while (k > 0 && pp[k] < p) k--;
        const a = k === pp.length - 1 ? k - 1 : k;
        const w = (p - pp[a]) / (pp[a + 1] - pp[a]);
        const lerp = (y: number[]): number => y[a] + w * (y[a + 1] - y[a]);
        const tol = (x: number): number => 1e-9 * Math.max(1, Math.abs(x));
        expect(Math.abs((got.t as number) - lerp(path_.t_c))).toBeLessThan(tol(lerp(path_.t_c)));
        expect(Math.abs((got.f as number) - lerp(path_.f))).toBeLessThan(1e-12);
        expect(Math.abs((got.w as number) - lerp(path_.h2o_melt_wt_pct))).toBeLessThan(1e-12);
        const slope = (-100 * (path_.f[a + 1] - path_.f[a])) / (pp[a + 1] - pp[a]);
        expect(Math.abs((got.prod as number) - slope)).toBeLessThan(tol(slope));
        // and it lies between the neighbouring path points
        expect(got.f as number).toBeGreaterThanOrEqual(Math.min(path_.f[a], path_.f[a + 1]) - 1e-15);
        expect(got.f as number).toBeLessThanOrEqual(Math.max(path_.f[a], path_.f[a + 1]) + 1e-15);
      }
    }
    expect(inside).toBeGreaterThan(20);
  });

  it('is documented in the README from the field registry', () => {
    expect(fs.readFileSync(new URL('../../README.md', import.meta.url), 'utf8')).toContain(profileColumnsMarkdown());
  });

  it('leaves the values of scenarios beyond the model range null', async () => {
    const results = await readAll(whole);
    const table = await readAll(profilesPathFor(whole));
    const beyond = results.status.indexOf('onset_beyond_range');
    expect(beyond).toBeGreaterThanOrEqual(0);
    for (let j = 0; j < 161; j++) {
      const at = beyond * 161 + j;
      expect([table.t_c[at], table.f[at], table.h2o_melt_wt_pct[at], table.productivity_pct_per_gpa[at]]).toEqual([null, null, null, null]);
      expect(table.p_gpa[at]).toBe(P[j]);
    }
  });

  it('samples a conductive or no-melt column by the documented rule', () => {
    const prof = {
      p_gpa: Float64Array.of(2, 1.5, 1),
      depth_km: Float64Array.of(60, 45, 30),
      t_c: Float64Array.of(1400, 1350, 1300),
      f: Float64Array.of(0, 0.05, 0.15),
      h2o_melt_wt_pct: Float64Array.of(1, 0.8, 0.5),
    };
    const ok = { status: 'ok', profile: prof } as unknown as ColumnResult;
    const grid = Float64Array.of(0.5, 1, 1.25, 1.5, 2, 3);
    const out = allocateProfileSamples(2, grid.length);
    sampleColumnProfile(ok, 1350, 30, 'conductive', DEFAULT_PARAMS, grid, out, 0);
    const row = (a: Float64Array, i: number): number[] => Array.from(a.subarray(i * 6, i * 6 + 6));
    expect(row(out.t_c, 0)).toEqual([NaN, 1300, 1325, 1350, 1400, NaN]); // conductive: no T below the onset
    expect(row(out.f, 0)).toEqual([NaN, 0.15, 0.1, 0.05, 0, 0]);
    expect(row(out.h2o_melt_wt_pct, 0)).toEqual([NaN, 0.5, 0.65, 0.8, 1, NaN]);
    // slope of the segment holding p (at a path point: the segment above it)
    expect(row(out.productivity_pct_per_gpa, 0).map((v) => (Number.isNaN(v) ? v : Math.round(v * 1e9) / 1e9))).toEqual([NaN, 20, 20, 20, 10, 0]);
    const none = { status: 'no_melt', profile: undefined } as unknown as ColumnResult;
    sampleColumnProfile(none, 1300, 30, 'isentropic', DEFAULT_PARAMS, grid, out, 1);
    const top = (30 * DEFAULT_PARAMS.rho_s * DEFAULT_PARAMS.g) / 1e6; // GPa at the lid base
    expect(top).toBeGreaterThan(0.5);
    expect(top).toBeLessThan(1);
    expect(row(out.f, 1)).toEqual([NaN, 0, 0, 0, 0, 0]);
    expect(row(out.t_c, 1)[5]).toBeCloseTo(adiabatTempC(1300, 3, DEFAULT_PARAMS), 9);
    expect(row(out.h2o_melt_wt_pct, 1).every(Number.isNaN)).toBe(true);
  });
});

describe('resume and merge with profiles', () => {
  it('resumes a Parquet run with profiles to the same two tables', async () => {
    const reference = path.join(dir, 'ref.parquet');
    await runSweep({ spec, outPath: reference, workers: 1, profiles: GRID });
    const out = path.join(dir, 'resumed.parquet');
    const controller = new AbortController();
    const first = await runSweep({
      spec, outPath: out, workers: 1, chunkSize: 1, segmentRows: 1, signal: controller.signal, profiles: GRID,
      progress: { update: (done) => { if (done >= 2) controller.abort(); }, finish: () => undefined },
    });
    expect(first.interrupted).toBe(true);
    expect(first.rows).toBeLessThan(8);
    expect(fs.existsSync(out)).toBe(false);
    expect(fs.existsSync(profilesPathFor(out))).toBe(false);
    // the partial run remembers its grid
    await expect(runSweep({ spec, outPath: out, workers: 1, resume: true })).rejects.toThrow(/started with --profiles 0:8:0.05/);
    await expect(runSweep({ spec, outPath: out, workers: 1, resume: true, profiles: parseProfileGrid('0:4:0.1') })).rejects.toThrow(InputError);
    const second = await runSweep({ spec, outPath: out, workers: 2, resume: true, profiles: GRID });
    expect(second.interrupted).toBe(false);
    expect(second.computedRows).toBe(8 - first.rows);
    expect(second.profilesPath).toBe(profilesPathFor(out));
    expect(fs.readFileSync(out).subarray(0, 4).toString('latin1')).toBe('PAR1');
    expect(await readAll(out)).toEqual(await readAll(reference));
    expect(await readAll(profilesPathFor(out))).toEqual(await readAll(profilesPathFor(reference)));
    expect(await readAll(profilesPathFor(out))).toEqual(await readAll(profilesPathFor(whole)));
    // resuming a finished run is a no-op
    const again = await runSweep({ spec, outPath: out, workers: 1, resume: true, profiles: GRID });
    expect(again.computedRows).toBe(0);
  });

  it('merges the shards\' profile tables with the shards', async () => {
    const parts = [1, 2, 3].map((k) => path.join(dir, `part-${k}.${k === 2 ? 'csv' : 'arrow'}`));
    for (const [i, p] of parts.entries()) await runSweep({ spec, outPath: p, workers: 1, shard: { k: i + 1, n: 3 }, profiles: GRID });
    const merged = path.join(dir, 'merged.arrow');
    const m = await mergeShards(parts, merged);
    expect(m.profilesPath).toBe(profilesPathFor(merged));
    expect(await readAll(profilesPathFor(merged))).toEqual(await readAll(profilesPathFor(whole)));
    fs.rmSync(profilesPathFor(parts[2]));
    const m2 = await mergeShards(parts, path.join(dir, 'merged2.arrow'));
    expect(m2.profilesPath).toBeNull();
    expect(m2.profilesNote).toBe('profile tables not merged: only 2 of 3 shards have one');
  });
});
