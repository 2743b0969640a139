/**
 * Merge shard outputs into one table: every shard must come from the same sweep (hash) and the
 * same meltsweep version, pass its checksum (src/io/table-checksum.ts), hold exactly the rows its
 * metadata claims, and together they must cover the sweep's rows exactly once. Nothing is
 * published unless all of that holds. Shards may be in any table format;
 * the merged table is written in the format asked for. When every shard has a profile table
 * (SHARD.profiles.EXT), those are merged too.
 */
import * as arrow from 'apache-arrow';
import fs from 'node:fs';
import path from 'node:path';
import { InputError, RunError } from '../errors.js';
import type { ColumnStatus } from '../physics/types.js';
import { makeStatusDictionary, readResultsMeta, resultsSchema, type ResultsTableMeta } from '../io/arrow-schema.js';
import { withSharedDictionary } from '../io/arrow-batch.js';
import { META } from '../io/arrow-schema.js';
import { profilesPathFor, resolveOutputFormat, type OutputFormat } from '../io/output-format.js';
import { profilesSchema } from '../io/profile-table.js';
import { readTableBatches, readTableSchema } from '../io/table-reader.js';
import { openTableSink, type TableSinkOptions } from '../io/table-sink.js';
import { checkScenarioIds, countStatuses } from './publication.js';
import { verifyTableChecksum } from '../io/table-checksum.js';
import { checkCompanion, checkOutput } from './output-guard.js';
import { lockOutput } from './output-lock.js';
import { shardRange } from '../plan/shards.js';
import { COLUMN_STATUSES } from '../physics/types.js';

export interface MergeSummary {
  readonly outPath: string;
  readonly rows: number;
  readonly shards: number;
  readonly counts: Readonly<Record<ColumnStatus, number>>;
  readonly format: OutputFormat;
  /** the merged profile table, when every shard had one; null otherwise */
  readonly profilesPath: string | null;
  /** why the profile tables were not merged, when some shards had one and others not */
  readonly profilesNote: string | null;
}

/** Options of mergeShards. */
export interface MergeOptions {
  /** replace an existing output */
  readonly force?: boolean;
  /** format of the merged table (default: from the output's extension, else arrow) */
  readonly format?: OutputFormat;
  /** writer settings (Parquet compression, row group size) */
  readonly writer?: TableSinkOptions;
  /** told about things the user should know that are not errors (a stale lock taken over) */
  readonly note?: (message: string) => void;
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
    let schema: arrow.Schema;
    try {
      schema = await readTableSchema(file);
    } catch (err) {
      throw new InputError(`merge: ${file} is not a meltsweep results file (${err instanceof Error ? err.message : String(err)})`);
    }
    try {
      meta = readResultsMeta(schema, file);
    } catch (err) {
      // the metadata check names the file, the key and the problem
      if (err instanceof InputError) throw new InputError(err.problems.map((p) => `merge: ${p}`));
      throw err;
    }
    infos.push({ file, meta });
  }
  const first = infos[0].meta;
  const problems: string[] = [];
  for (const s of infos.slice(1)) {
    if (s.meta.sweepHash !== first.sweepHash) {
      problems.push(`merge: ${s.file} comes from sweep ${s.meta.sweepHash.slice(0, 12)}, but ${infos[0].file} from ${first.sweepHash.slice(0, 12)}: shards must come from the same sweep`);
    } else if (s.meta.toolVersion !== first.toolVersion) {
      problems.push(
        `merge: ${s.file} was computed by meltsweep ${s.meta.toolVersion}, ${infos[0].file} by ${first.toolVersion}: versions may compute different numbers, so one table must not mix them; rerun the shards with one version`,
      );
    }
  }
  for (const s of infos) {
    const check = await verifyTableChecksum(s.file);
    if (check.status === 'bad') problems.push(`merge: ${s.file} is damaged: ${check.why}; run that shard again`);
    for (const companion of [profilesPathFor(s.file)]) {
      if (!fs.existsSync(companion)) continue;
      const pc = await verifyTableChecksum(companion);
      if (pc.status === 'bad') problems.push(`merge: ${companion} is damaged: ${pc.why}; run that shard again`);
    }
  }
  if (problems.length > 0) throw new InputError(problems);
  infos.sort((a, b) => a.meta.rowStart - b.meta.rowStart || a.meta.rowEnd - b.meta.rowEnd);
  let next = 0;
  for (const s of infos) {
    if (s.meta.rowStart > next) problems.push(`merge: rows ${next}-${s.meta.rowStart} are missing (${missingShards(infos, next, s.meta.rowStart)})`);
    if (s.meta.rowStart < next) problems.push(`merge: rows ${s.meta.rowStart}-${Math.min(next, s.meta.rowEnd)} are covered twice (${s.file} overlaps an earlier shard)`);
    next = Math.max(next, s.meta.rowEnd);
  }
  if (next < first.pointCount) problems.push(`merge: rows ${next}-${first.pointCount} are missing (${missingShards(infos, next, first.pointCount)})`);
  if (problems.length > 0) throw new InputError(problems);
  return infos;
}

/** The scenario ids of a shard's batch must continue at `next`; returns the id after its last row. */
function checkShardRows(batch: arrow.RecordBatch, next: number, s: ShardInfo): number {
  try {
    return checkScenarioIds(batch, next, `merge: ${s.file}`);
  } catch (err) {
    throw new InputError(`${err instanceof Error ? err.message : String(err)}; its metadata claims rows ${s.meta.rowStart}-${s.meta.rowEnd}: run that shard again`);
  }
}

