import { afterAll, describe, expect, it } from 'vitest';
import { createHash } from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';
import { readResultsMeta } from '../../src/io/arrow-schema.js';
import { FLUX_RESULTS } from '../../src/process/flux.js';
import { loadSweepFile, validateSweep } from '../../src/spec/index.js';
import { ROOT, readTable, runCliSync, tableColumns, tmpDir, writeSweep, problemsOf } from '../helpers.js';
import { refColumn, type RefInputs } from './flux-reference.js';

const dir = tmpDir('flux');
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));

const columnJson = (args: readonly string[]): Record<string, unknown> => {
  const r = runCliSync(['column', '--process', 'flux', ...args, '--json']);
  expect(r.status, r.stderr).toBe(0);
  return JSON.parse(r.stdout) as Record<string, unknown>;
};

describe('flux sweeps: validation', () => {
  it('an input the process does not use is an error naming the input and the process', () => {
    expect(problemsOf(() => validateSweep({ axes: { tp_c: { values: [1300] }, water_ppm: { values: [100] }, lid_km: { values: [60] }, upwelling_mm_yr: { values: [3] } }, model: { process: 'flux' } }))).toEqual([
      'axes.upwelling_mm_yr: upwelling_mm_yr is not an input of process flux; its inputs: tp_c, water_ppm, lid_km, slab_depth_km',
    ]);
    expect(problemsOf(() => validateSweep({ axes: { tp_c: { values: [1300] }, water_ppm: { values: [100] }, lid_km: { values: [60] } }, model: { process: 'flux', heat: 'warm' } }))).toEqual([
      'model.heat: "warm" is not a heat mode; allowed: balanced, fixed',
    ]);
  });

  it('slab_depth_km defaults to 100 km, allowed 20-300 km', () => {
    const spec = validateSweep({ axes: { water_ppm: { values: [100, 1000] } }, fixed: { tp_c: 1350, lid_km: 60 }, model: { process: 'flux' } });
    expect(spec.fixed).toEqual({ tp_c: 1350, lid_km: 60, slab_depth_km: 100 });
    expect(spec.model).toEqual({ process: 'flux', geotherm: 'lid-adiabat', heat: 'balanced', params: {} });
    expect(problemsOf(() => validateSweep({ axes: { water_ppm: { values: [100] } }, fixed: { tp_c: 1350, lid_km: 60, slab_depth_km: 10 }, model: { process: 'flux' } }))).toEqual([
      "fixed.slab_depth_km: 10 is below the model's range 20-300 km",
    ]);
  });

  it('a geotherm table is read relative to the sweep file, hashed into the spec, and then tp_c and lid_km are not inputs', async () => {
    const sub = path.join(dir, 'arc');
    fs.mkdirSync(sub, { recursive: true });
    const csv = '# invented wedge W-1\ndepth_km,t_c\n0,0\n50,900\n80,1250\n200,1420\n';
    fs.writeFileSync(path.join(sub, 'wedge.csv'), csv);
    const file = writeSweep(sub, 'w1.yaml', 'axes:\n  water_ppm: { values: [1000, 5000] }\nfixed: { slab_depth_km: 120 }\nmodel: { process: flux, geotherm: { file: wedge.csv } }\n');
    const spec = await loadSweepFile(file);
    const g = spec.model.geotherm as { file: string; sha256: string; axis: string; at: number[]; t_c: number[] };
    expect(g.sha256).toBe(createHash('sha256').update(csv).digest('hex'));
    expect([g.file, g.axis, g.at, g.t_c]).toEqual(['wedge.csv', 'depth_km', [0, 50, 80, 200], [0, 900, 1250, 1420]]);
    // the stored spec validates again without the file (a results file read elsewhere)
    const again = validateSweep({ axes: { water_ppm: { values: [300] } }, model: JSON.parse(JSON.stringify(spec.model)) as unknown });
    expect(again.model).toEqual(spec.model);
    const bad = writeSweep(sub, 'w2.yaml', 'axes:\n  water_ppm: { values: [300] }\n  tp_c: { values: [1300] }\nmodel: { process: flux, geotherm: { file: wedge.csv } }\n');
    await expect(loadSweepFile(bad)).rejects.toThrow(
      'axes.tp_c: tp_c is not an input of process flux; its inputs: water_ppm, slab_depth_km (the geotherm table gives the temperatures, so tp_c and lid_km are not inputs)',
    );
    const missing = writeSweep(sub, 'w3.yaml', 'axes:\n  water_ppm: { values: [300] }\nmodel: { process: flux, geotherm: { file: nowhere.csv } }\n');
    await expect(loadSweepFile(missing)).rejects.toThrow(/model\.geotherm\.file: cannot read the geotherm table "nowhere.csv" \(no such file/);
    fs.writeFileSync(path.join(sub, 'bad.csv'), 'depth_km,t_c\n0,0\n40,800\n30,900\n');
    const badTable = writeSweep(sub, 'w4.yaml', 'axes:\n  water_ppm: { values: [300] }\nmodel: { process: flux, geotherm: { file: bad.csv } }\n');
    await expect(loadSweepFile(badTable)).rejects.toThrow('model.geotherm.file: bad.csv line 4: depth_km 30 does not rise above the row before (40); rows go from the surface down');
    // the run writes the table's hash into the results metadata (the stored sweep)
    const out = path.join(sub, 'w1.arrow');
    const r = runCliSync(['run', file, '-o', out]);
    expect(r.status, r.stderr).toBe(0);
    const t = readTable(out);
    const meta = readResultsMeta(t.schema);
    expect(meta.process).toBe('flux');
    expect(t.schema.metadata.get('meltsweep.sweep')).toContain(g.sha256);
    expect(t.schema.fields.map((f) => f.name)).toEqual(['scenario_id', 'water_ppm', 'slab_depth_km', 'status', 'reason', ...FLUX_RESULTS.map((f) => f.name)]);
    const c = tableColumns(t);
    expect(c.status).toEqual(['ok', 'ok']);
    expect(c.melt_column_km[1] as number).toBeGreaterThan(c.melt_column_km[0] as number);
    // column --geotherm reads the same table from the working folder and gives the same row
    const one = runCliSync(['column', '--process', 'flux', '--geotherm', 'wedge.csv', '--water', '1000', '--slab-depth', '120', '--json'], { cwd: sub });
    expect(one.status, one.stderr).toBe(0);
    expect((JSON.parse(one.stdout) as Record<string, unknown>).melt_column_km).toBe(c.melt_column_km[0]);
    const both = runCliSync(['column', '--process', 'flux', '--geotherm', 'wedge.csv', '--water', '1000', '--tp', '1300'], { cwd: sub });
    expect(both.status).toBe(2);
    expect(both.stderr).toContain('--tp: tp_c is not an input of process flux; its inputs: water_ppm (--water), slab_depth_km (--slab-depth) (the geotherm table gives the temperatures');
  });
});

describe('meltsweep column --process flux', () => {
  it('prints every result field; --json keys are the field names', () => {
    const out = columnJson(['--tp', '1300', '--water', '500', '--lid', '70', '--slab-depth', '110']);
    expect(Object.keys(out)).toEqual(['status', 'reason', ...FLUX_RESULTS.map((f) => f.name), 'inputs', 'model']);
    expect(out.inputs).toEqual({ tp_c: 1300, water_ppm: 500, lid_km: 70, slab_depth_km: 110 });
    expect(out.model).toMatchObject({ process: 'flux', geotherm: 'lid-adiabat', heat: 'balanced', params: {} });
    expect(out.status).toBe('ok');
    expect(out.onset_depth_km as number).toBeCloseTo(110, 9); // melts down to the slab
    const text = runCliSync(['column', '--process', 'flux', '--tp', '1300', '--water', '500', '--lid', '70', '--slab-depth', '110', '--heat', 'fixed']);
    expect(text.status).toBe(0);
    expect(text.stdout).toContain('model: flux melting, geotherm lid-adiabat (plate + adiabat), heat fixed; tp_c 1300 degC, water_ppm 500 ppm, lid_km 70 km, slab_depth_km 110 km');
    for (const f of FLUX_RESULTS) expect(text.stdout).toContain(f.name);
  });

  it('bad options: exit 2 naming option, value and what is allowed; inputs of another process name input and process', () => {
    const r = runCliSync(['column', '--process', 'flux', '--tp', '1300', '--water', '500', '--lid', '70', '--upwelling', '3', '--heat', 'hot', '--thermal', 'auto']);
    expect(r.status).toBe(2);
    expect(r.stderr).toContain('--heat: "hot" is not a heat mode; allowed: balanced, fixed');
    expect(r.stderr).toContain('--thermal: process flux has no option thermal; its options: geotherm, heat, params');
    expect(r.stderr).toContain('--upwelling: upwelling_mm_yr is not an input of process flux; its inputs: tp_c (--tp), water_ppm (--water), lid_km (--lid), slab_depth_km (--slab-depth)');
    const d = runCliSync(['column', '--tp', '1300', '--heat', 'fixed']);
    expect(d.status).toBe(2);
    expect(d.stderr).toContain('--heat: process decompression has no option heat; its options: thermal, water, params, step_gpa');
  });

  it('agrees with an independent implementation (fine-grid trapezoids + bisection, test/process/flux-reference.ts) within 0.5 %', () => {
    const cases: RefInputs[] = [
      { tp: 1300, water: 500, lid: 70, slab: 110, heat: 'balanced' },
      { tp: 1300, water: 500, lid: 70, slab: 110, heat: 'fixed' },
      { tp: 1380, water: 150, lid: 60, slab: 90, heat: 'balanced' },
      { tp: 1420, water: 5000, lid: 40, slab: 150, heat: 'fixed' },
      { tp: 1330, water: 20000, lid: 80, slab: 130, heat: 'balanced' },
      { tp: 1250, water: 80, lid: 50, slab: 100, heat: 'fixed' },
    ];
    for (const c of cases) {
      const ours = columnJson(['--tp', String(c.tp), '--water', String(c.water), '--lid', String(c.lid), '--slab-depth', String(c.slab), '--heat', c.heat]);
      const ref = refColumn(c);
      const label = JSON.stringify(c);
      expect(ours.status, label).toBe(ref.melt_column_km > 0 ? 'ok' : 'no_melt');
      for (const k of ['onset_depth_km', 'top_depth_km', 'f_max', 'f_mean', 'melt_column_km', 'h2o_melt_wt_pct', 'water_threshold_ppm'] as const) {
        const a = ours[k] as number | null;
        const b = ref[k];
        if (b === null || b === 0) {
          expect(a, `${label} ${k}`).toBe(b);
          continue;
        }
        expect(Math.abs((a as number) / b - 1), `${label} ${k}: ${a} vs ${b}`).toBeLessThan(0.005);
      }
    }
  });
});

describe('the arc example (sweeps/arc-a2-flux.yaml)', () => {
  it('runs to a table, a sensitivity ranking and a report with maps of melt_column_km and water_threshold_ppm', () => {
    const out = path.join(dir, 'arc.arrow');
    const r = runCliSync(['run', path.join(ROOT, 'sweeps', 'arc-a2-flux.yaml'), '-o', out]);
    expect(r.status, r.stderr).toBe(0);
    const t = readTable(out);
    const c = tableColumns(t);
    expect(t.numRows).toBe(512 * 6);
    const statuses = new Set(c.status);
    expect(statuses.has('ok')).toBe(true);
    expect(statuses.has('failed')).toBe(false);
    // the box holds both regimes its comment promises: wedges that melt only when wet (threshold > 0)
    // and wedges that already reach the dry solidus (threshold 0), each at least a quarter of the rows
    const thresholds = c.water_threshold_ppm as (number | null)[];
    const wetOnly = thresholds.filter((v) => v !== null && v > 0).length;
    const dryToo = thresholds.filter((v) => v === 0).length;
    expect(wetOnly).toBeGreaterThan(t.numRows / 4);
    expect(dryToo).toBeGreaterThan(t.numRows / 4);
    const s = runCliSync(['sensitivity', out]);
    expect(s.status, s.stderr).toBe(0);
    expect(s.stdout).toMatch(/melt_column_km\s+water_ppm/);
    const html = path.join(dir, 'arc.html');
    // no --outputs: the report draws the flux process's own outputs (reportOutputs), not decompression's
    const rep = runCliSync(['report', out, '-o', html]);
    expect(rep.status, rep.stderr).toBe(0);
    const page = fs.readFileSync(html, 'utf8');
    expect(page).toContain('data-plot="map"');
    expect(page).toContain('data-output="water_threshold_ppm"');
    expect(page).toContain('data-output="melt_column_km"');
    expect(page).not.toContain('data-output="crust_km"');
    // the representative columns are drawn by the process's own diagram
    expect(page).toContain('data-plot="column"');
    expect(page).toContain('Representative columns by melt column: smallest, median, largest');
  });
});
