import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import fs from 'node:fs';
import path from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { columnInputs } from '../../src/cli/commands/column.js';
import { readResultsMeta } from '../../src/io/arrow-schema.js';
import { inspectTable } from '../../src/io/inspect-table.js';
import { registerProcess } from '../../src/process/registry.js';
import type { ProcessDefinition } from '../../src/process/types.js';
import { runSweep } from '../../src/run/run-sweep.js';
import { analyzeResultsFile } from '../../src/io/sensitivity-file.js';
import { validateSweep } from '../../src/spec/index.js';
import { readTable, runCliSync, tableColumns, tmpDir, problemsOf } from '../helpers.js';

// A second process (test/fixtures/fake-process.mjs) flows through planner -> worker -> Arrow ->
// inspect -> sensitivity with nothing in run/, io/ or analyze/ knowing it: it is registered
// through the explicit extension point (registerProcess here, processModules for the workers).
const FAKE_MODULE = pathToFileURL(fileURLToPath(new URL('../fixtures/fake-process.mjs', import.meta.url))).href;
const dir = tmpDir('second-process');
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));

beforeAll(async () => {
  const mod = (await import(FAKE_MODULE)) as { default: ProcessDefinition<{ scale: number }> };
  registerProcess(mod.default);
});

describe('a second process through the whole pipeline', () => {
  it('validates against its own inputs: an input it does not use names the input and the process', () => {
    expect(problemsOf(() => validateSweep({ axes: { a_frac: { values: [0.5] }, tp_c: { values: [1300] } }, model: { process: 'fake' } }))).toEqual([
      'axes.tp_c: tp_c is not an input of process fake; its inputs: a_frac, b_frac',
    ]);
    expect(problemsOf(() => validateSweep({ axes: { b_frac: { values: [0.5] } }, model: { process: 'fake' } }))).toEqual([
      'axes.a_frac: missing; a_frac (first input, 0-1 fraction) must be swept under axes or set under fixed',
    ]);
    expect(problemsOf(() => validateSweep({ axes: { a_frac: { values: [0.5] } }, model: { process: 'fake', thermal: 'auto' } }))).toEqual([
      'model.thermal: unknown key; allowed: scale, params',
    ]);
  });

  it('runs on worker threads, writes its own columns, and inspect and sensitivity read them', async () => {
    const spec = validateSweep({
      name: 'fake sweep F-1',
      axes: { a_frac: { from: 0, to: 1 }, b_frac: { from: 0, to: 1 } },
      design: { kind: 'saltelli', base: 1024 },
      model: { process: 'fake', scale: 3 },
    });
    expect(spec.model).toEqual({ process: 'fake', scale: 3, params: {} });
    const out = path.join(dir, 'fake.arrow');
    const s = await runSweep({ spec, outPath: out, workers: 2, chunkSize: 256, processModules: [FAKE_MODULE], progress: null });
    expect(s.rows).toBe(1024 * 4);
    const t = readTable(out);
    expect(t.schema.fields.map((f) => f.name)).toEqual(['scenario_id', 'a_frac', 'b_frac', 'block', 'status', 'reason', 'y_lin', 'y_gap']);
    const meta = readResultsMeta(t.schema);
    expect(meta.process).toBe('fake');
    expect(t.schema.metadata.get('meltsweep.process')).toBe('fake');
    const c = tableColumns(t);
    for (let i = 0; i < t.numRows; i++) {
      const a = c.a_frac[i] as number;
      const b = c.b_frac[i] as number;
      expect(c.y_lin[i]).toBeCloseTo(3 * (2 * a + b), 12);
      expect(c.status[i]).toBe(a < 0.25 ? 'no_melt' : 'ok');
      expect(c.y_gap[i]).toBe(a < 0.25 ? null : a - 0.25);
    }
    const seen = await inspectTable(out, 2);
    expect(seen.about).toContainEqual(['process', 'fake']);
    expect(seen.columns.map((col) => col.name)).toContain('y_gap');
    // y_lin = 3 (2 a + b), a, b ~ U(0, 1): S1(a) = 4/5, S1(b) = 1/5 (analytic solution)
    const report = await analyzeResultsFile(out, { outputs: ['y_lin'], resamples: 50 });
    const s1 = (input: string): number => report.records.find((r) => r.output === 'y_lin' && r.input === input && r.measure === 'S1')!.value!;
    expect(s1('a_frac')).toBeCloseTo(0.8, 1);
    expect(s1('b_frac')).toBeCloseTo(0.2, 1);
  });

  it('column: an input flag of another process is an error naming the input and the process', () => {
    expect(problemsOf(() => columnInputs({ process: 'decompression', tp: '1300', aFrac: '0.5' }))).toEqual([
      '--a-frac: a_frac is not an input of process decompression; its inputs: tp_c (--tp), water_ppm (--water), lid_km (--lid), upwelling_mm_yr (--upwelling)',
    ]);
    expect(problemsOf(() => columnInputs({ process: 'fake', aFrac: '0.5', thermal: 'auto' }))).toEqual([
      '--thermal: process fake has no option thermal; its options: scale, params',
    ]);
  });
});

describe('meltsweep column --process (CLI)', () => {
  it('an unknown process lists the known ones (exit 2)', () => {
    const r = runCliSync(['column', '--process', 'nonesuch', '--tp', '1300']);
    expect(r.status).toBe(2);
    expect(r.stderr).toContain('--process: unknown process "nonesuch"; known processes: decompression');
  });
  it('--process decompression --json gives the same record as the default, keyed by field names', () => {
    const a = runCliSync(['column', '--tp', '1350', '--water', '100', '--json']);
    const b = runCliSync(['column', '--process', 'decompression', '--tp', '1350', '--water', '100', '--json']);
    expect(a.status).toBe(0);
    expect(b.stdout).toBe(a.stdout);
    expect(Object.keys(JSON.parse(a.stdout) as object).slice(0, 3)).toEqual(['status', 'reason', 'onset_p_gpa']);
  });
});
