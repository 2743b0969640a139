/**
 * Fitting a real melting sweep: a dry, lid-free isentropic grid over Tp 1250-1450 degC, observed
 * crust 7.1 +- 0.8 km (normal oceanic crust, White, McKenzie & O'Nions 1992, J. Geophys. Res. 97,
 * 19683). The posterior median Tp must sit where the model's own crust curve crosses 7.1 km, and a
 * refined sweep must run and give a larger effective sample size.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import fs from 'node:fs';
import path from 'node:path';
import { fitPathFor, fitResultsFile, type FitFileResult } from '../../src/io/fit-file.js';
import { writeFitTable, writeRefinedSweep } from '../../src/io/fit-output.js';
import { runSweep } from '../../src/run/run-sweep.js';
import { loadSweepFile, validateSweep } from '../../src/spec/index.js';
import { readTable, tmpDir } from '../helpers.js';

const dir = tmpDir('fit-melting');
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));

const STEP = 10;
const observation = { output: 'crust_km', value: 7.1, sd: 0.8 };
let results: string;
let fit: FitFileResult;

beforeAll(async () => {
  const spec = validateSweep({
    name: 'ridge segment R-7 dry no lid',
    axes: { tp_c: { from: 1250, to: 1450, step: STEP } },
    fixed: { water_ppm: 0, lid_km: 0 },
    design: { kind: 'grid' },
    model: { thermal: 'isentropic' },
  });
  results = path.join(dir, 'dry.arrow');
  await runSweep({ spec, outPath: results, workers: 2 });
  fit = await fitResultsFile(results, { observations: [observation], predict: ['f_max'] });
}, 60_000);

describe('a dry, lid-free melting sweep observed at 7.1 +- 0.8 km of crust', () => {
  it("puts the posterior median Tp where the model's own crust curve crosses 7.1 km, within one grid step", () => {
    const t = readTable(results);
    const tp = t.getChild('tp_c')!.toArray() as Float64Array;
    const crust = Array.from({ length: t.numRows }, (_, i) => (t.getChild('crust_km')!.get(i) as number | null) ?? NaN);
    let crossing = NaN;
    for (let i = 0; i + 1 < tp.length; i++) {
      if (crust[i] <= 7.1 && crust[i + 1] > 7.1) crossing = tp[i] + ((7.1 - crust[i]) / (crust[i + 1] - crust[i])) * (tp[i + 1] - tp[i]);
    }
    expect(Number.isFinite(crossing)).toBe(true);
    expect(Math.abs(fit.fit.posterior.tp_c.p50 - crossing)).toBeLessThanOrEqual(STEP);
    // the predictive median of the observed output is the observation, to within its sd
    expect(Math.abs(fit.fit.predict.crust_km.p50 - 7.1)).toBeLessThan(0.8);
  });

  it('is narrower than the prior and states the prior', () => {
    expect(fit.fit.posterior.tp_c.sd).toBeLessThan(fit.fit.prior.tp_c.sd / 2);
    expect(fit.fit.posterior.tp_c.p97_5 - fit.fit.posterior.tp_c.p2_5).toBeLessThan(0.5 * (1450 - 1250));
    expect(fit.fit.priorText).toMatch(/grid of 21 = 21 points, each equally likely/);
    expect(fit.fit.rowsUsed).toBe(21);
  });

  it('writes the fit table: one row per scenario, weights summing to 1, observations and units in the metadata', async () => {
    const out = fitPathFor(results);
    expect(out).toBe(path.join(dir, 'dry.fit.arrow'));
    await writeFitTable(fit, out);
    const t = readTable(out);
    expect(t.schema.fields.map((f) => f.name)).toEqual(['scenario_id', 'log_likelihood', 'weight']);
    expect(t.numRows).toBe(21);
    const w = t.getChild('weight')!.toArray() as Float64Array;
    expect(w.reduce((a, b) => a + b, 0)).toBeCloseTo(1, 12);
    expect(Number(t.getChild('scenario_id')!.get(20))).toBe(20);
    const obs = JSON.parse(t.schema.metadata.get('meltsweep.observations')!) as { output: string; unit: string; value: number; sd: number }[];
    expect(obs).toEqual([{ output: 'crust_km', unit: 'km', value: 7.1, sd: 0.8, discrepancy_sd: 0, total_sd: 0.8 }]);
    expect(t.schema.fields[2].metadata.get('unit')).toBe('fraction');
  });

  it('--refine writes a sweep the validator accepts; it runs, and the refit has a larger effective sample size', async () => {
    const next = path.join(dir, 'next.yaml');
    writeRefinedSweep(fit, next);
    const spec = await loadSweepFile(next);
    expect(spec.design.kind).toBe('grid');
    expect(spec.axes[0].values).toHaveLength(21);
    expect(spec.axes[0].min).toBeGreaterThanOrEqual(1250);
    expect(spec.axes[0].max).toBeLessThanOrEqual(1450);
    expect(spec.axes[0].max - spec.axes[0].min).toBeLessThan(200);
    const nextResults = path.join(dir, 'next.arrow');
    await runSweep({ spec, outPath: nextResults, workers: 2 });
    const refit = await fitResultsFile(nextResults, { observations: [observation] });
    expect(refit.fit.ess).toBeGreaterThan(fit.fit.ess * 1.5);
    // the same posterior, better resolved
    expect(Math.abs(refit.fit.posterior.tp_c.p50 - fit.fit.posterior.tp_c.p50)).toBeLessThan(STEP);
  }, 60_000);
});
