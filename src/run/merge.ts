/**
 * Merge shard outputs into one table: every shard must come from the same sweep (hash) and
 * together they must cover the sweep's rows exactly once.
 */
import fs from 'node:fs';
import path from 'node:path';
import { InputError, RunError } from '../errors.js';
import type { ColumnStatus } from '../physics/types.js';
import { makeStatusDictionary, readResultsMeta, resultsSchema, type ResultsTableMeta } from '../io/arrow-schema.js';
import { withSharedDictionary } from '../io/arrow-batch.js';
import { IpcFileSink, readIpcBatches, readIpcSchema } from '../io/ipc-file.js';
import { countStatuses } from './run-sweep.js';
import { COLUMN_STATUSES } from '../physics/types.js';

export interface MergeSummary {
  readonly outPath: string;
  readonly rows: number;
  readonly shards: number;
  readonly counts: Readonly<Record<ColumnStatus, number>>;
}

interface ShardInfo {
  readonly file: string;
  readonly meta: ResultsTableMeta;
}

/** Check that the shards fit together; returns them in row order. */
export async function checkShards(files: readonly string[]): Promise<ShardInfo[]> {
  if (files.length === 0) throw new InputError('merge: give at least one shard file');
  const infos: ShardInfo[] = [];
  for (const file of files) {
    if (!fs.existsSync(file)) throw new InputError(`merge: ${file} does not exist`);
    let meta: ResultsTableMeta;
    try {
      meta = readResultsMeta(await readIpcSchema(file));
    } catch (err) {
      throw new InputError(`merge: ${file} is not a meltsweep results file (${err instanceof Error ? err.message : String(err)})`);
    }
    infos.push({ file, meta });
  }
  const first = infos[0].meta;
  const problems: string[] = [];
  for (const s of infos.slice(1)) {
    if (s.meta.sweepHash !== first.sweepHash) {
      problems.push(`merge: ${s.file} comes from sweep ${s.meta.sweepHash.slice(0, 12)}, but ${infos[0].file} from ${first.sweepHash.slice(0, 12)}: shards must come from the same sweep`);
    }
  }
  if (problems.length > 0) throw new InputError(problems);
  infos.sort((a, b) => a.meta.rowStart - b.meta.rowStart || a.meta.rowEnd - b.meta.rowEnd);
  let next = 0;
  for (const s of infos) {
    if (s.meta.rowStart > next) problems.push(`merge: rows ${next}-${s.meta.rowStart} are missing (no shard covers them)`);
    if (s.meta.rowStart < next) problems.push(`merge: rows ${s.meta.rowStart}-${Math.min(next, s.meta.rowEnd)} are covered twice (${s.file} overlaps an earlier shard)`);
    next = Math.max(next, s.meta.rowEnd);
  }
  if (next < first.pointCount) problems.push(`merge: rows ${next}-${first.pointCount} are missing (no shard covers them)`);
  if (problems.length > 0) throw new InputError(problems);
  return infos;
}

export async function mergeShards(files: readonly string[], outPath: string, force = false): Promise<MergeSummary> {
  const infos = await checkShards(files);
  const resolved = path.resolve(outPath);
  if (fs.existsSync(resolved) && !force) throw new InputError(`--output: ${outPath} already exists; use --force to replace it`);
  const m = infos[0].meta;
  const meta: ResultsTableMeta = { ...m, rowStart: 0, rowEnd: m.pointCount, shard: '1/1' };
  const schema = resultsSchema(meta);
  const dictionary = makeStatusDictionary();
  const counts = Object.fromEntries(COLUMN_STATUSES.map((s) => [s, 0])) as Record<ColumnStatus, number>;
  const sink = new IpcFileSink(resolved, `${resolved}.tmp-${process.pid}`, schema);
  let rows = 0;
  try {
    for (const s of infos) {
      for await (const batch of readIpcBatches(s.file)) {
        const rebuilt = withSharedDictionary(batch, schema, dictionary);
        countStatuses(rebuilt, counts);
        rows += rebuilt.numRows;
        await sink.write(rebuilt);
      }
    }
    await sink.publish();
  } catch (err) {
    await sink.abort();
    throw new RunError(`cannot write ${outPath}: ${err instanceof Error ? err.message : String(err)}`);
  }
  return { outPath: resolved, rows, shards: infos.length, counts };
}
