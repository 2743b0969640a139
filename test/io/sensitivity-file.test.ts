import { describe, expect, it } from 'vitest';
import path from 'node:path';
import { validateSweep } from '../../src/spec/index.js';
import { runSweep } from '../../src/run/run-sweep.js';
import { analyzeResultsFile, sensitivityPathFor, writeSensitivityTable } from '../../src/io/sensitivity-file.js';
import { readTable, scratchDir } from '../helpers.js';

const dir = scratchDir('sens');

/** Run an isentropic grid sweep over `axes` into dir/FILE; returns its path and the run summary. */
async function runGrid(name: string, axes: Record<string, unknown>, file: string, workers = 1) {
  const spec = validateSweep({ name, axes, design: { kind: 'grid' }, model: { thermal: 'isentropic' } });
  const out = path.join(dir, file);
  return { out, run: await runSweep({ spec, outPath: out, workers }) };
}

describe('sensitivity of a real melting sweep', () => {
  it('crust_km over Tp 1250-1450 degC and water 0-200 ppm is controlled by Tp', async () => {
    // common practice: temperature controls melt volume far more than modest water does
    const { out } = await runGrid('ridge R-9 sensitivity check', { tp_c: { from: 1250, to: 1450, count: 21 }, water_ppm: { from: 0, to: 200, count: 11 } }, 'r9.arrow', 2);
    const report = await analyzeResultsFile(out, { outputs: ['crust_km', 'f_max'] });
    const st = (output: string, input: string) =>
      report.records.find((r) => r.output === output && r.input === input && r.measure === 'ST')!.value!;
    expect(st('crust_km', 'tp_c')).toBeGreaterThan(0.8);
    expect(st('crust_km', 'water_ppm')).toBeLessThan(0.2);
    expect(st('crust_km', 'tp_c')).toBeGreaterThan(5 * st('crust_km', 'water_ppm'));
    // the long-format table holds one row per record with the columns the issue asks for
    const file = sensitivityPathFor(out);
    writeSensitivityTable(report, file, {});
    const t = readTable(file);
    expect(t.numRows).toBe(report.records.length);
    expect(t.schema.fields.map((f) => f.name)).toEqual(['output', 'input', 'measure', 'value', 'ci_low', 'ci_high', 'n']);
  });

  it('uses no_melt rows (crust 0, f_max 0 are real values): every row counts for crust_km, only melting rows for the onset', async () => {
    // Tp 1100 degC is below the dry solidus at every depth (A1 = 1085.7 degC and the solidus rises
    // faster than the adiabat): the sweep crosses from no melt to melt
    const { out, run } = await runGrid('ridge R-9 solidus crossing', { tp_c: { from: 1100, to: 1400, count: 7 }, lid_km: { from: 0, to: 20, count: 3 } }, 'cross.arrow');
    expect(run.counts.no_melt).toBeGreaterThan(0);
    const report = await analyzeResultsFile(out, { outputs: ['crust_km', 'onset_p_gpa', 'onset_depth_km'] });
    expect(report.counts.included).toBe(21);
    expect(report.counts.leftOut).toEqual({});
    expect(report.counts.perOutput.crust_km.used).toBe(21);
    expect(report.counts.perOutput.onset_p_gpa.used).toBe(21 - run.counts.no_melt);
    // the onset depth is the onset pressure in other units: one line in the summary
    expect(report.copies.onset_depth_km?.of).toBe('onset_p_gpa');
  });

  it('refuses a shard: sensitivity needs the whole sweep', async () => {
    const spec = validateSweep({ name: 's', axes: { tp_c: { from: 1300, to: 1400, count: 8 } }, design: { kind: 'grid' } });
    const out = path.join(dir, 'shard.arrow');
    await runSweep({ spec, outPath: out, workers: 1, shard: { k: 1, n: 2 } });
    await expect(analyzeResultsFile(out)).rejects.toThrow(/merge the shards first/);
  });
});
