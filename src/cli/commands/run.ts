import type { Command } from 'commander';
import os from 'node:os';
import { InputError } from '../../errors.js';
import { OUTPUT_FORMATS, parseOutputFormat, type OutputFormat } from '../../io/output-format.js';
import { formatProfileGrid, parseProfileGrid, type ProfileGrid } from '../../run/profile-grid.js';
import { loadSweepFile, sweepHash } from '../../spec/index.js';
import { parseShardArg } from '../../plan/index.js';
import { runSweep, type RunSummary } from '../../run/run-sweep.js';
import { createProgress } from '../../run/progress.js';
import { planSweep, shardRange } from '../../plan/index.js';
import { parseNumberOption, parseWorkers, printNote, warnOutputExtension } from '../options.js';
import { handleInterrupts, stopAtOnce } from '../interrupts.js';
import { formatRunSummary } from '../run-report.js';
import { summaryAfterRun } from './sensitivity.js';

export interface RunCommandOptions {
  readonly output: string;
  readonly workers?: number;
  /** allow more workers than cores */
  readonly oversubscribe?: boolean;
  readonly resume?: boolean;
  readonly force?: boolean;
  readonly shard?: string;
  readonly quiet?: boolean;
  readonly summary?: boolean;
  readonly commitSeconds?: number;
  /** table format (default: from the output's extension, else arrow) */
  readonly format?: OutputFormat;
  /** write the profile table sampled on this grid */
  readonly profiles?: ProfileGrid;
  /** refuse unless the sweep's hash is this one (set by the job scripts of `submit`) */
  readonly sweepHash?: string;
}

/** Exit code of an interrupted run (128 + SIGINT), the shell convention. */
const EXIT_INTERRUPTED = 130;

/**
 * Run a sweep file the way `meltsweep run` does: Ctrl-C stops cleanly (a second Ctrl-C
 * exits at once; committed rows are kept either way).
 */
export async function executeRun(sweepPath: string, o: RunCommandOptions): Promise<RunSummary> {
  // Ctrl-C is honoured from the first moment: while the sweep is read and planned it stops at once
  // (nothing is written yet), later the run stops cleanly
  const controller = new AbortController();
  const restore = handleInterrupts((signal) => {
    if (controller.signal.aborted) stopAtOnce(signal);
    process.stderr.write('\nstopping: committing every finished row (Ctrl-C again to quit at once)\n');
    controller.abort();
  });
  try {
    const spec = await loadSweepFile(sweepPath);
    if (o.sweepHash !== undefined) checkSweepHash(sweepPath, sweepHash(spec), o.sweepHash);
    const shard = o.shard === undefined ? undefined : parseShardArg(o.shard, process.env);
    const plan = planSweep(spec);
    const range = shard ? shardRange(plan.count, shard.k, shard.n) : { start: 0, end: plan.count };
    warnWorkerCap(o);
    if (controller.signal.aborted) process.exit(EXIT_INTERRUPTED);
    const summary = await runSweep({
      spec,
      sweepPath,
      outPath: o.output,
      workers: o.workers,
      oversubscribe: o.oversubscribe,
      resume: o.resume,
      force: o.force,
      shard,
      signal: controller.signal,
      segmentSeconds: o.commitSeconds,
      format: o.format,
      profiles: o.profiles,
      note: printNote,
      progress: o.quiet ? null : createProgress({ totalRows: range.end - range.start, startRows: 0, stream: process.stderr }),
    });
    for (const r of summary.repairedSegments) {
      process.stderr.write(`resume: committed segment ${r.name} ${r.why}; its rows were computed again\n`);
    }
    return summary;
  } finally {
    restore();
  }
}

/** Say so when --workers asks for more threads than the machine has cores (they are capped). */
function warnWorkerCap(o: RunCommandOptions): void {
  const cores = os.availableParallelism();
  if (o.workers === undefined || o.workers <= cores || o.oversubscribe === true) return;
  process.stderr.write(`note: --workers ${o.workers} is more than the ${cores} available cores; using ${cores} (add --oversubscribe to use ${o.workers})\n`);
}

/** Refuse a sweep whose hash is not the one recorded when its jobs were submitted. */
function checkSweepHash(sweepPath: string, actual: string, expected: string): void {
  if (actual === expected.trim().toLowerCase()) return;
  throw new InputError(
    `--sweep-hash: ${sweepPath} is sweep ${actual.slice(0, 12)}, not the ${expected.slice(0, 12)} recorded when it was submitted: ` +
      'the copy was edited after submission, so this task would mix two sweeps; submit the sweep again',
  );
}

/** Print a finished or interrupted run and set the exit code. */
export async function reportRun(summary: RunSummary, o: RunCommandOptions, resumeHint: string): Promise<void> {
  if (summary.interrupted) {
    process.stderr.write(
      `interrupted after ${summary.rows.toLocaleString('en-US')} of ${(summary.rowEnd - summary.rowStart).toLocaleString('en-US')} rows; ` +
        `every finished row is kept. To finish: ${resumeHint}\n`,
    );
    process.exitCode = EXIT_INTERRUPTED;
    return;
  }
  process.stdout.write(`${formatRunSummary(summary)}\n`);
  if (summary.profilesPath !== null) process.stdout.write(`profiles: ${summary.profilesPath}\n`);
  if (o.summary !== false) process.stdout.write(`\n${await summaryAfterRun(summary.outPath)}\n`);
}

export function registerRun(program: Command): void {
  program
    .command('run')
    .description('run a sweep file and write one Arrow table with a row per scenario')
    .argument('<sweep>', 'sweep file (YAML or JSON)')
    .requiredOption('-o, --output <file>', 'output table (.arrow/.feather/.ipc: Arrow IPC, .parquet: Parquet, .csv: CSV; other names: see --format)')
    .option('--format <format>', `table format: ${OUTPUT_FORMATS.join(', ')} (default: from the output's extension, else arrow)`, parseOutputFormat)
    .option('--profiles <from:to:step>', 'also write OUTPUT.profiles.EXT: every column sampled on this pressure grid in GPa, e.g. 0:8:0.05', parseProfileGrid)
    .option('-w, --workers <n>', 'worker threads (default: all available cores; capped at the cores unless --oversubscribe)', parseWorkers)
    .option('--oversubscribe', 'allow --workers above the number of available cores')
    .option('--resume', 'finish an interrupted run of the same sweep')
    .option('--force', 'replace an existing output and discard a partial run')
    .option('--shard <k/n>', 'compute only shard k of n (1-based), or "auto" from a batch scheduler array job')
    .option('--sweep-hash <sha256>', 'refuse to run unless the sweep\'s hash (see meltsweep plan) is this one; the job scripts of submit use it')
    .option('-q, --quiet', 'no progress output')
    .option('--no-summary', 'do not compute and print the sensitivity summary')
    .option('--commit-seconds <s>', 'commit finished rows to disk at least this often (default 3)', (v: string) =>
      parseNumberOption('--commit-seconds', v, 0.05, 3600, 's'),
    )
    .action(async (sweep: string, o: RunCommandOptions) => {
      if (o.resume && o.force) throw new InputError('--resume and --force: choose one (resume keeps finished rows, force starts over)');
      warnOutputExtension(o.output, o.format);
      const summary = await executeRun(sweep, o);
      const extra = [o.shard ? ` --shard ${o.shard}` : '', o.format ? ` --format ${o.format}` : '', o.profiles ? ` --profiles ${formatProfileGrid(o.profiles)}` : ''].join('');
      const again = `meltsweep run ${sweep} -o ${o.output}${extra} --resume`;
      await reportRun(summary, o, again);
    });
}
