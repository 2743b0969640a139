/**
 * The Slurm job scripts of `meltsweep submit`, as text: a job array whose task K computes shard K
 * of N into the parts folder, and a merge job that joins the parts into the output. Pure
 * functions of a SubmitLayout, so `--dry-run` prints exactly what a submission would write.
 */
import path from 'node:path';
import type { OutputFormat } from '../io/output-format.js';

/** Where everything of one submission lives, and what the tasks run. All paths absolute. */
export interface SubmitLayout {
  /** the merged table */
  readonly output: string;
  readonly format: OutputFormat;
  /** folder of the parts, the sweep copy, the record of the submission and the logs */
  readonly partsDir: string;
  /** the copy of the sweep file that every task runs */
  readonly sweepCopy: string;
  readonly shardScript: string;
  readonly mergeScript: string;
  /** node executable and CLI entry point that the jobs call */
  readonly node: string;
  readonly cli: string;
  readonly sweepName: string;
  /** sha256 of the normalized sweep, checked by every task */
  readonly sweepHash: string;
  readonly pointCount: number;
  readonly shards: number;
  /** worker threads (and Slurm CPUs) of each task */
  readonly workersPerTask: number;
  /** extra sbatch options, written as #SBATCH lines in both scripts */
  readonly sbatchOptions: readonly string[];
  /** shell lines run before meltsweep (module loads, environments) */
  readonly setup: readonly string[];
}

/**
 * Files a submission writes, from the output path: OUT.parts/ (with the sweep copy in
 * OUT.parts/sweep/), OUT.shards.sbatch and OUT.merge.sbatch.
 */
export function layoutPaths(output: string, sweepFile: string): Pick<SubmitLayout, 'output' | 'partsDir' | 'sweepCopy' | 'shardScript' | 'mergeScript'> {
  const out = path.resolve(output);
  const partsDir = `${out}.parts`;
  return {
    output: out,
    partsDir,
    // the copy keeps the file's name: a sweep without `name` is named after its file (and hashed so)
    sweepCopy: path.join(partsDir, 'sweep', path.basename(sweepFile)),
    shardScript: `${out}.shards.sbatch`,
    mergeScript: `${out}.merge.sbatch`,
  };
}

/** The part file of shard k (1-based). */
export function partPath(partsDir: string, k: number): string {
  return path.join(partsDir, `part-${k}.arrow`);
}

/** Text in single quotes for the shell (a ' inside becomes '\''). */
export function shellQuote(text: string): string {
  return /^[A-Za-z0-9_./:=@%+,-]+$/.test(text) ? text : `'${text.replaceAll("'", `'\\''`)}'`;
}

/** A Slurm job name from the sweep name: letters, digits, . _ - only, at most 40 characters. */
function jobName(sweepName: string, suffix: string): string {
  const base = sweepName.replace(/[^A-Za-z0-9._-]+/g, '-').replace(/^-+|-+$/g, '').slice(0, 40);
  return `meltsweep-${base === '' ? 'sweep' : base}${suffix}`;
}

function header(l: SubmitLayout, what: string): string[] {
  return [
    '#!/bin/bash',
    `# ${what}`,
    `# sweep "${l.sweepName.replace(/[\r\n]+/g, ' ')}" (hash ${l.sweepHash.slice(0, 12)}), ${l.pointCount.toLocaleString('en-US')} points in ${l.shards} shard${l.shards === 1 ? '' : 's'}`,
    '# written by `meltsweep submit`',
  ];
}

function commonLines(l: SubmitLayout): string[] {
  return [
    ...l.sbatchOptions.map((o) => `#SBATCH ${o}`),
    '',
    'set -e',
    ...(l.setup.length > 0 ? ['# set-up (--setup)', ...l.setup] : []),
    '# the meltsweep that submitted these jobs (nothing needs to be on PATH)',
    `node=${shellQuote(l.node)}`,
    `meltsweep=${shellQuote(l.cli)}`,
  ];
}

