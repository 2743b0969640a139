/**
 * Fitting observations: (1) the streaming core alone (FitAccumulator over in-memory batches of
 * 65,536 rows, three grid inputs, two observations), rows per CPU second of one thread; (2) the
 * whole `fit` path on a results file of `rows` rows (default 10 million: a synthetic grid sweep
 * with every results column, written first), in a child process so that its peak RSS is its own:
 * read, fit, write RESULTS.fit.arrow.
 *
 * Run standalone: node dist/bench/fit.js [rows]
 */
import { spawnSync } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { FitAccumulator, finishFit, type FitSetup } from '../src/fit/index.js';
import { chunkToRecordBatch } from '../src/io/arrow-batch.js';
import { makeStatusDictionary, resultsSchema } from '../src/io/arrow-schema.js';
import { IpcFileSink } from '../src/io/ipc-file.js';
import { INPUT_FIELDS, INPUT_NAMES, RESULT_NUMERIC_FIELDS, RESULT_NUMERIC_NAMES } from '../src/physics/fields.js';
import { DEFAULT_PARAMS } from '../src/physics/params.js';
import { planSweep } from '../src/plan/index.js';
import type { ChunkResult } from '../src/run/compute-chunk.js';
import { fitResultsFile, priorOf } from '../src/io/fit-file.js';
import { writeFitTable } from '../src/io/fit-output.js';
import { sweepHash } from '../src/spec/index.js';
import { bigSweepSpec } from './big-sweep.js';
import { formatBench, isMain, measureRates, summarise, type BenchResult } from './util.js';

const OBSERVATIONS = [
  { output: 'crust_km', value: 7.1, sd: 0.8 },
  { output: 'f_max', value: 0.15, sd: 0.02 },
];

/**
 * A point batch readable both as named columns (tp_c, ...) and as `inputs` by name: the same
 * arrays under both, so the bench fills and writes them whichever shape the planner uses.
 */
function pointBatch(n: number) {
  const inputs = Object.fromEntries(INPUT_NAMES.map((name) => [name, new Float64Array(n)])) as Record<string, Float64Array>;
  return { ...inputs, inputs, block: null, tp_c: inputs.tp_c, water_ppm: inputs.water_ppm, lid_km: inputs.lid_km };
}

/** Synthetic outputs shaped like a melting sweep (smooth in the inputs, a few failed rows). */
function syntheticChunk(start: number, end: number, plan: ReturnType<typeof planSweep>): ChunkResult {
  const n = end - start;
  const f = (): Float64Array => new Float64Array(n);
  const points = pointBatch(n);
  plan.fill(start, end, points as unknown as Parameters<typeof plan.fill>[2]);
  const numeric = Object.fromEntries(RESULT_NUMERIC_NAMES.map((name) => [name, f()])) as unknown as ChunkResult['numeric'];
  const status = new Uint8Array(n);
  for (let i = 0; i < n; i++) {
    const tp = points.tp_c[i];
    const w = points.water_ppm[i];
    const lid = points.lid_km[i];
    numeric.crust_km[i] = Math.max(0, 0.075 * (tp - 1230) + 0.004 * w - 0.15 * lid);
    numeric.f_max[i] = Math.max(0, 0.0011 * (tp - 1200) + 0.00005 * w - 0.002 * lid);
    numeric.onset_depth_km[i] = 40 + 0.3 * (tp - 1200) + 0.05 * w;
    if ((start + i) % 997 === 0) {
      status[i] = 3;
      numeric.crust_km[i] = NaN;
      numeric.f_max[i] = NaN;
    }
  }
  return { start, end, points: points as unknown as ChunkResult['points'], status, numeric, reasons: [], computeMs: 0 };
}

/** Write a synthetic results file of exactly `rows` rows (a 200 x 200 x rows/40,000 grid). */
export async function writeSyntheticResults(file: string, rows: number): Promise<void> {
  const spec = bigSweepSpec(rows);
  const plan = planSweep(spec);
  const meta = {
    process: 'decompression', inputs: INPUT_FIELDS, results: RESULT_NUMERIC_FIELDS,
    sweepJson: JSON.stringify(spec), sweepHash: sweepHash(spec), toolVersion: 'bench', params: DEFAULT_PARAMS, pointCount: plan.count, rowStart: 0, rowEnd: plan.count, shard: '1/1', blockLabels: null,
  };
  const schema = resultsSchema(meta as Parameters<typeof resultsSchema>[0]);
  const dictionary = makeStatusDictionary();
  const sink = new IpcFileSink(file, `${file}.tmp`, schema);
  for (let s = 0; s < plan.count; s += 65_536) await sink.write(chunkToRecordBatch(syntheticChunk(s, Math.min(plan.count, s + 65_536), plan), schema, dictionary));
  await sink.publish();
}

