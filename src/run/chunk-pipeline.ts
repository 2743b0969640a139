/**
 * The computing step of a run: the rows not yet committed are cut into chunks (streamed, so the
 * memory does not depend on the point count), integrated on a piscina pool, put back in scenario
 * order in a small reorder window, committed as segments and appended to the publication.
 * Segments kept from an earlier process are replayed into the publication in their place.
 */
import type * as arrow from 'apache-arrow';
import { pathToFileURL } from 'node:url';
import { Piscina } from 'piscina';
import { RunError } from '../errors.js';
import { chunkToRecordBatch } from '../io/arrow-batch.js';
import { profileAxis, profileChunkToRecordBatch } from '../io/profile-table.js';
import type { Segment, SegmentStore } from '../io/segment-store.js';
import { failedChunk, makeChunkContext, type ChunkResult } from './compute-chunk.js';
import type { ProfileGrid } from './profile-grid.js';
import type { ProgressSink } from './progress.js';
import type { Publication } from './publication.js';
import type { RunSetup } from './run-setup.js';
import type { ChunkTask } from './task.js';
import { sweepWorkerFile } from './worker-file.js';

/**
 * The chunks covering the rows of [rowStart, rowEnd) that no kept segment covers, in row order,
 * made one at a time. Every run cuts its range at rowStart + k x chunkSize and a segment holds
 * whole chunks, so a resume cuts exactly where an uninterrupted run would.
 */
function* gapChunks(kept: readonly Segment[], rowStart: number, rowEnd: number, chunkSize: number): Generator<readonly [number, number]> {
  let from = rowStart;
  for (const seg of [...kept.map((k) => ({ start: k.start, end: k.end })), { start: rowEnd, end: rowEnd }]) {
    for (let s = from; s < seg.start; s += chunkSize) yield [s, Math.min(s + chunkSize, seg.start)];
    from = Math.max(from, seg.end);
  }
}

function missingRows(kept: readonly Segment[], rowStart: number, rowEnd: number): number {
  return kept.reduce((n, k) => n - (k.end - k.start), rowEnd - rowStart);
}

export interface PipelineOptions {
  readonly chunkSize: number;
  readonly segmentRows: number;
  readonly segmentMs: number;
  readonly profiles?: ProfileGrid;
  readonly processModules?: readonly string[];
  readonly workerFile?: string;
  readonly progress?: ProgressSink | null;
  readonly signal?: AbortSignal;
}

export interface PipelineResult {
  /** first row not written (rowEnd when complete) */
  readonly writtenEnd: number;
  readonly computedRows: number;
  readonly retriedChunks: number;
  readonly lostChunks: number;
  readonly interrupted: boolean;
}

/** A chunk handed to the pool, with its rows; result null: cancelled by an interruption before it ran. */
interface Submitted {
  readonly start: number;
  readonly end: number;
  readonly cancel: AbortController;
  result?: ChunkResult | null;
  readonly done: Promise<void>;
}

/**
 * Compute the missing rows and write every row of the range, in order, into segments and the
 * publication. Stops submitting when `signal` aborts; finished rows are still committed.
 */
