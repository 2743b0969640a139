/**
 * Run a sweep: split the index range into chunks, integrate them on a piscina pool, write
 * the results in scenario order into committed segments, and publish one table (Arrow IPC,
 * Parquet or CSV; with a profile grid, a second table of profiles).
 *
 * Memory is bounded by the in-flight window (finished chunks wait in a small reorder buffer;
 * no new chunk is submitted while the window is full) and by the segment size.
 */
import * as arrow from 'apache-arrow';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { pathToFileURL } from 'node:url';
import { Piscina } from 'piscina';
import { InputError, RunError } from '../errors.js';
import type { ColumnStatus } from '../physics/types.js';
import { resolveParams } from '../physics/params.js';
import { planSweep, shardRange } from '../plan/index.js';
import { sweepHash } from '../spec/index.js';
import type { SweepSpec } from '../spec/types.js';
import { TOOL_VERSION } from '../version.js';
import { chunkToRecordBatch } from '../io/arrow-batch.js';
import { makeStatusDictionary, resultsSchema, tableFieldsOf, type ResultsTableMeta } from '../io/arrow-schema.js';
import { profilesPathFor, resolveOutputFormat, type OutputFormat } from '../io/output-format.js';
import { profileAxis, profileChunkToRecordBatch, profilesSchema } from '../io/profile-table.js';
import { partialDirFor, SegmentStore, type PartialManifest } from '../io/segment-store.js';
import { readTableBatches } from '../io/table-reader.js';
import { publishedFiles, type TableSinkOptions } from '../io/table-sink.js';
import { failedChunk, makeChunkContext, type ChunkResult } from './compute-chunk.js';
import { countStatuses, emptyCounts, Publication } from './publication.js';
import { defaultChunkSize } from './chunks.js';
import { formatProfileGrid, profileGridPressures, type ProfileGrid } from './profile-grid.js';
import type { ProgressSink } from './progress.js';
import type { ChunkTask } from './task.js';
import { sweepWorkerFile } from './worker-file.js';
import { checkOutput, existingOutputMatches, removeStaleTemporaries } from './output-guard.js';

export interface ShardSelection {
  /** 1-based shard number */
  readonly k: number;
  readonly n: number;
}

export interface RunOptions {
  readonly spec: SweepSpec;
  readonly outPath: string;
  /** worker threads (default: all available cores) */
  readonly workers?: number;
  /** continue a partial run of the same sweep */
  readonly resume?: boolean;
  /** replace an existing output file and discard a partial run */
  readonly force?: boolean;
  readonly shard?: ShardSelection;
  /** rows per task (default from the thermal model and the range size) */
  readonly chunkSize?: number;
  /** commit a segment after this many rows ... */
  readonly segmentRows?: number;
  /** ... or after this many seconds, whichever comes first */
  readonly segmentSeconds?: number;
  readonly progress?: ProgressSink | null;
  /** stop cleanly when aborted (Ctrl-C): finished rows are committed, the run is resumable */
  readonly signal?: AbortSignal;
  /** a different worker module (tests inject faults with it) */
  readonly workerFile?: string;
  /** table format of the output (default: from the extension of outPath, else arrow) */
  readonly format?: OutputFormat;
  /** also write the profile table (profilesPathFor(outPath)): every column sampled on this pressure grid */
  readonly profiles?: ProfileGrid;
  /** writer settings (Parquet compression, row group size) */
  readonly writer?: TableSinkOptions;
  /**
   * Modules (paths or file URLs) of processes that are not built in, default export = the
   * ProcessDefinition: every worker thread registers them before computing. The caller registers
   * them in its own thread with registerProcess (src/process/registry.ts) before validating.
   */
  readonly processModules?: readonly string[];
}