/** The streaming core alone: rows per CPU second (and per wall second) of one thread. */
export async function benchFitCore(rows = 2_000_000, repetitions = 3): Promise<BenchResult> {
  const spec = bigSweepSpec(rows);
  const plan = planSweep(spec);
  const batches: { inputs: Record<string, Float64Array>; outputs: Record<string, Float64Array>; status: Uint8Array; rows: number }[] = [];
  for (let s = 0; s < plan.count; s += 65_536) {
    const c = syntheticChunk(s, Math.min(plan.count, s + 65_536), plan);
    const inputs = (c.points as unknown as { inputs: Record<string, Float64Array> }).inputs;
    batches.push({ rows: c.end - c.start, inputs, outputs: { crust_km: c.numeric.crust_km, f_max: c.numeric.f_max, onset_depth_km: c.numeric.onset_depth_km }, status: c.status });
  }
  const setup: FitSetup = { observations: OBSERVATIONS, prior: priorOf(spec), predict: ['onset_depth_km'], statuses: ['ok', 'no_melt', 'onset_beyond_range', 'failed'], expectedRows: plan.count };
  const { cpu } = await measureRates(
    () => {
      const acc = new FitAccumulator(setup);
      for (const b of batches) acc.add(b);
      finishFit(acc);
    },
    plan.count,
    repetitions,
    1,
  );
  return summarise('fit core: rows through the accumulator per CPU second', 'rows/s', cpu);
}

/** The whole fit of a results file, measured in a child process. */
export interface FitFileBench {
  readonly rows: number;
  readonly cpuSeconds: number;
  readonly wallSeconds: number;
  readonly rowsPerCpuSecond: number;
  readonly peakRssMiB: number;
  readonly inputMiB: number;
}

async function child(file: string): Promise<void> {
  const cpu0 = process.cpuUsage();
  const t0 = performance.now();
  const r = await fitResultsFile(file, { observations: OBSERVATIONS, predict: ['onset_depth_km'] });
  await writeFitTable(r, `${file}.fit.arrow`);
  const used = process.cpuUsage(cpu0);
  const cpuSeconds = (used.user + used.system) / 1e6;
  const out: FitFileBench = {
    rows: r.fit.rows,
    cpuSeconds,
    wallSeconds: (performance.now() - t0) / 1000,
    rowsPerCpuSecond: r.fit.rows / cpuSeconds,
    peakRssMiB: (process.resourceUsage().maxRSS * 1024) / 2 ** 20,
    inputMiB: fs.statSync(file).size / 2 ** 20,
  };
  process.stdout.write(`${JSON.stringify(out)}\n`);
}

export async function benchFitFile(rows = 10_000_000): Promise<FitFileBench> {
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'meltsweep-bench-fit-'));
  try {
    const file = path.join(dir, 'big.arrow');
    await writeSyntheticResults(file, rows);
    const r = spawnSync(process.execPath, [fileURLToPath(import.meta.url), '--child', file], { encoding: 'utf8', maxBuffer: 1 << 20 });
    if (r.status !== 0) throw new Error(`fit child failed: ${r.stderr}`);
    return JSON.parse(r.stdout.trim().split('\n').pop() ?? '{}') as FitFileBench;
  } finally {
    fs.rmSync(dir, { recursive: true, force: true });
  }
}

export function formatFitFile(r: FitFileBench): string {
  return (
    `fit of a ${r.rows.toLocaleString('en-US')}-row results file (${r.inputMiB.toFixed(0)} MiB): ${r.cpuSeconds.toFixed(2)} s CPU, ${r.wallSeconds.toFixed(2)} s wall, ` +
    `${Math.round(r.rowsPerCpuSecond).toLocaleString('en-US')} rows per CPU second, peak RSS ${r.peakRssMiB.toFixed(0)} MiB`
  );
}

if (isMain(import.meta.url)) {
  if (process.argv[2] === '--child') {
    await child(process.argv[3]);
  } else {
    process.stdout.write(`${formatBench(await benchFitCore())}\n`);
    process.stdout.write(`${formatFitFile(await benchFitFile(Number(process.argv[2] ?? 10_000_000)))}\n`);
  }
}
