import type { Command } from 'commander';
import { OUTPUT_FORMATS, parseOutputFormat, type OutputFormat } from '../../io/output-format.js';
import { mergeShards } from '../../run/merge.js';
import { formatCounts } from '../run-report.js';

export function registerMerge(program: Command): void {
  program
    .command('merge')
    .description('merge shard outputs of one sweep into one table (checks they cover the sweep exactly once; merges their profile tables too)')
    .argument('<shards...>', 'shard output files (Arrow IPC, Parquet or CSV)')
    .requiredOption('-o, --output <file>', 'merged table (.arrow/.feather/.ipc, .parquet or .csv; other names: see --format)')
    .option('--format <format>', `table format: ${OUTPUT_FORMATS.join(', ')} (default: from the output's extension, else arrow)`, parseOutputFormat)
    .option('--force', 'replace an existing output')
    .action(async (shards: string[], o: { output: string; force?: boolean; format?: OutputFormat }) => {
      const s = await mergeShards(shards, o.output, { force: o.force === true, format: o.format });
      const lines = [`merged ${s.shards} shard(s) into ${s.outPath} (${s.format})`, `rows: ${s.rows.toLocaleString('en-US')} (${formatCounts(s.counts)})`];
      if (s.profilesPath !== null) lines.push(`profiles: ${s.profilesPath}`);
      if (s.profilesNote !== null) lines.push(`note: ${s.profilesNote}`);
      process.stdout.write(`${lines.join('\n')}\n`);
    });
}
