/**
 * A quick estimate of a sweep's cost from a short calibration run on this machine:
 * integrate small samples of the plan in-process, time them, and measure the encoded size of
 * their rows.
 */
import * as arrow from 'apache-arrow';
import { chunkToRecordBatch } from '../io/arrow-batch.js';
import { makeStatusDictionary, resultsSchema, tableFieldsOf } from '../io/arrow-schema.js';
import { resolveParams } from '../physics/params.js';
import { computeChunk, makeChunkContext } from './compute-chunk.js';
import type { SweepSpec } from '../spec/types.js';

export interface RunEstimate {
  readonly points: number;
  readonly calibrationColumns: number;
  readonly columnsPerSecondPerCore: number;
  readonly workers: number;
  /** wall time with the given workers, assuming 90 % parallel efficiency */
  readonly seconds: number;
  readonly bytesPerRow: number;
  readonly bytes: number;
}

/**
 * @param rows rows that would be computed (the whole sweep or one shard)
 * @param budgetMs calibration time budget (stops early once spent)
 */
export function estimateRun(spec: SweepSpec, rows: number, workers: number, budgetMs = 800): RunEstimate {
  const ctx = makeChunkContext(spec);
  const count = ctx.plan.count;
  const samples = 8;
  const perSample = Math.max(1, Math.min(64, Math.floor(count / samples)));
  let columns = 0;
  let ms = 0;
  let bytes = 0;
  const schema = resultsSchema({
    ...tableFieldsOf(spec),
    sweepJson: '{}', sweepHash: '', toolVersion: '', params: resolveParams(spec.model.params), pointCount: count,
    rowStart: 0, rowEnd: count, shard: '1/1', blockLabels: ctx.plan.hasBlocks ? ['A'] : null,
  });
  const dictionary = makeStatusDictionary();
  // warm-up (not timed): the first calls run unoptimised code
  computeChunk(ctx, 0, Math.min(count, 4 * perSample));
  const t0 = performance.now();
  for (let k = 0; k < samples && performance.now() - t0 < budgetMs; k++) {
    const start = Math.min(count - perSample, Math.floor((k * count) / samples));
    const chunk = computeChunk(ctx, Math.max(0, start), Math.max(0, start) + Math.min(perSample, count));
    columns += chunk.end - chunk.start;
    ms += chunk.computeMs;
    const batch = chunkToRecordBatch(chunk, schema, dictionary);
    bytes += arrow.tableToIPC(new arrow.Table([batch]), 'stream').byteLength;
  }
  const rate = ms > 0 ? (columns * 1000) / ms : Infinity;
  const bytesPerRow = columns > 0 ? bytes / columns : 0;
  return {
    points: count,
    calibrationColumns: columns,
    columnsPerSecondPerCore: rate,
    workers,
    seconds: rows / (rate * workers * 0.9),
    bytesPerRow,
    bytes: bytesPerRow * rows,
  };
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
