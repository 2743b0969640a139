/**
 * A quick estimate of a sweep's cost from a short timed probe on this machine: compute a few
 * hundred columns spread over the sweep itself (so the probe sees the same mix of thermal models,
 * fast and slow columns and out-of-range rows as the run), time them in CPU seconds (robust to a
 * shared machine: waiting for a core is not counted), and measure the encoded size of their rows.
 *
 * The probe computes its blocks twice: cold (as a fresh worker runs them, unoptimised code) and warm;
 * the difference is the warm-up each worker pays. The time estimate is the run's own duration on an
 * otherwise idle machine:
 *   POOL_STARTUP_SECONDS + warm-up + rows x (warm CPU per column) / (workers x 0.9),
 * and its CPU time RUN_START_CPU_SECONDS + busy workers x (WORKER_START_CPU_SECONDS + warm-up)
 * + rows x (warm CPU per column).
 */
import * as arrow from 'apache-arrow';
import { chunkToRecordBatch } from '../io/arrow-batch.js';
import { makeStatusDictionary, resultsSchema, tableFieldsOf } from '../io/arrow-schema.js';
import { resolveParams } from '../physics/params.js';
import type { SweepSpec } from '../spec/types.js';
import { defaultChunkSize } from './chunks.js';
import { computeChunk, makeChunkContext } from './compute-chunk.js';

/**
 * Start-up of the worker pool and the run's bookkeeping, s of wall time: a 16-row sweep takes
 * 0.5-1.0 s on two workers of the development machine (measured with `meltsweep run`, its printed time).
 */
const POOL_STARTUP_SECONDS = 0.5;
/**
 * CPU of a run's main thread apart from writing, s, and CPU a worker spends starting (loading its
 * modules), s. Measured with process.cpuUsage around runSweep on the development machine: a 16-row
 * sweep (one chunk, one worker busy) uses 0.4-0.5 s, and a 5,000-row isentropic sweep uses 0.8 s
 * with one worker and 1.4 s with two.
 */
const RUN_START_CPU_SECONDS = 0.15;
const WORKER_START_CPU_SECONDS = 0.35;
/** Parallel efficiency assumed for the workers. */
const PARALLEL_EFFICIENCY = 0.9;

export interface RunEstimate {
  /** points of the whole sweep */
  readonly points: number;
  /** columns computed by the timed probe */
  readonly calibrationColumns: number;
  /** columns per CPU second of one thread, from the probe (warm code) */
  readonly columnsPerSecondPerCore: number;
  /** CPU seconds the rows' columns need (all workers together, warm code) */
  readonly cpuSeconds: number;
  /** CPU seconds of the whole run: cpuSeconds plus every worker's start-up and warm-up */
  readonly totalCpuSeconds: number;
  /** extra CPU seconds a worker spends while its code is cold (measured, per worker) */
  readonly warmupSeconds: number;
  readonly workers: number;
  /** wall time of the run on an idle machine, s */
  readonly seconds: number;
  /** encoded bytes per row of the Arrow IPC output (large batches) */
  readonly bytesPerRow: number;
  /** estimated size of the Arrow IPC output, bytes */
  readonly bytes: number;
}

export interface EstimateOptions {
  /** rows the run would compute (default: the whole sweep) */
  readonly range?: { readonly start: number; readonly end: number };
  /** CPU budget of each pass (cold, warm) of the timed probe, ms (default 1500; a pass stops early once spent) */
  readonly budgetMs?: number;
  /** probe blocks (default 48) and rows per block (default 8) */
  readonly blocks?: number;
  readonly blockRows?: number;
}

function cpuMs(): number {
  const u = process.cpuUsage();
  return (u.user + u.system) / 1000;
}

/**
 * Probe block positions: block k starts in stratum k of the range at a quasi-random offset
 * (golden-ratio sequence), and blocks are visited in a scattered order so that a probe cut short by
 * its budget is still spread over the whole range.
 */
function probeStarts(start: number, end: number, blocks: number, blockRows: number): number[] {
  const span = end - start;
  const n = Math.max(1, Math.min(blocks, Math.floor(span / blockRows)));
  const starts: number[] = [];
  for (let k = 0; k < n; k++) {
    const u = (k * 0.6180339887498949) % 1;
    const s = start + Math.floor(((k + u) * span) / n);
    starts.push(Math.min(Math.max(start, s), Math.max(start, end - blockRows)));
  }
  // visit order: a stride coprime with n
  let stride = Math.max(1, Math.round(n * 0.382));
  while (gcd(stride, n) !== 1) stride++;
  return starts.map((_, i) => starts[(i * stride) % n]);
}

function gcd(a: number, b: number): number {
  return b === 0 ? a : gcd(b, a % b);
}

/**
 * Estimate the time and output size of computing `rows` rows of the sweep with `workers` workers.
 * @param rows rows that would be computed (the whole sweep or one shard)
 */
