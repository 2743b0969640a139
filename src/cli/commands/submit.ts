import type { Command } from 'commander';
import { resubmitHint, shellQuote } from '../../cluster/job-scripts.js';
import { submitSweep, type SubmitResult } from '../../cluster/submit.js';
import { InputError } from '../../errors.js';
import { OUTPUT_FORMATS, parseOutputFormat, type OutputFormat } from '../../io/output-format.js';
import { MAX_SHARDS } from '../../plan/shards.js';
import { parseWorkers, warnOutputExtension } from '../options.js';

interface SubmitCommandOptions {
  readonly output: string;
  readonly shards: number;
  readonly format?: OutputFormat;
  readonly workersPerTask?: number;
  readonly sbatchOption: string[];
  readonly setup: string[];
  readonly dryRun?: boolean;
}

function parseShards(value: string): number {
  const n = Number(value);
  if (!Number.isSafeInteger(n) || n < 1 || n > MAX_SHARDS) throw new InputError(`--shards: ${value} is not allowed; give a whole number from 1 to ${MAX_SHARDS}`);
  return n;
}

function collect(value: string, previous: string[]): string[] {
  return [...previous, value];
}

/** The dry run: both scripts and the commands that would submit them. */
function formatDryRun(r: SubmitResult): string {
  const l = r.layout;
  return [
    `dry run: nothing written, nothing submitted. A submission would write ${l.partsDir}/ (the sweep copy, logs, parts) and:`,
    '',
    `==> ${l.shardScript}`,
    r.shardScript,
    `==> ${l.mergeScript}`,
    r.mergeScript,
    'and run:',
    ...r.commands.map((c) => `  ${c.map(shellQuote).join(' ')}`),
    '(ARRAY_ID: the job id the first command prints)',
  ].join('\n');
}

/** What was submitted and how to follow it. */
function formatSubmitted(r: SubmitResult): string {
  const l = r.layout;
  const ids = `${r.shardJobId},${r.mergeJobId}`;
  const [again, then] = resubmitHint(l.shardScript, l.mergeScript, 'K', r.mergeJobId ?? undefined);
  return [
    `submitted sweep "${l.sweepName}" (${l.pointCount.toLocaleString('en-US')} points) as ${l.shards} shard task${l.shards === 1 ? '' : 's'} and a merge job`,
    `  shard tasks: job ${r.shardJobId} (array 1-${l.shards}, ${l.workersPerTask} CPU${l.workersPerTask === 1 ? '' : 's'} each), logs ${l.partsDir}/logs/part-K.log`,
    `  merge:       job ${r.mergeJobId}, runs when every task succeeded and writes ${l.output}`,
    'watch:',
    `  squeue -j ${ids}                 queued and running`,
    `  sacct -X -j ${ids}               states and exit codes, also after they end`,
    'a failed or cancelled task K, resubmitted alone, resumes from its committed rows:',
    `  ${again}`,
    `  ${then}`,
    `what is missing, and the exact commands: meltsweep merge ${shellQuote(l.partsDir)} -o ${shellQuote(l.output)}`,
  ].join('\n');
}

export function registerSubmit(program: Command): void {
  program
    .command('submit')
    .description('run a sweep on a Slurm cluster: a job array of shard tasks and a merge job that waits for them (writes the job scripts beside the output)')
    .argument('<sweep>', 'sweep file (YAML or JSON); a copy is kept in OUTPUT.parts/ and checked by every task')
    .requiredOption('-o, --output <file>', 'merged table (.arrow/.feather/.ipc, .parquet or .csv; other names: see --format)')
    .requiredOption('--shards <n>', 'number of array tasks (shards)', parseShards)
    .option('--format <format>', `format of the merged table: ${OUTPUT_FORMATS.join(', ')} (default: from the output's extension, else arrow)`, parseOutputFormat)
    .option('--workers-per-task <n>', 'worker threads of each task, also its Slurm --cpus-per-task (default 1)', parseWorkers)
    .option('--sbatch-option <option>', 'an sbatch option for both jobs, e.g. "--partition=short" or "--time=02:00:00" (repeatable)', collect, [])
    .option('--setup <command>', 'shell command the jobs run first, e.g. "module load nodejs" (repeatable)', collect, [])
    .option('--dry-run', 'print the job scripts and sbatch commands; write and submit nothing')
    .action(async (sweep: string, o: SubmitCommandOptions) => {
      warnOutputExtension(o.output, o.format);
      const r = await submitSweep({
        sweepPath: sweep,
        output: o.output,
        shards: o.shards,
        format: o.format,
        workersPerTask: o.workersPerTask,
        sbatchOptions: o.sbatchOption,
        setup: o.setup,
        dryRun: o.dryRun === true,
      });
      process.stdout.write(`${o.dryRun === true ? formatDryRun(r) : formatSubmitted(r)}\n`);
    });
}
