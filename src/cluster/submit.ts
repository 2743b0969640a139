/**
 * `meltsweep submit`: a sweep as a Slurm job array of N shard tasks plus a merge job that runs
 * once every task succeeded. Writes the parts folder (sweep copy, submission record, logs) and the
 * two job scripts beside the output, then submits them with sbatch (or, with dryRun, only
 * returns what it would write and run).
 */
import fs from 'node:fs';
import path from 'node:path';
import { InputError, RunError } from '../errors.js';
import { resolveOutputFormat, type OutputFormat } from '../io/output-format.js';
import { MAX_SHARDS } from '../plan/shards.js';
import { planSweep } from '../plan/index.js';
import { packageRoot } from '../run/worker-file.js';
import { loadSweepFile, sweepHash } from '../spec/index.js';
import { TOOL_VERSION } from '../version.js';
import { layoutPaths, mergeScriptText, sbatchCommands, shardScriptText, shellQuote, type SubmitLayout } from './job-scripts.js';
import { writeSubmission, type SubmissionRecord } from './parts-folder.js';
import { findOnPath, runSbatch, sbatchMissing } from './sbatch.js';

/** Options of submitSweep. */
export interface SubmitOptions {
  readonly sweepPath: string;
  readonly output: string;
  readonly shards: number;
  /** format of the merged table (default: from the output's extension, else arrow) */
  readonly format?: OutputFormat;
  /** worker threads and Slurm CPUs per task (default 1) */
  readonly workersPerTask?: number;
  readonly sbatchOptions?: readonly string[];
  readonly setup?: readonly string[];
  /** build everything, write and submit nothing */
  readonly dryRun?: boolean;
}

/** What was (or, in a dry run, would be) written and submitted. */
export interface SubmitResult {
  readonly layout: SubmitLayout;
  readonly shardScript: string;
  readonly mergeScript: string;
  /** sbatch command lines; the merge's names ARRAY_ID in a dry run */
  readonly commands: readonly (readonly string[])[];
  readonly shardJobId: string | null;
  readonly mergeJobId: string | null;
}

/** sbatch options that submit sets itself, with what to use instead. */
const RESERVED_OPTIONS: ReadonlyArray<readonly [RegExp, string]> = [
  [/^(--array\b|-a\b|-a\d)/, 'submit makes the array from --shards'],
  [/^(--dependency\b|-d\b)/, 'submit makes the merge job depend on the array'],
  [/^(--cpus-per-task\b|-c\b|-c\d)/, 'use --workers-per-task'],
  [/^--wrap\b/, 'submit writes the job scripts'],
];

/** Check `--sbatch-option` values: one option each, written as on the sbatch command line. */
function checkSbatchOptions(options: readonly string[]): string[] {
  return options.map((raw) => {
    const o = raw.trim();
    if (!o.startsWith('-')) throw new InputError(`--sbatch-option: ${JSON.stringify(raw)} is not an sbatch option; write it as on the command line, e.g. --sbatch-option "--partition=short"`);
    if (/[\r\n]/.test(o)) throw new InputError(`--sbatch-option: ${JSON.stringify(raw)} spans lines; give one option per --sbatch-option`);
    for (const [re, instead] of RESERVED_OPTIONS) {
      if (re.test(o)) throw new InputError(`--sbatch-option: ${JSON.stringify(raw)} is set by submit itself (${instead})`);
    }
    return o;
  });
}

/** The CLI entry point of this installation (what the job scripts run). */
function cliEntryPoint(): string {
  const file = path.join(packageRoot(), 'dist', 'src', 'cli', 'main.js');
  if (!fs.existsSync(file)) throw new RunError(`the meltsweep CLI ${file} is missing: run "npm run build" first`);
  return file;
}

function refuseExisting(layout: SubmitLayout): void {
  if (fs.existsSync(layout.output)) throw new InputError(`--output: ${layout.output} already exists; choose another name or remove it`);
  for (const f of [layout.partsDir, layout.shardScript, layout.mergeScript]) {
    if (fs.existsSync(f)) {
      throw new InputError(
        `--output: ${f} exists from an earlier submission to ${layout.output}; to rerun its failed tasks use the command printed by ` +
          `"meltsweep merge ${layout.partsDir} -o ${layout.output}", or remove ${layout.partsDir} and both .sbatch files to start over`,
      );
    }
  }
  const dir = path.dirname(layout.output);
  if (!fs.existsSync(dir)) throw new InputError(`--output: folder ${dir} does not exist`);
}

