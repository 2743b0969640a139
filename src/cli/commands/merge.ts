import type { Command } from 'commander';
import { mergeShards } from '../../run/merge.js';
import { formatCounts } from '../run-report.js';

export function registerMerge(program: Command): void {
  program
    .command('merge')
    .description('merge shard outputs of one sweep into one table (checks they cover the sweep exactly once)')
    .argument('<shards...>', 'shard output files')
    .requiredOption('-o, --output <file>', 'merged Arrow IPC file')
    .option('--force', 'replace an existing output')
    .action(async (shards: string[], o: { output: string; force?: boolean }) => {
      const s = await mergeShards(shards, o.output, o.force === true);
      process.stdout.write(`merged ${s.shards} shard(s) into ${s.outPath}\nrows: ${s.rows.toLocaleString('en-US')} (${formatCounts(s.counts)})\n`);
    });
}
