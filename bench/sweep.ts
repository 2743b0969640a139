/**
 * Sweep throughput with 1, 2 (and all available) workers through the real engine
 * (planner -> piscina pool -> reorder window -> segments -> published Arrow file), and the
 * parallel efficiency. The sweep is a fixed isentropic grid of wet and dry scenarios.
 *
 * Run standalone: node dist/bench/sweep.js [points]
 */
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { validateSweep } from '../src/spec/index.js';
import { runSweep } from '../src/run/run-sweep.js';
import { formatBench, isMain, median, summarise, type BenchResult } from './util.js';

/** A grid of about `points` isentropic columns over Tp 1250-1500 degC, water 0-500 ppm, lid 0-30 km. */
export function benchSweepSpec(points: number) {
  const side = Math.max(2, Math.round(Math.cbrt(points)));
  return validateSweep({
    name: 'bench grid B-1',
    axes: {
      tp_c: { from: 1250, to: 1500, count: side },
      water_ppm: { from: 0, to: 500, count: side },
      lid_km: { from: 0, to: 30, count: side },
    },
    design: { kind: 'grid' },
    model: { thermal: 'isentropic', water: 'batch' },
  });
}

export interface SweepBenchResult {
  readonly points: number;
  readonly byWorkers: ReadonlyArray<BenchResult & { readonly workers: number }>;
  /** median over paired repetitions of rate(w) / rate(1), and that divided by w, for each w > 1 */
  readonly efficiency: ReadonlyArray<{ readonly workers: number; readonly speedup: number; readonly efficiency: number }>;
  /**
   * main thread's busy time per row with one worker, microseconds: event-loop active time
   * (performance.eventLoopUtilization of the main thread; the workers are other threads) over rows
   */
  readonly mainThreadUsPerRow: BenchResult;
}

/**
 * Repetitions alternate between worker counts (1, 2, 1, 2, ...) so that slow drifts of a shared
 * machine hit every count alike; the speed-up is the median of the paired ratios.
 */
export async function benchSweep(points = 200_000, repetitions = 3): Promise<SweepBenchResult> {
  const spec = benchSweepSpec(points);
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'meltsweep-bench-sweep-'));
  const cores = os.availableParallelism();
  const counts = [...new Set([1, 2, cores])].filter((w) => w <= Math.max(2, cores));
  const rates = new Map<number, number[]>(counts.map((w) => [w, []]));
  const mainUs: number[] = [];
  let rows = 0;
  try {
    for (let rep = 0; rep < repetitions; rep++) {
      for (const workers of counts) {
        const out = path.join(dir, `w${workers}-${rep}.arrow`);
        const elu0 = performance.eventLoopUtilization();
        const s = await runSweep({ spec, outPath: out, workers, force: true });
        if (workers === 1) mainUs.push((performance.eventLoopUtilization(elu0).active * 1000) / s.rows);
        rows = s.rows;
        rates.get(workers)!.push(s.rows / s.seconds);
        fs.rmSync(out, { force: true });
      }
    }
  } finally {
    fs.rmSync(dir, { recursive: true, force: true });
  }
  const byWorkers = counts.map((workers) => ({
    ...summarise(`sweep, ${workers} worker${workers === 1 ? '' : 's'} (wall clock)`, 'columns/s', rates.get(workers)!),
    workers,
  }));
  const one = rates.get(1)!;
  const efficiency = counts.slice(1).map((workers) => {
    const speedup = median(rates.get(workers)!.map((r, i) => r / one[i]));
    return { workers, speedup, efficiency: speedup / workers };
  });
  return { points: rows, byWorkers, efficiency, mainThreadUsPerRow: summarise('main thread busy time per row, 1 worker', 'us/row', mainUs) };
}

if (isMain(import.meta.url)) {
  const r = await benchSweep(Number(process.argv[2] ?? 200_000));
  process.stdout.write(`sweep of ${r.points.toLocaleString('en-US')} isentropic columns\n`);
  for (const b of r.byWorkers) process.stdout.write(`${formatBench(b)}\n`);
  process.stdout.write(`main thread: ${r.mainThreadUsPerRow.median.toFixed(3)} us per row (${r.mainThreadUsPerRow.min.toFixed(3)}-${r.mainThreadUsPerRow.max.toFixed(3)})\n`);
  for (const e of r.efficiency) {
    process.stdout.write(`${e.workers} workers: speed-up ${e.speedup.toFixed(2)}x over one, parallel efficiency ${(100 * e.efficiency).toFixed(0)} %\n`);
  }
}
