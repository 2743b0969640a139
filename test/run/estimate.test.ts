import { afterAll, describe, expect, it } from 'vitest';
import fs from 'node:fs';
import path from 'node:path';
import { validateSweep } from '../../src/spec/index.js';
import { runSweep } from '../../src/run/run-sweep.js';
import { estimateRun } from '../../src/run/estimate.js';
import { planSweep } from '../../src/plan/index.js';
import type { SweepSpec } from '../../src/spec/types.js';
import { tmpDir } from '../helpers.js';

// `plan` against a measured run of the same sweep. Both sides are measurements on this machine, in
// CPU seconds of the whole process (worker threads included), so a shared machine slows neither
// side's figure much; a pair that disagrees is measured once more before the test fails.
const dir = tmpDir('estimate');
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));

function cpuSeconds(): number {
  const u = process.cpuUsage();
  return (u.user + u.system) / 1e6;
}

async function ratio(spec: SweepSpec, name: string): Promise<{ ratio: number; estimate: number; measured: number }> {
  const out = path.join(dir, `${name}.arrow`);
  const est = estimateRun(spec, planSweep(spec).count, 2);
  const c0 = cpuSeconds();
  await runSweep({ spec, outPath: out, workers: 2, force: true });
  const measured = cpuSeconds() - c0;
  return { ratio: est.totalCpuSeconds / measured, estimate: est.totalCpuSeconds, measured };
}

async function withinTwice(spec: SweepSpec, name: string): Promise<void> {
  let r = await ratio(spec, name);
  if (!(r.ratio >= 0.5 && r.ratio <= 2)) r = await ratio(spec, name);
  expect(r.ratio, `estimated ${r.estimate.toFixed(2)} s of CPU, measured ${r.measured.toFixed(2)} s`).toBeGreaterThanOrEqual(0.5);
  expect(r.ratio, `estimated ${r.estimate.toFixed(2)} s of CPU, measured ${r.measured.toFixed(2)} s`).toBeLessThanOrEqual(2);
}

describe('plan estimates against a measured run', () => {
  it('isentropic grid of 3,000 columns: CPU time within 2x', async () => {
    const spec = validateSweep({
      name: 'estimate check isentropic',
      axes: { tp_c: { from: 1250, to: 1500, count: 30 }, water_ppm: { from: 0, to: 400, count: 20 }, lid_km: { from: 0, to: 30, count: 5 } },
      design: { kind: 'grid' },
      model: { thermal: 'isentropic' },
    });
    await withinTwice(spec, 'iso');
  });

  it('conductive latin hypercube of 300 columns: CPU time within 2x, output size within 2x', async () => {
    const spec = validateSweep({
      name: 'estimate check conductive',
      axes: { tp_c: { from: 1250, to: 1500 }, water_ppm: { from: 0, to: 400 }, lid_km: { from: 0, to: 30 }, upwelling_mm_yr: { from: 0.5, to: 100, scale: 'log' } },
      design: { kind: 'latin-hypercube', samples: 300, seed: 3 },
      model: { thermal: 'conductive' },
    });
    await withinTwice(spec, 'cond');
    const est = estimateRun(spec, 300, 2);
    const size = fs.statSync(path.join(dir, 'cond.arrow')).size;
    expect(est.bytes / size).toBeGreaterThan(0.5);
    expect(est.bytes / size).toBeLessThan(2);
  });
});