export function estimateRun(spec: SweepSpec, rows: number, workers: number, options: EstimateOptions = {}): RunEstimate {
  const ctx = makeChunkContext(spec);
  const count = ctx.plan.count;
  const range = options.range ?? { start: 0, end: count };
  const budgetMs = options.budgetMs ?? 1500;
  const blockRows = Math.max(1, Math.min(options.blockRows ?? 8, range.end - range.start));
  const starts = probeStarts(range.start, range.end, options.blocks ?? 48, blockRows);

  // cold pass: the code is not yet optimised, as in a fresh worker (half the budget at most)
  let coldMs = 0;
  let coldColumns = 0;
  for (const s of starts) {
    if (coldMs >= budgetMs && coldColumns > 0) break;
    const c0 = cpuMs();
    computeChunk(ctx, s, s + blockRows);
    coldMs += cpuMs() - c0;
    coldColumns += blockRows;
  }
  // the timed probe (warm): the same blocks again, then the rest
  const batches: arrow.RecordBatch[] = [];
  const schema = resultsSchema({
    ...tableFieldsOf(spec),
    sweepJson: JSON.stringify(spec), sweepHash: '0'.repeat(64), toolVersion: '', params: resolveParams(spec.model.params), pointCount: count,
    rowStart: range.start, rowEnd: range.end, shard: '1/1', blockLabels: ctx.plan.hasBlocks ? ['A'] : null,
  });
  const dictionary = makeStatusDictionary();
  let columns = 0;
  let ms = 0;
  for (const s of starts) {
    if (ms >= budgetMs && columns > 0) break;
    const c0 = cpuMs();
    const chunk = computeChunk(ctx, s, s + blockRows);
    ms += cpuMs() - c0;
    columns += blockRows;
    batches.push(chunkToRecordBatch(chunk, schema, dictionary));
  }
  const perColumnMs = columns > 0 ? ms / columns : 0;
  const warmupSeconds = Math.max(0, coldMs - coldColumns * perColumnMs) / 1000;
  const cpuSeconds = (rows * perColumnMs) / 1000;
  const seconds = POOL_STARTUP_SECONDS + warmupSeconds + cpuSeconds / (Math.max(1, workers) * PARALLEL_EFFICIENCY);
  // workers that get work: a sweep of fewer chunks than workers leaves some idle
  const busyWorkers = Math.max(1, Math.min(workers, Math.ceil(rows / defaultChunkSize(spec, rows))));
  const totalCpuSeconds = RUN_START_CPU_SECONDS + cpuSeconds + busyWorkers * (WORKER_START_CPU_SECONDS + warmupSeconds);

  const size = outputSize(batches, schema, rows, defaultChunkSize(spec, rows));
  return {
    points: count,
    calibrationColumns: columns,
    columnsPerSecondPerCore: perColumnMs > 0 ? 1000 / perColumnMs : Infinity,
    cpuSeconds,
    totalCpuSeconds,
    warmupSeconds,
    workers,
    seconds,
    bytesPerRow: size.bytesPerRow,
    bytes: size.bytes,
  };
}

/**
 * Size of an Arrow IPC output of `rows` rows in batches of `chunkRows`, from the probe's batches:
 * the schema, a per-batch header (measured from an empty batch) and the body bytes per row
 * (measured on all probe rows, header removed).
 */
function outputSize(batches: arrow.RecordBatch[], schema: arrow.Schema, rows: number, chunkRows: number): { bytesPerRow: number; bytes: number } {
  if (batches.length === 0) return { bytesPerRow: 0, bytes: 0 };
  const encoded = (list: arrow.RecordBatch[]): number => arrow.tableToIPC(new arrow.Table(schema, list), 'file').byteLength;
  const probeRows = batches.reduce((n, b) => n + b.numRows, 0);
  const one = encoded([batches[0]]);
  const header = encoded([batches[0], batches[0].slice(0, 0)]) - one;
  const all = encoded(batches);
  const bodyPerRow = Math.max(0, all - one - (batches.length - 1) * header) / Math.max(1, probeRows - batches[0].numRows);
  const fixed = Math.max(0, one - header - batches[0].numRows * bodyPerRow);
  const nBatches = Math.ceil(rows / Math.max(1, chunkRows));
  const bytes = fixed + rows * bodyPerRow + nBatches * header;
  return { bytesPerRow: rows > 0 ? bytes / rows : bodyPerRow, bytes };
}

export function formatBytes(n: number): string {
  const units = ['B', 'KiB', 'MiB', 'GiB', 'TiB'];
  let v = n;
  let u = 0;
  while (v >= 1024 && u < units.length - 1) {
    v /= 1024;
    u++;
  }
  return `${v.toFixed(u === 0 ? 0 : 1)} ${units[u]}`;
}
