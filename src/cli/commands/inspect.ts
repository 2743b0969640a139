import type { Command } from 'commander';
import { formatInspection, inspectTable } from '../../io/inspect-table.js';
import { parseNumberOption } from '../options.js';

export function registerInspect(program: Command): void {
  program
    .command('inspect')
    .description('show what a table holds: schema with units, sweep metadata, rows by status and the first rows (results, profile or sensitivity tables; Arrow, Parquet or CSV)')
    .argument('<file>', 'table written by meltsweep')
    .option('--rows <n>', 'first rows to show (default 5)', (v: string) => parseNumberOption('--rows', v, 0, 1000, 'rows'), 5)
    .option('--json', 'print the inspection as one JSON object')
    .action(async (file: string, o: { rows: number; json?: boolean }) => {
      const x = await inspectTable(file, Math.floor(o.rows));
      process.stdout.write(o.json ? `${JSON.stringify(x)}\n` : `${formatInspection(x)}\n`);
    });
}