/** The job array: task K runs shard K of N, resuming its own committed rows. */
export function shardScriptText(l: SubmitLayout): string {
  return [
    ...header(l, `meltsweep shard tasks: task K computes shard K of ${l.shards} into part-K.arrow`),
    `# resubmit task K alone (it resumes from its committed rows): sbatch --array=K ${shellQuote(l.shardScript)}`,
    `#SBATCH --job-name=${jobName(l.sweepName, '')}`,
    `#SBATCH --array=1-${l.shards}`,
    `#SBATCH --cpus-per-task=${l.workersPerTask}`,
    `#SBATCH --output=${path.join(l.partsDir, 'logs', 'part-%a.log')}`,
    ...commonLines(l),
    `sweep=${shellQuote(l.sweepCopy)}`,
    `parts=${shellQuote(l.partsDir)}`,
    'task="${SLURM_ARRAY_TASK_ID:?run this script with sbatch (it is a job array), or set SLURM_ARRAY_TASK_ID=K}"',
    '',
    `# the shard is named as K/${l.shards} rather than --shard auto: a task resubmitted alone`,
    '# (--array=K) is an array of one, whose array size would read as 1',
    `exec "$node" "$meltsweep" run "$sweep" --output "$parts/part-$task.arrow" \\`,
    `  --shard "$task/${l.shards}" --resume --workers ${l.workersPerTask} \\`,
    `  --sweep-hash ${l.sweepHash} --no-summary`,
    '',
  ].join('\n');
}

/** The merge job: runs after every task succeeded; refuses, naming them, while parts are missing. */
export function mergeScriptText(l: SubmitLayout): string {
  return [
    ...header(l, `meltsweep merge job: joins the ${l.shards} parts into ${l.output}`),
    '# submitted with --dependency=afterok:<the shard array>; it names any part that is missing',
    `#SBATCH --job-name=${jobName(l.sweepName, '-merge')}`,
    '#SBATCH --cpus-per-task=1',
    `#SBATCH --output=${path.join(l.partsDir, 'logs', 'merge-%j.log')}`,
    ...commonLines(l),
    '',
    `exec "$node" "$meltsweep" merge ${shellQuote(l.partsDir)} --output ${shellQuote(l.output)} --format ${l.format}`,
    '',
  ].join('\n');
}

/** The sbatch command lines of a submission; ARRAY_ID stands for the array's job id. */
export function sbatchCommands(l: SubmitLayout): { readonly shards: string[]; readonly merge: (arrayId: string) => string[] } {
  return {
    shards: ['sbatch', '--parsable', l.shardScript],
    merge: (arrayId) => ['sbatch', '--parsable', `--dependency=afterok:${arrayId}`, l.mergeScript],
  };
}

/**
 * Slurm's array list of task numbers, ranges compressed: [2, 3, 4, 7] -> "2-4,7".
 * @param tasks 1-based task numbers, any order
 */
export function arrayList(tasks: readonly number[]): string {
  const sorted = [...new Set(tasks)].sort((a, b) => a - b);
  const parts: string[] = [];
  for (let i = 0; i < sorted.length; ) {
    let j = i;
    while (j + 1 < sorted.length && sorted[j + 1] === sorted[j] + 1) j++;
    parts.push(j === i ? `${sorted[i]}` : `${sorted[i]}-${sorted[j]}`);
    i = j + 1;
  }
  return parts.join(',');
}

/**
 * The commands that rerun some tasks alone and then the merge after them.
 * @param tasks Slurm array list of the tasks ("3", "2-4,7", or a placeholder such as "K")
 * @param mergeJobId the pending merge job to cancel first, when known
 */
export function resubmitHint(shardScript: string, mergeScript: string, tasks: string, mergeJobId?: string): [string, string] {
  const cancel = mergeJobId === undefined ? '(scancel the old merge job first if it is still pending)' : `(scancel ${mergeJobId} first if it is still pending)`;
  return [
    `sbatch --array=${tasks} ${shellQuote(shardScript)}`,
    `then merge after it: sbatch --dependency=afterok:NEW_JOB_ID ${shellQuote(mergeScript)}   ${cancel}`,
  ];
}
