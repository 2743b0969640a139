import type { Command } from 'commander';
import fs from 'node:fs';
import { completeParts, readSubmission, SUBMISSION_FILE } from '../../cluster/parts-folder.js';
import { InputError } from '../../errors.js';
import { OUTPUT_FORMATS, parseOutputFormat, type OutputFormat } from '../../io/output-format.js';
import { mergeShards } from '../../run/merge.js';
import { printNote, warnOutputExtension } from '../options.js';
import { formatCounts } from '../run-report.js';

/** The files to merge: as given, or every part of a submission's parts folder (all must be complete). */
async function shardFiles(args: readonly string[]): Promise<string[]> {
  if (args.length !== 1 || fs.statSync(args[0], { throwIfNoEntry: false })?.isDirectory() !== true) return [...args];
  const record = readSubmission(args[0]);
  if (record === null) throw new InputError(`merge: ${args[0]} is a folder without ${SUBMISSION_FILE}, not the parts folder of a submit; give the shard files`);
  return completeParts(args[0], record);
}

export function registerMerge(program: Command): void {
  program
    .command('merge')
    .description('merge shard outputs of one sweep into one table (checks they cover the sweep exactly once; merges their profile tables too)')
    .argument('<shards...>', 'shard output files (Arrow IPC, Parquet or CSV), or the OUT.parts folder of a submit (every part must be there)')
    .requiredOption('-o, --output <file>', 'merged table (.arrow/.feather/.ipc, .parquet or .csv; other names: see --format)')
    .option('--format <format>', `table format: ${OUTPUT_FORMATS.join(', ')} (default: from the output's extension, else arrow)`, parseOutputFormat)
    .option('--force', 'replace an existing output')
    .action(async (shards: string[], o: { output: string; force?: boolean; format?: OutputFormat }) => {
      warnOutputExtension(o.output, o.format);
      const s = await mergeShards(await shardFiles(shards), o.output, { force: o.force === true, format: o.format, note: printNote });
      const lines = [`merged ${s.shards} shard(s) into ${s.outPath} (${s.format})`, `rows: ${s.rows.toLocaleString('en-US')} (${formatCounts(s.counts)})`];
      if (s.profilesPath !== null) lines.push(`profiles: ${s.profilesPath}`);
      if (s.profilesNote !== null) lines.push(`note: ${s.profilesNote}`);
      process.stdout.write(`${lines.join('\n')}\n`);
    });
}