/** Input problems pass through; anything else is a write failure naming the file. */
function writeError(file: string, err: unknown): Error {
  if (err instanceof InputError || err instanceof RunError) return err;
  return new RunError(`cannot write ${file}: ${err instanceof Error ? err.message : String(err)}`);
}

/** "shard 3 of 4 is missing" when the shards were cut k/n alike, else "no shard covers them". */
function missingShards(infos: readonly ShardInfo[], start: number, end: number): string {
  const ns = new Set(infos.map((s) => /^\d+\/(\d+)$/.exec(s.meta.shard)?.[1]));
  const n = Number([...ns][0]);
  if (ns.size !== 1 || !Number.isSafeInteger(n)) return 'no shard covers them';
  const count = infos[0].meta.pointCount;
  const ks: number[] = [];
  for (let k = 1; k <= n; k++) {
    const r = shardRange(count, k, n);
    if (r.start < end && r.end > start && r.end > r.start) ks.push(k);
  }
  if (ks.length === 1) return `shard ${ks[0]} of ${n} is missing`;
  const shown = ks.length > 12 ? `${ks.slice(0, 12).join(', ')} and ${ks.length - 12} more` : ks.join(', ');
  return `shards ${shown} of ${n} are missing`;
}

/** The profile grid shared by every shard's profile table; null when no shard has one. */
async function shardProfileGrid(infos: readonly ShardInfo[]): Promise<{ grid: string | null; note: string | null }> {
  const present = infos.filter((s) => fs.existsSync(profilesPathFor(s.file)));
  if (present.length === 0) return { grid: null, note: null };
  if (present.length < infos.length) {
    return { grid: null, note: `profile tables not merged: only ${present.length} of ${infos.length} shards have one` };
  }
  const grids = new Set<string>();
  for (const s of infos) {
    const file = profilesPathFor(s.file);
    const md = (await readTableSchema(file)).metadata;
    if (md.get(META.sweepHash) !== s.meta.sweepHash || md.get(META.rowRange) !== `${s.meta.rowStart}-${s.meta.rowEnd}`) {
      throw new InputError(`merge: ${file} does not belong to ${s.file} (another sweep or row range)`);
    }
    grids.add(md.get(META.profileGrid) ?? '');
  }
  if (grids.size !== 1) throw new InputError(`merge: the shards' profile tables use different pressure grids (${[...grids].join(', ')})`);
  return { grid: [...grids][0], note: null };
}

/**
 * Merge shard tables of one sweep into `outPath` (atomically, in the format asked for).
 * @throws InputError when the shards do not fit together, one is damaged or holds other rows
 *   than its metadata claims, or the output exists without force
 */
export async function mergeShards(files: readonly string[], outPath: string, options: MergeOptions = {}): Promise<MergeSummary> {
  const resolved = path.resolve(outPath);
  checkOutput(resolved, options.force === true, false, '--output', files);
  const infos = await checkShards(files);
  const format = resolveOutputFormat(resolved, options.format);
  const lock = lockOutput(resolved, 'merge', options.note);
  try {
    return await mergeLocked(infos, resolved, format, options);
  } finally {
    lock.release();
  }
}

async function mergeLocked(infos: readonly ShardInfo[], resolved: string, format: OutputFormat, options: MergeOptions): Promise<MergeSummary> {
  const { grid, note } = await shardProfileGrid(infos);
  const m = infos[0].meta;
  const meta: ResultsTableMeta = { ...m, rowStart: 0, rowEnd: m.pointCount, shard: '1/1' };
  let profilesPath: string | null = null;
  if (grid !== null) {
    profilesPath = profilesPathFor(resolved);
    checkCompanion(profilesPath, 'the merged profile table', options.force === true);
    const pSchema = profilesSchema(meta, grid);
    const psink = await openTableSink(format, profilesPath, pSchema, options.writer);
    try {
      for (const s of infos) {
        for await (const batch of readTableBatches(profilesPathFor(s.file))) await psink.write(new arrow.RecordBatch(pSchema, batch.data));
      }
      await psink.publish();
    } catch (err) {
      await psink.abort();
      throw writeError(profilesPath, err);
    }
  }
  const schema = resultsSchema(meta);
  const dictionary = makeStatusDictionary();
  const counts = Object.fromEntries(COLUMN_STATUSES.map((s) => [s, 0])) as Record<ColumnStatus, number>;
  const sink = await openTableSink(format, resolved, schema, options.writer);
  let rows = 0;
  try {
    for (const s of infos) {
      let next = s.meta.rowStart;
      for await (const batch of readTableBatches(s.file)) {
        const rebuilt = withSharedDictionary(batch, schema, dictionary);
        next = checkShardRows(rebuilt, next, s);
        countStatuses(rebuilt, counts);
        rows += rebuilt.numRows;
        await sink.write(rebuilt);
      }
      if (next !== s.meta.rowEnd) {
        throw new InputError(`merge: ${s.file} holds rows ${s.meta.rowStart}-${next}, but its metadata claims ${s.meta.rowStart}-${s.meta.rowEnd} (rows missing: the file was cut or edited); run that shard again`);
      }
    }
    await sink.publish();
  } catch (err) {
    await sink.abort();
    if (profilesPath !== null) fs.rmSync(profilesPath, { force: true });
    throw writeError(resolved, err);
  }
  return { outPath: resolved, rows, shards: infos.length, counts, format, profilesPath, profilesNote: note };
}