/**
 * Submit a sweep as N shard tasks and a merge job.
 * @throws InputError for a bad sweep, shard count, option or an output that exists;
 *   RunError when sbatch is missing or refuses a job (its message included)
 */
export async function submitSweep(o: SubmitOptions): Promise<SubmitResult> {
  const spec = await loadSweepFile(o.sweepPath);
  const hash = sweepHash(spec);
  const pointCount = planSweep(spec).count;
  const maxShards = Math.min(MAX_SHARDS, pointCount);
  if (!Number.isSafeInteger(o.shards) || o.shards < 1 || o.shards > maxShards) {
    throw new InputError(`--shards: ${o.shards} is not allowed; give a whole number from 1 to ${maxShards} (the sweep has ${pointCount.toLocaleString('en-US')} points)`);
  }
  const paths = layoutPaths(o.output, o.sweepPath);
  const layout: SubmitLayout = {
    ...paths,
    format: resolveOutputFormat(paths.output, o.format),
    node: process.execPath,
    cli: cliEntryPoint(),
    sweepName: spec.name,
    sweepHash: hash,
    pointCount,
    shards: o.shards,
    workersPerTask: o.workersPerTask ?? 1,
    sbatchOptions: checkSbatchOptions(o.sbatchOptions ?? []),
    setup: (o.setup ?? []).flatMap((s) => s.split(/\r?\n/)),
  };
  refuseExisting(layout);
  const shardScript = shardScriptText(layout);
  const mergeScript = mergeScriptText(layout);
  const cmds = sbatchCommands(layout);
  if (o.dryRun === true) {
    return { layout, shardScript, mergeScript, commands: [cmds.shards, cmds.merge('ARRAY_ID')], shardJobId: null, mergeJobId: null };
  }
  if (findOnPath('sbatch') === null) throw sbatchMissing();

  const record: SubmissionRecord = {
    sweepName: spec.name,
    sweepHash: hash,
    pointCount,
    shards: o.shards,
    output: layout.output,
    format: layout.format,
    sweepCopy: layout.sweepCopy,
    shardScript: layout.shardScript,
    mergeScript: layout.mergeScript,
    toolVersion: TOOL_VERSION,
    submittedAt: new Date().toISOString(),
  };
  writeFiles(layout, o.sweepPath, shardScript, mergeScript, record);
  if (sweepHash(await loadSweepFile(layout.sweepCopy)) !== hash) {
    removeFiles(layout);
    throw new InputError(`${o.sweepPath}: the file changed while it was being submitted; submit again`);
  }
  let shardJobId: string;
  try {
    shardJobId = runSbatch(cmds.shards, 'the shard array');
  } catch (err) {
    // nothing was submitted: leave nothing behind, so the same command can be run again
    removeFiles(layout);
    throw err;
  }
  writeSubmission(layout.partsDir, { ...record, shardJobId });
  let mergeJobId: string;
  try {
    mergeJobId = runSbatch(cmds.merge(shardJobId), 'the merge job');
  } catch (err) {
    const why = err instanceof Error ? err.message : String(err);
    throw new RunError(`the shard array was submitted as job ${shardJobId}, but ${why}; submit the merge yourself: sbatch --dependency=afterok:${shardJobId} ${shellQuote(layout.mergeScript)}`);
  }
  writeSubmission(layout.partsDir, { ...record, shardJobId, mergeJobId });
  return { layout, shardScript, mergeScript, commands: [cmds.shards, cmds.merge(shardJobId)], shardJobId, mergeJobId };
}

/** Write the parts folder (with the checked sweep copy) and the two scripts. */
function writeFiles(layout: SubmitLayout, sweepPath: string, shardScript: string, mergeScript: string, record: SubmissionRecord): void {
  fs.mkdirSync(path.join(layout.partsDir, 'logs'), { recursive: true });
  fs.mkdirSync(path.dirname(layout.sweepCopy), { recursive: true });
  fs.copyFileSync(sweepPath, layout.sweepCopy);
  fs.writeFileSync(layout.shardScript, shardScript, { mode: 0o755 });
  fs.writeFileSync(layout.mergeScript, mergeScript, { mode: 0o755 });
  writeSubmission(layout.partsDir, record);
}

function removeFiles(layout: SubmitLayout): void {
  for (const f of [layout.partsDir, layout.shardScript, layout.mergeScript]) fs.rmSync(f, { recursive: true, force: true });
}
