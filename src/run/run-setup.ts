/**
 * The first steps of a run: resolve every setting and check the output before any work
 * (prepareRun, which changes nothing on disk), then, holding the output's lock, decide what
 * becomes of an earlier partial run (openPartialRun: the resume policy).
 */
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { InputError } from '../errors.js';
import { makeStatusDictionary, resultsSchema, tableFieldsOf, type ResultsTableMeta } from '../io/arrow-schema.js';
import { profilesPathFor, resolveOutputFormat, type OutputFormat } from '../io/output-format.js';
import { profilesSchema } from '../io/profile-table.js';
import { foreignEntries, partialDirFor, removePartialDir, SegmentStore, type PartialManifest, type Segment } from '../io/segment-store.js';
import { publishedFiles } from '../io/table-sink.js';
import { resolveParams, type MeltParams } from '../physics/params.js';
import { planSweep, shardRange } from '../plan/index.js';
import type { Plan } from '../plan/types.js';
import { sweepHash } from '../spec/index.js';
import type { SweepSpec } from '../spec/types.js';
import { TOOL_VERSION } from '../version.js';
import { defaultChunkSize } from './chunks.js';
import { checkCompanion, checkOutput, existingOutputMatches, removeStaleTemporaries } from './output-guard.js';
import { formatProfileGrid, profileGridPressures } from './profile-grid.js';
import type { RunOptions } from './run-sweep.js';
import type * as arrow from 'apache-arrow';

/** Everything a run needs, resolved once from its options. */
export interface RunSetup {
  readonly spec: SweepSpec;
  readonly plan: Plan;
  readonly params: MeltParams;
  readonly hash: string;
  readonly rowStart: number;
  readonly rowEnd: number;
  readonly workers: number;
  readonly outPath: string;
  readonly partialDir: string;
  readonly force: boolean;
  readonly resume: boolean;
  readonly format: OutputFormat;
  readonly profilesPath: string | null;
  readonly profileGrid: string | undefined;
  readonly profilePressures: Float64Array | null;
  /** the manifest a new partial run would get */
  readonly manifest: PartialManifest;
  readonly schema: arrow.Schema;
  readonly profileSchema: arrow.Schema | null;
  readonly dictionary: arrow.Vector<arrow.Utf8>;
}

/** Worker threads for a run: the request (default: every core), capped at the cores unless oversubscribed. */
function resolveWorkers(requested: number | undefined, oversubscribe: boolean): number {
  const cores = os.availableParallelism();
  const want = Math.max(1, Math.floor(requested ?? cores));
  return oversubscribe ? want : Math.min(want, cores);
}

/**
 * Resolve a run's settings and check its output. Changes nothing on disk.
 * @throws InputError for outputs that cannot be used
 */
export function prepareRun(opts: RunOptions): RunSetup {
  const spec = opts.spec;
  if (opts.outPath.trim() === '') throw new InputError('--output: the output name is empty; give a file name, e.g. --output results.arrow');
  const plan = planSweep(spec);
  const params = resolveParams(spec.model.params);
  const hash = sweepHash(spec);
  const { start: rowStart, end: rowEnd } = opts.shard ? shardRange(plan.count, opts.shard.k, opts.shard.n) : { start: 0, end: plan.count };
  const outPath = path.resolve(opts.outPath);
  const force = opts.force === true;
  const resume = opts.resume === true;
  const format = resolveOutputFormat(outPath, opts.format);
  const profilesPath = opts.profiles ? profilesPathFor(outPath) : null;
  const profileGrid = opts.profiles ? formatProfileGrid(opts.profiles) : undefined;
  const profilePressures = opts.profiles ? profileGridPressures(opts.profiles) : null;
  const inputs = opts.sweepPath !== undefined ? [opts.sweepPath] : [];
  checkOutput(outPath, force, resume, '--output', inputs);
  if (profilesPath !== null) {
    if (!resume) checkCompanion(profilesPath, 'the profile table', force);
    for (const input of inputs) checkOutput(profilesPath, true, true, '--output', [input]);
  }
  const partialDir = partialDirFor(outPath);
  const partialStat = fs.lstatSync(partialDir, { throwIfNoEntry: false });
  if (partialStat !== undefined && !partialStat.isDirectory()) {
    throw new InputError(`--output: ${partialDir} exists and is not a folder meltsweep created; move it away or choose another output`);
  }
  if (partialStat !== undefined) {
    const foreign = foreignEntries(partialDir);
    if (foreign.length > 0) {
      const shown = foreign.slice(0, 3).join(', ') + (foreign.length > 3 ? ` and ${foreign.length - 3} more` : '');
      throw new InputError(
        `--output: ${partialDir} holds files meltsweep did not write (${shown}); meltsweep keeps its partial runs there and never deletes a folder it did not create: move it away or choose another output`,
      );
    }
  }
  const manifest: PartialManifest = {
    sweepHash: hash,
    rowStart,
    rowEnd,
    chunkSize: opts.chunkSize ?? defaultChunkSize(spec, rowEnd - rowStart, profilePressures?.length ?? 0),
    toolVersion: TOOL_VERSION,
    ...(profileGrid !== undefined ? { profileGrid } : {}),
  };
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
  return {
    spec, plan, params, hash, rowStart, rowEnd,
    workers: resolveWorkers(opts.workers, opts.oversubscribe === true),
    outPath, partialDir, force, resume, format, profilesPath, profileGrid, profilePressures, manifest,
    schema: resultsSchema(meta),
    profileSchema: profileGrid !== undefined ? profilesSchema(meta, profileGrid) : null,
    dictionary: makeStatusDictionary(),
  };
}

