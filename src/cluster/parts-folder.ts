/**
 * The parts folder of a submission (OUT.parts/): the sweep copy, `submission.json` (what was
 * submitted), one part table per shard and the job logs. `meltsweep merge OUT.parts` reads it
 * to know which parts must be there, and refuses, naming them, while any is missing.
 */
import fs from 'node:fs';
import path from 'node:path';
import { InputError } from '../errors.js';
import { partialDirFor, SegmentStore } from '../io/segment-store.js';
import { readResultsMeta } from '../io/arrow-schema.js';
import { readTableSchema } from '../io/table-reader.js';
import { writeFileAtomic } from '../io/ipc-file.js';
import { arrayList, partPath, resubmitHint } from './job-scripts.js';

/** Name of the record of a submission inside the parts folder. */
export const SUBMISSION_FILE = 'submission.json';

/** What `submission.json` holds. */
export interface SubmissionRecord {
  readonly sweepName: string;
  readonly sweepHash: string;
  readonly pointCount: number;
  readonly shards: number;
  readonly output: string;
  readonly format: string;
  readonly sweepCopy: string;
  readonly shardScript: string;
  readonly mergeScript: string;
  readonly toolVersion: string;
  /** ISO time of the submission */
  readonly submittedAt: string;
  /** job ids, once sbatch accepted the jobs */
  readonly shardJobId?: string;
  readonly mergeJobId?: string;
}

export function writeSubmission(partsDir: string, record: SubmissionRecord): void {
  writeFileAtomic(path.join(partsDir, SUBMISSION_FILE), `${JSON.stringify(record, null, 2)}\n`);
}

/** The record of the submission whose parts folder is `dir`; null when `dir` is not one. */
export function readSubmission(dir: string): SubmissionRecord | null {
  const file = path.join(dir, SUBMISSION_FILE);
  if (!fs.existsSync(file)) return null;
  let data: unknown;
  try {
    data = JSON.parse(fs.readFileSync(file, 'utf8'));
  } catch (err) {
    throw new InputError(`merge: ${file} is not readable JSON (${err instanceof Error ? err.message : String(err)})`);
  }
  const r = data as Partial<SubmissionRecord>;
  if (typeof r.sweepHash !== 'string' || typeof r.shards !== 'number' || !Number.isSafeInteger(r.shards) || r.shards < 1) {
    throw new InputError(`merge: ${file} does not record a submission (sweepHash and shards are missing)`);
  }
  return data as SubmissionRecord;
}

/** How far a shard that has no part table yet got. */
function shardState(partsDir: string, k: number): string {
  const store = SegmentStore.open(partialDirFor(partPath(partsDir, k)));
  if (store === null) return 'not started, or failed before committing a row';
  const m = store.manifest;
  let done: number;
  try {
    done = store.committedEnd() - m.rowStart;
  } catch (err) {
    return `partial run unreadable (${err instanceof Error ? err.message : String(err)})`;
  }
  return `incomplete: ${done.toLocaleString('en-US')} of ${(m.rowEnd - m.rowStart).toLocaleString('en-US')} rows committed`;
}

/**
 * The part tables of a submission, in shard order, once every shard is complete.
 * @throws InputError naming every missing shard (how far it got) and the command to rerun them,
 *   or when a part comes from another sweep than the one submitted.
 */
export async function completeParts(partsDir: string, record: SubmissionRecord): Promise<string[]> {
  const files: string[] = [];
  const missing: number[] = [];
  const problems: string[] = [];
  for (let k = 1; k <= record.shards; k++) {
    const file = partPath(partsDir, k);
    if (fs.existsSync(file)) {
      files.push(file);
      continue;
    }
    missing.push(k);
    problems.push(`merge: shard ${k} of ${record.shards} is missing (${path.basename(file)}: ${shardState(partsDir, k)})`);
  }
  if (missing.length > 0) {
    const [again, then] = resubmitHint(record.shardScript, record.mergeScript, arrayList(missing), record.mergeJobId);
    throw new InputError([
      `merge: ${missing.length} of ${record.shards} shards are not complete; the merge waits for all of them`,
      ...problems,
      `rerun them: ${again}`,
      then,
    ]);
  }
  for (const file of files) {
    const hash = readResultsMeta(await readTableSchema(file), file).sweepHash;
    if (hash !== record.sweepHash) {
      problems.push(`merge: ${file} comes from sweep ${hash.slice(0, 12)}, but ${SUBMISSION_FILE} records sweep ${record.sweepHash.slice(0, 12)}`);
    }
  }
  if (problems.length > 0) throw new InputError(problems);
  return files;
}