export interface RunSummary {
  readonly outPath: string;
  readonly rowStart: number;
  readonly rowEnd: number;
  readonly rows: number;
  /** rows computed by this process (the rest came from an earlier, interrupted run) */
  readonly computedRows: number;
  readonly counts: Readonly<Record<ColumnStatus, number>>;
  readonly seconds: number;
  readonly workers: number;
  readonly chunkSize: number;
  /** chunks whose worker failed once and were retried */
  readonly retriedChunks: number;
  /** chunks whose worker failed twice: their rows are recorded as failed */
  readonly lostChunks: number;
  readonly interrupted: boolean;
  readonly sweepHash: string;
  /** format of the published table(s) */
  readonly format: OutputFormat;
  /** the profile table, when the run writes one */
  readonly profilesPath: string | null;
}

/**
 * Run (or resume) a sweep and publish its results table.
 * @throws InputError for outputs that cannot be used; RunError when writing fails (the partial
 *   run stays resumable).
 */
export async function runSweep(opts: RunOptions): Promise<RunSummary> {
  const t0 = performance.now();
  const spec = opts.spec;
  const plan = planSweep(spec);
  const params = resolveParams(spec.model.params);
  const hash = sweepHash(spec);
  const { start: rowStart, end: rowEnd } = opts.shard ? shardRange(plan.count, opts.shard.k, opts.shard.n) : { start: 0, end: plan.count };
  const workers = Math.max(1, Math.floor(opts.workers ?? os.availableParallelism()));
  const outPath = path.resolve(opts.outPath);
  const force = opts.force === true;
  const resume = opts.resume === true;
  const format = resolveOutputFormat(outPath, opts.format);
  const profilesPath = opts.profiles ? profilesPathFor(outPath) : null;
  const profileGrid = opts.profiles ? formatProfileGrid(opts.profiles) : undefined;
  const profilePressures = opts.profiles ? profileGridPressures(opts.profiles) : null;
  checkOutput(outPath, force, resume);
  if (profilesPath !== null && fs.existsSync(profilesPath) && !force && !resume) {
    throw new InputError(`--output: ${profilesPath} (the profile table) already exists; use --force to replace it`);
  }

  const partialDir = partialDirFor(outPath);
  const manifest: PartialManifest = {
    sweepHash: hash,
    rowStart,
    rowEnd,
    chunkSize: opts.chunkSize ?? defaultChunkSize(spec, rowEnd - rowStart, profilePressures?.length ?? 0),
    toolVersion: TOOL_VERSION,
    ...(profileGrid !== undefined ? { profileGrid } : {}),
  };
  if (force) fs.rmSync(partialDir, { recursive: true, force: true });
  for (const f of [...publishedFiles(format, outPath), ...(profilesPath ? publishedFiles(format, profilesPath) : [])]) removeStaleTemporaries(f);

  let store = fs.existsSync(partialDir) ? SegmentStore.open(partialDir) : null;
  if (store !== null && !resume) {
    throw new InputError(`--output: a partial run of ${outPath} exists (${partialDir}); use --resume to finish it or --force to start over`);
  }
  if (store !== null) {
    const m = store.manifest;
    if (m.sweepHash !== hash || m.rowStart !== rowStart || m.rowEnd !== rowEnd) {
      throw new InputError(
        `--resume: the partial run in ${partialDir} belongs to another sweep or shard (hash ${m.sweepHash.slice(0, 12)}, rows ${m.rowStart}-${m.rowEnd}); this sweep is ${hash.slice(0, 12)}, rows ${rowStart}-${rowEnd}`,
      );
    }
    if (m.profileGrid !== profileGrid) {
      const had = m.profileGrid === undefined ? 'without --profiles' : `with --profiles ${m.profileGrid}`;
      throw new InputError(`--resume: the partial run in ${partialDir} was started ${had}; resume it with the same --profiles (or start over with --force)`);
    }
  } else if (fs.existsSync(partialDir)) {
    // a folder without a readable manifest: a crash while creating it
    fs.rmSync(partialDir, { recursive: true, force: true });
  }
  if (resume && fs.existsSync(outPath)) {
    if (await existingOutputMatches(outPath, manifest, profilesPath)) {
      store?.remove();
      return finishedSummary(outPath, manifest, workers, t0, hash, format, profilesPath);
    }
    if (!force) throw new InputError(`--resume: ${outPath} exists but is not a finished run of this sweep; use --force to replace it`);
  }
  store ??= SegmentStore.create(partialDir, manifest);
  const chunkSize = store.manifest.chunkSize;

  const meta: ResultsTableMeta = {
    ...tableFieldsOf(spec),
    sweepJson: JSON.stringify(spec),
    sweepHash: hash,
    toolVersion: TOOL_VERSION,
    params,
    pointCount: plan.count,
    rowStart,
    rowEnd,
    shard: opts.shard ? `${opts.shard.k}/${opts.shard.n}` : '1/1',
    blockLabels: plan.hasBlocks ? ['A', 'B', ...plan.axisNames.map((n) => `AB_${n}`)] : null,
  };
  const schema = resultsSchema(meta);
  const dictionary = makeStatusDictionary();
  const pSchema = profileGrid !== undefined ? profilesSchema(meta, profileGrid) : null;
  const axis = profilePressures !== null ? profileAxis(profilePressures, params) : null;

  const publication = await Publication.open(
    format,
    { path: outPath, schema },
    dictionary,
    profilesPath !== null && pSchema !== null ? { path: profilesPath, schema: pSchema } : null,
    partialDir,
    opts.writer,
  );
  try {
    await publication.replay(store);
  } catch (err) {
    await publication.abort();
    throw err;
  }
  const resumeFrom = store.committedEnd();
  opts.progress?.replayed?.(resumeFrom - rowStart);
  const chunks: Array<[number, number]> = [];
  for (let s = resumeFrom; s < rowEnd; s += chunkSize) chunks.push([s, Math.min(s + chunkSize, rowEnd)]);

  const ctx = makeChunkContext(spec);
  // the worker keeps one context per key: the profile grid changes what a context computes
  const specKey = profileGrid === undefined ? hash : `${hash}|profiles ${profileGrid}`;
  let retriedChunks = 0;
  let lostChunks = 0;
  let interrupted = false;

  const pool =
    chunks.length === 0
      ? null
      : new Piscina<ChunkTask, ChunkResult>({
          filename: pathToFileURL(opts.workerFile ?? sweepWorkerFile()).href,
          minThreads: Math.min(workers, chunks.length),
          maxThreads: workers,
          idleTimeout: 2000,
        });

  const runChunk = async (idx: number): Promise<ChunkResult> => {
    const [s, e] = chunks[idx];
    const base: ChunkTask = opts.profiles ? { specKey, spec, start: s, end: e, profiles: opts.profiles } : { specKey, spec, start: s, end: e };
    const task: ChunkTask = opts.processModules === undefined ? base : { ...base, processModules: opts.processModules };
    try {
      return await pool!.run(task);
    } catch (first) {
      retriedChunks++;
      try {
        return await pool!.run(task);
      } catch (second) {
        lostChunks++;
        const why = second instanceof Error ? second.message : String(second);
        return failedChunk(ctx, s, e, `worker failed twice on rows ${s}-${e}: ${why}`);
      }
    }
  };

  // enough queued work that workers keep busy while the main thread commits a segment (fsync)
  const window = workers * 4 + 2;
  const finished = new Map<number, ChunkResult>();
  const inFlight = new Map<number, Promise<void>>();
  let nextSubmit = 0;
  let nextWrite = 0;
  let segBatches: arrow.RecordBatch[] = [];
  let segProfileBatches: arrow.RecordBatch[] = [];
  let segProfileRows = 0;
  let segStart = resumeFrom;
  let segEnd = resumeFrom;
  let segRows = 0;
  let lastCommit = performance.now();
  const segmentRows = opts.segmentRows ?? 262_144;
  const segmentMs = (opts.segmentSeconds ?? 3) * 1000;

  const commitSegment = async (): Promise<void> => {
    if (segBatches.length === 0) return;
    try {
      await store!.commit(segStart, segEnd, segBatches, pSchema !== null ? segProfileBatches : undefined);
    } catch (err) {
      const why = err instanceof Error ? err.message : String(err);
      throw new RunError(
        `cannot write results to ${partialDir}: ${why}. Rows ${rowStart}-${segStart} are kept; fix the problem and rerun the same command with --resume.`,
      );
    }
    await publication.append(segBatches, pSchema !== null ? segProfileBatches : null);
    segBatches = [];
    segProfileBatches = [];
    segProfileRows = 0;
    segStart = segEnd;
    segRows = 0;
    lastCommit = performance.now();
  };

  const onAbort = (): void => {
    interrupted = true;
  };
  opts.signal?.addEventListener('abort', onAbort);
  if (opts.signal?.aborted) interrupted = true;
  try {
    while (nextWrite < chunks.length) {
      while (!interrupted && nextSubmit < chunks.length && nextSubmit - nextWrite < window) {
        const idx = nextSubmit++;
        inFlight.set(
          idx,
          runChunk(idx).then((r) => {
            finished.set(idx, r);
            inFlight.delete(idx);
          }),
        );
      }
      const ready = finished.get(nextWrite);
      if (ready !== undefined) {
        finished.delete(nextWrite);
        nextWrite++;
        segBatches.push(chunkToRecordBatch(ready, schema, dictionary));
        if (pSchema !== null && axis !== null) {
          const pb = profileChunkToRecordBatch(ready, pSchema, axis);
          if (pb === null) throw new RunError(`rows ${ready.start}-${ready.end} came back without their profiles`);
          segProfileBatches.push(pb);
          segProfileRows += pb.numRows;
        }
        segEnd = ready.end;
        segRows += ready.end - ready.start;
        // profile rows are 7 numbers each: a segment holds at most 8 x segmentRows of them
        if (segRows >= segmentRows || segProfileRows >= segmentRows * 8 || performance.now() - lastCommit >= segmentMs) await commitSegment();
        opts.progress?.update(segEnd - rowStart);
        continue;
      }
      if (inFlight.size === 0) break; // interrupted: nothing more will arrive
      await Promise.race(inFlight.values());
    }
    await commitSegment();
  } catch (err) {
    await publication.abort();
    throw err;
  } finally {
    opts.signal?.removeEventListener('abort', onAbort);
    // wait for running tasks so no worker writes after we return
    await Promise.allSettled(inFlight.values());
    await pool?.destroy();
  }

  const computedRows = segEnd - resumeFrom;
  if (interrupted && segEnd < rowEnd) {
    await publication.abort();
    opts.progress?.finish(segEnd - rowStart);
    return {
      outPath, rowStart, rowEnd, rows: segEnd - rowStart, computedRows, counts: emptyCounts(),
      seconds: (performance.now() - t0) / 1000, workers, chunkSize, retriedChunks, lostChunks, interrupted: true, sweepHash: hash,
      format, profilesPath,
    };
  }
  opts.progress?.finish(rowEnd - rowStart);
  await publication.publish();
  store.remove();
  return {
    outPath, rowStart, rowEnd, rows: rowEnd - rowStart, computedRows, counts: publication.counts,
    seconds: (performance.now() - t0) / 1000, workers, chunkSize, retriedChunks, lostChunks, interrupted: false, sweepHash: hash,
    format, profilesPath,
  };
}

async function finishedSummary(
  outPath: string, manifest: PartialManifest, workers: number, t0: number, hash: string, format: OutputFormat, profilesPath: string | null,
): Promise<RunSummary> {
  const counts = emptyCounts();
  let rows = 0;
  for await (const batch of readTableBatches(outPath)) {
    countStatuses(batch, counts);
    rows += batch.numRows;
  }
  return {
    outPath, rowStart: manifest.rowStart, rowEnd: manifest.rowEnd, rows, computedRows: 0, counts,
    seconds: (performance.now() - t0) / 1000, workers, chunkSize: manifest.chunkSize, retriedChunks: 0, lostChunks: 0,
    interrupted: false, sweepHash: hash, format, profilesPath,
  };
}
