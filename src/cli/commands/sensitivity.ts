import type { Command } from 'commander';
import { formatSensitivitySummary } from '../../analyze/index.js';
import { readResultsMeta } from '../../io/arrow-schema.js';
import { readTableSchema } from '../../io/table-reader.js';
import { analyzeResultsFile, AUTO_SUMMARY_MAX_ROWS, sensitivityPathFor, writeSensitivityTable } from '../../run/sensitivity-file.js';
import { CAPPED_HELP, parseCappedOption, type CappedChoice } from '../../run/capped-rows.js';
import { parseNumberOption } from '../options.js';

/** Analyze a results file, write its sensitivity table, and return the printed summary. */
export async function summarizeResults(
  file: string,
  o: { outputs?: string[]; resamples?: number; seed?: number; output?: string; capped?: CappedChoice } = {},
): Promise<string> {
  const report = await analyzeResultsFile(file, o);
  const meta = readResultsMeta(await readTableSchema(file), file);
  const out = o.output ?? sensitivityPathFor(file);
  writeSensitivityTable(report, out, { 'meltsweep.source': file, 'meltsweep.sweep_hash': meta.sweepHash });
  return `${formatSensitivitySummary(report)}\nsensitivity table: ${out}`;
}

/** The summary step after `meltsweep run`: skipped with a note for shards and very large tables. */
export async function summaryAfterRun(file: string): Promise<string> {
  const meta = readResultsMeta(await readTableSchema(file), file);
  if (meta.rowStart !== 0 || meta.rowEnd !== meta.pointCount) {
    return 'sensitivity: skipped for a shard (merge the shards, then run meltsweep sensitivity on the merged file)';
  }
  if (meta.pointCount > AUTO_SUMMARY_MAX_ROWS) {
    return `sensitivity: skipped automatically above ${AUTO_SUMMARY_MAX_ROWS.toLocaleString('en-US')} rows; run meltsweep sensitivity ${file} --outputs crust_km,f_max`;
  }
  return summarizeResults(file);
}

export function registerSensitivity(program: Command): void {
  program
    .command('sensitivity')
    .description('rank the inputs by their influence on each output of a results file, and write FILE.sensitivity.arrow')
    .argument('<results>', 'results file written by meltsweep run or merge')
    .option('--outputs <list>', 'comma-separated outputs to analyze (default: all with values)', (v: string) => v.split(',').map((s) => s.trim()).filter(Boolean))
    .option('--resamples <n>', 'bootstrap resamples for saltelli designs (default 500)', (v: string) => parseNumberOption('--resamples', v, 10, 100000, 'resamples'))
    .option('--seed <n>', 'bootstrap seed (default 1)', (v: string) => parseNumberOption('--seed', v, 0, 2 ** 31, ''))
    .option('-o, --output <file>', 'sensitivity table path (default: RESULTS.sensitivity.arrow)')
    .option('--capped <choice>', CAPPED_HELP, parseCappedOption)
    .action(async (results: string, o: { outputs?: string[]; resamples?: number; seed?: number; output?: string; capped?: CappedChoice }) => {
      process.stdout.write(`${await summarizeResults(results, o)}\n`);
    });
}
