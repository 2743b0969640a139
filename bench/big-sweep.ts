/**
 * Peak memory of a very large isentropic sweep (default 10 million points) run through the
 * engine with all workers, in a child process so its peak RSS (main thread + worker threads,
 * which share the process) is measured alone. Also reports the wall time.
 *
 * Run standalone: node dist/bench/big-sweep.js [points]
 */
import { spawnSync } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { runSweep } from '../src/run/run-sweep.js';
import { validateSweep } from '../src/spec/index.js';
import { isMain } from './util.js';

export interface BigSweepResult {
  readonly points: number;
  readonly seconds: number;
  readonly columnsPerSecond: number;
  readonly peakRssMiB: number;
  readonly outputMiB: number;
  readonly workers: number;
}

/** An isentropic grid of exactly `points` columns when points is a multiple of 40,000 (200 x 200 x n). */
export function bigSweepSpec(points: number) {
  return validateSweep({
    name: 'bench grid B-10M',
    axes: {
      tp_c: { from: 1250, to: 1500, count: Math.max(1, Math.round(points / 40_000)) },
      water_ppm: { from: 0, to: 500, count: 200 },
      lid_km: { from: 0, to: 30, count: 200 },
    },
    design: { kind: 'grid' },
    model: { thermal: 'isentropic', water: 'batch' },
  });
}

/** Child side: run the sweep, print one JSON line. */
async function child(points: number, dir: string): Promise<void> {
  const out = path.join(dir, 'big.arrow');
  const s = await runSweep({ spec: bigSweepSpec(points), outPath: out, force: true });
  const size = fs.statSync(out).size;
  fs.rmSync(out, { force: true });
  const result: BigSweepResult = {
    points: s.rows,
    seconds: s.seconds,
    columnsPerSecond: s.rows / s.seconds,
    peakRssMiB: (process.resourceUsage().maxRSS * 1024) / 2 ** 20,
    outputMiB: size / 2 ** 20,
    workers: s.workers,
  };
  process.stdout.write(`${JSON.stringify(result)}\n`);
}

export function benchBigSweep(points = 10_000_000): BigSweepResult {
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'meltsweep-bench-big-'));
  try {
    const r = spawnSync(process.execPath, [fileURLToPath(import.meta.url), '--child', String(points), dir], { encoding: 'utf8', maxBuffer: 1 << 20 });
    if (r.status !== 0) throw new Error(`big sweep child failed: ${r.stderr}`);
    return JSON.parse(r.stdout.trim().split('\n').pop() ?? '{}') as BigSweepResult;
  } finally {
    fs.rmSync(dir, { recursive: true, force: true });
  }
}

export function formatBigSweep(r: BigSweepResult): string {
  return (
    `big sweep: ${r.points.toLocaleString('en-US')} isentropic columns on ${r.workers} workers in ${r.seconds.toFixed(1)} s ` +
    `(${Math.round(r.columnsPerSecond).toLocaleString('en-US')} columns/s), peak RSS ${r.peakRssMiB.toFixed(0)} MiB, output ${r.outputMiB.toFixed(0)} MiB`
  );
}

if (isMain(import.meta.url)) {
  if (process.argv[2] === '--child') {
    await child(Number(process.argv[3]), process.argv[4]);
  } else {
    process.stdout.write(`${formatBigSweep(benchBigSweep(Number(process.argv[2] ?? 10_000_000)))}\n`);
  }
}