export async function computeRows(
  s: RunSetup, store: SegmentStore, kept: readonly Segment[], publication: Publication, o: PipelineOptions,
): Promise<PipelineResult> {
  const chunks = gapChunks(kept, s.rowStart, s.rowEnd, o.chunkSize);
  let pending = chunks.next();
  const ctx = makeChunkContext(s.spec);
  // the worker keeps one context per key: the profile grid changes what a context computes
  const specKey = s.profileGrid === undefined ? s.hash : `${s.hash}|profiles ${s.profileGrid}`;
  const axis = s.profilePressures !== null ? profileAxis(s.profilePressures, s.params) : null;
  const stats = { retried: 0, lost: 0, computed: 0 };
  let interrupted = o.signal?.aborted === true;
  const queue: Submitted[] = [];
  const onAbort = (): void => {
    interrupted = true;
    // every chunk not finished yet is cancelled (a running one stops its worker thread), so
    // Ctrl-C takes effect at once whatever the queue and the chunk size; finished chunks are
    // committed in order up to the first cancelled one, and the rest is computed on --resume
    for (const q of queue) if (q.result === undefined) q.cancel.abort();
  };
  o.signal?.addEventListener('abort', onAbort);

  const pool =
    pending.done === true
      ? null
      : new Piscina<ChunkTask, ChunkResult>({
          filename: pathToFileURL(o.workerFile ?? sweepWorkerFile()).href,
          minThreads: Math.min(s.workers, Math.ceil(missingRows(kept, s.rowStart, s.rowEnd) / o.chunkSize)),
          maxThreads: s.workers,
          idleTimeout: 2000,
        });

  const runChunk = async (start: number, end: number, cancel: AbortSignal): Promise<ChunkResult | null> => {
    const base: ChunkTask = o.profiles ? { specKey, spec: s.spec, start, end, profiles: o.profiles } : { specKey, spec: s.spec, start, end };
    const task: ChunkTask = o.processModules === undefined ? base : { ...base, processModules: o.processModules };
    try {
      return await pool!.run(task, { signal: cancel });
    } catch {
      if (cancel.aborted) return null;
      stats.retried++;
      try {
        return await pool!.run(task, { signal: cancel });
      } catch (second) {
        if (cancel.aborted) return null;
        stats.lost++;
        const why = second instanceof Error ? second.message : String(second);
        return failedChunk(ctx, start, end, `worker failed twice on rows ${start}-${end}: ${why}`);
      }
    }
  };

  // segment being filled
  let segBatches: arrow.RecordBatch[] = [];
  let segProfileBatches: arrow.RecordBatch[] = [];
  let segProfileRows = 0;
  let segStart = s.rowStart;
  let cursor = s.rowStart;
  let lastCommit = performance.now();

  const commitSegment = async (): Promise<void> => {
    if (segBatches.length === 0) return;
    try {
      await store.commit(segStart, cursor, segBatches, s.profileSchema !== null ? segProfileBatches : undefined);
    } catch (err) {
      const why = err instanceof Error ? err.message : String(err);
      throw new RunError(`cannot write results to ${s.partialDir}: ${why}. Rows committed before row ${segStart} are kept; fix the problem and rerun the same command with --resume.`);
    }
    await publication.append(segBatches, s.profileSchema !== null ? segProfileBatches : null);
    segBatches = [];
    segProfileBatches = [];
    segProfileRows = 0;
    segStart = cursor;
    lastCommit = performance.now();
  };

  const accept = async (r: ChunkResult): Promise<void> => {
    if (r.start !== cursor) throw new RunError(`rows ${r.start}-${r.end} came back where row ${cursor} was due`);
    segBatches.push(chunkToRecordBatch(r, s.schema, s.dictionary));
    if (s.profileSchema !== null && axis !== null) {
      const pb = profileChunkToRecordBatch(r, s.profileSchema, axis);
      if (pb === null) throw new RunError(`rows ${r.start}-${r.end} came back without their profiles`);
      segProfileBatches.push(pb);
      segProfileRows += pb.numRows;
    }
    cursor = r.end;
    stats.computed += r.end - r.start;
    // profile rows are 7 numbers each: a segment holds at most 8 x segmentRows of them
    if (cursor - segStart >= o.segmentRows || segProfileRows >= o.segmentRows * 8 || performance.now() - lastCommit >= o.segmentMs) await commitSegment();
    o.progress?.update(cursor - s.rowStart);
  };

  // enough queued work that workers keep busy while the main thread commits a segment (fsync)
  const window = s.workers * 4 + 2;
  let keptIdx = 0;
  try {
    for (;;) {
      // segments of an earlier process that start here go in as they are
      while (!interrupted && keptIdx < kept.length && kept[keptIdx].start === cursor) {
        await commitSegment();
        await publication.replay(kept[keptIdx]);
        cursor = kept[keptIdx].end;
        segStart = cursor;
        keptIdx++;
        o.progress?.update(cursor - s.rowStart);
      }
      while (!interrupted && pending.done !== true && queue.length < window) {
        const [start, end] = pending.value;
        const cancel = new AbortController();
        const item: Submitted = {
          start, end, cancel,
          done: runChunk(start, end, cancel.signal).then((r) => {
            item.result = r;
          }),
        };
        queue.push(item);
        pending = chunks.next();
      }
      const head = queue[0];
      if (head === undefined) break; // complete, or interrupted with nothing in flight
      // interrupted or not, the chunks that ran are committed in order, up to the first cancelled one
      await head.done;
      if (head.result === null || head.result === undefined) break;
      queue.shift();
      await accept(head.result);
    }
    await commitSegment();
  } catch (err) {
    await publication.abort();
    throw err;
  } finally {
    o.signal?.removeEventListener('abort', onAbort);
    // wait for running tasks so no worker writes after we return
    await Promise.allSettled(queue.map((q) => q.done));
    await pool?.destroy();
  }
  return { writtenEnd: cursor, computedRows: stats.computed, retriedChunks: stats.retried, lostChunks: stats.lost, interrupted: interrupted && cursor < s.rowEnd };
}
