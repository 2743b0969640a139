/**
 * Run a sweep: the named steps are
 *   1. prepareRun      resolve settings, check the output (nothing on disk changes);
 *   2. lockOutput      one writer per output (OUT.lock);
 *   3. openPartialRun  the resume policy: verify an earlier partial run or start a new one;
 *   4. Publication     open the final table(s) under temporary names;
 *   5. computeRows     stream the missing chunks through the pool, commit segments, replay kept ones;
 *   6. publish         check the rows cover the range exactly once, then rename.
 *
 * Memory is bounded by the in-flight window (finished chunks wait in a small reorder buffer;
 * no new chunk is submitted while the window is full) and by the segment size, whatever the
 * point count (chunks are made as they are submitted).
 */
import type { ColumnStatus } from '../physics/types.js';
import type { SweepSpec } from '../spec/types.js';
import type { OutputFormat } from '../io/output-format.js';
import { readTableBatches } from '../io/table-reader.js';
import type { TableSinkOptions } from '../io/table-sink.js';
import { computeRows } from './chunk-pipeline.js';
import { lockOutput } from './output-lock.js';
import type { ProfileGrid } from './profile-grid.js';
import type { ProgressSink } from './progress.js';
import { countStatuses, emptyCounts, Publication } from './publication.js';
import { openPartialRun, prepareRun, type RepairedSegment, type RunSetup } from './run-setup.js';

export type { RepairedSegment } from './run-setup.js';

export interface ShardSelection {
  /** 1-based shard number */
  readonly k: number;
  readonly n: number;
}

export interface RunOptions {
  readonly spec: SweepSpec;
  readonly outPath: string;
  /** worker threads (default: all available cores; capped at the available cores unless oversubscribe) */
  readonly workers?: number;
  /** allow more worker threads than available cores */
  readonly oversubscribe?: boolean;
  /** the sweep file the spec was read from: refused as the output, even with force */
  readonly sweepPath?: string;
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
  /** told about things the user should know that are not errors (a stale lock taken over) */
  readonly note?: (message: string) => void;
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
  /** committed segments of an earlier process that failed verification; their rows were computed again */
  readonly repairedSegments: readonly RepairedSegment[];
}

/**
 * Run (or resume) a sweep and publish its results table.
 * @throws InputError for outputs that cannot be used (before any work, nothing on disk changed);
 *   RunError when writing fails (the partial run stays resumable).
 */
export async function runSweep(opts: RunOptions): Promise<RunSummary> {
  const t0 = performance.now();
  const setup = prepareRun(opts);
  const lock = lockOutput(setup.outPath, opts.shard ? `run --shard ${opts.shard.k}/${opts.shard.n}` : 'run', opts.note);
  try {
    return await runLocked(setup, opts, t0);
  } finally {
    lock.release();
  }
}

async function runLocked(s: RunSetup, opts: RunOptions, t0: number): Promise<RunSummary> {
  const partial = await openPartialRun(s);
  if (partial.kind === 'finished') return finishedSummary(s, t0);
  const { store, kept, repaired } = partial;
  const chunkSize = store.manifest.chunkSize;
  // rows kept from an earlier process count as done, not as computed (rate and time left)
  opts.progress?.replayed?.(kept.reduce((n, k) => n + (k.end - k.start), 0));
  const publication = await Publication.open(
    { start: s.rowStart, end: s.rowEnd },
    s.format,
    { path: s.outPath, schema: s.schema },
    s.dictionary,
    s.profilesPath !== null && s.profileSchema !== null ? { path: s.profilesPath, schema: s.profileSchema } : null,
    s.partialDir,
    opts.writer,
  );
  const r = await computeRows(s, store, kept, publication, {
    chunkSize,
    segmentRows: opts.segmentRows ?? 262_144,
    segmentMs: (opts.segmentSeconds ?? 3) * 1000,
    profiles: opts.profiles,
    processModules: opts.processModules,
    workerFile: opts.workerFile,
    progress: opts.progress,
    signal: opts.signal,
  });
  const base = {
    outPath: s.outPath, rowStart: s.rowStart, rowEnd: s.rowEnd, computedRows: r.computedRows, workers: s.workers, chunkSize,
    retriedChunks: r.retriedChunks, lostChunks: r.lostChunks, sweepHash: s.hash, format: s.format, profilesPath: s.profilesPath,
    repairedSegments: repaired,
  };
  if (r.interrupted) {
    await publication.abort();
    opts.progress?.finish(r.writtenEnd - s.rowStart);
    return { ...base, rows: r.writtenEnd - s.rowStart, counts: emptyCounts(), seconds: (performance.now() - t0) / 1000, interrupted: true };
  }
  opts.progress?.finish(s.rowEnd - s.rowStart);
  await publication.publish();
  store.remove();
  return { ...base, rows: s.rowEnd - s.rowStart, counts: publication.counts, seconds: (performance.now() - t0) / 1000, interrupted: false };
}

/** The summary of a run that was already finished (resume of a complete output). */
async function finishedSummary(s: RunSetup, t0: number): Promise<RunSummary> {
  const counts = emptyCounts();
  let rows = 0;
  for await (const batch of readTableBatches(s.outPath)) {
    countStatuses(batch, counts);
    rows += batch.numRows;
  }
  return {
    outPath: s.outPath, rowStart: s.rowStart, rowEnd: s.rowEnd, rows, computedRows: 0, counts,
    seconds: (performance.now() - t0) / 1000, workers: s.workers, chunkSize: s.manifest.chunkSize, retriedChunks: 0, lostChunks: 0,
    interrupted: false, sweepHash: s.hash, format: s.format, profilesPath: s.profilesPath, repairedSegments: [],
  };
}