/** A segment a resume could not trust, and why; its rows are computed again. */
export interface RepairedSegment {
  readonly name: string;
  readonly why: string;
}

/** What the resume policy decided. */
export type PartialRun =
  /** the output is already a finished run of this sweep (resume of a complete run) */
  | { readonly kind: 'finished' }
  | { readonly kind: 'partial'; readonly store: SegmentStore; readonly kept: readonly Segment[]; readonly repaired: readonly RepairedSegment[] };

/**
 * The resume policy, run while holding the output's lock: clear leftovers of killed processes,
 * refuse a partial run of another sweep, shard, profile grid or tool version, verify every
 * committed segment (the failing ones are named and recomputed), or start a new partial run.
 * @throws InputError when the partial run cannot be used as asked
 */
export async function openPartialRun(s: RunSetup): Promise<PartialRun> {
  const { partialDir, outPath, force, resume } = s;
  if (force) removePartialDir(partialDir);
  for (const f of [...publishedFiles(s.format, outPath), ...(s.profilesPath ? publishedFiles(s.format, s.profilesPath) : [])]) removeStaleTemporaries(f);

  let store: SegmentStore | null = null;
  if (fs.existsSync(partialDir)) {
    const found = SegmentStore.inspect(partialDir);
    if (found.kind === 'empty') {
      removePartialDir(partialDir); // a crash while creating it
    } else if (found.kind === 'damaged') {
      throw new InputError(
        `--resume: the partial run in ${partialDir} cannot be trusted: ${found.why}; its committed rows cannot be checked against the sweep. ` +
          'Start over with --force (discards them), or restore the manifest',
      );
    } else {
      store = found.store;
    }
  }
  if (store !== null && !resume) {
    throw new InputError(`--output: a partial run of ${outPath} exists (${partialDir}); use --resume to finish it or --force to start over`);
  }
  if (store !== null) checkCompatible(store, s);
  if (resume && fs.existsSync(outPath)) {
    if (await existingOutputMatches(outPath, s.manifest, s.profilesPath)) {
      store?.remove();
      return { kind: 'finished' };
    }
    if (!force) throw new InputError(`--resume: ${outPath} exists but is not a finished run of this sweep; use --force to replace it`);
  }
  if (store === null) return { kind: 'partial', store: SegmentStore.create(partialDir, s.manifest), kept: [], repaired: [] };
  const check = store.verify(s.profileSchema !== null);
  return { kind: 'partial', store, kept: check.kept, repaired: check.dropped };
}

function checkCompatible(store: SegmentStore, s: RunSetup): void {
  const m = store.manifest;
  if (m.sweepHash !== s.hash || m.rowStart !== s.rowStart || m.rowEnd !== s.rowEnd) {
    throw new InputError(
      `--resume: the partial run in ${s.partialDir} belongs to another sweep or shard (hash ${m.sweepHash.slice(0, 12)}, rows ${m.rowStart}-${m.rowEnd}); this sweep is ${s.hash.slice(0, 12)}, rows ${s.rowStart}-${s.rowEnd}`,
    );
  }
  if (m.toolVersion !== TOOL_VERSION) {
    throw new InputError(
      `--resume: the partial run in ${s.partialDir} was computed by meltsweep ${m.toolVersion}, this is ${TOOL_VERSION}: another version may compute different numbers, ` +
        `and one table must not mix them; finish it with meltsweep ${m.toolVersion}, or start over with --force`,
    );
  }
  if (m.profileGrid !== s.profileGrid) {
    const had = m.profileGrid === undefined ? 'without --profiles' : `with --profiles ${m.profileGrid}`;
    throw new InputError(`--resume: the partial run in ${s.partialDir} was started ${had}; resume it with the same --profiles (or start over with --force)`);
  }
}
