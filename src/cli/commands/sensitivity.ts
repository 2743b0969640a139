import type { Command } from 'commander';
import fs from 'node:fs';
import path from 'node:path';
import { InputError } from '../../errors.js';
import { readIpcSchema } from '../../io/ipc-file.js';
import { checkOutputFile } from '../figure-output.js';
import { formatSensitivitySummary } from '../../analyze/index.js';
import { readResultsMeta } from '../../io/arrow-schema.js';
import { readTableSchema } from '../../io/table-reader.js';
import { analyzeResultsFile, AUTO_SUMMARY_MAX_ROWS, sensitivityPathFor, writeSensitivityTable } from '../../io/sensitivity-file.js';
import { CAPPED_HELP, parseCappedOption, type CappedChoice } from '../../io/capped-rows.js';
import { parseNumberOption } from '../options.js';

/**
 * Whether `out` may be written without --force: it does not exist, or it is the sensitivity table
 * meltsweep wrote earlier for this same results file (same source and sweep hash).
 */
async function replaceableSensitivityTable(out: string, file: string, sweepHash: string): Promise<boolean> {
  if (fs.lstatSync(out, { throwIfNoEntry: false }) === undefined) return true;
  try {
    const md = (await readIpcSchema(out)).metadata;
    const source = md.get('meltsweep.source');
    return source !== undefined && path.resolve(source) === path.resolve(file) && md.get('meltsweep.sweep_hash') === sweepHash;
  } catch {
    return false;
  }
}

/** Analyze a results file, write its sensitivity table, and return the printed summary. */
async function summarizeResults(
  file: string,
  o: { outputs?: string[]; resamples?: number; seed?: number; output?: string; capped?: CappedChoice; force?: boolean } = {},
): Promise<string> {
  const meta = readResultsMeta(await readTableSchema(file), file);
  const out = o.output ?? sensitivityPathFor(file);
  if (o.force !== true) {
    checkOutputFile('-o', out, true); // folder exists, not a folder itself
    if (!(await replaceableSensitivityTable(out, file, meta.sweepHash))) {
      throw new InputError(`-o: ${out} already exists and is not the sensitivity table of ${file}; give --force to replace it, or -o another name`);
    }
  } else {
    checkOutputFile('-o', out, true);
  }
  const report = await analyzeResultsFile(file, o);
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
  const out = sensitivityPathFor(file);
  if (!(await replaceableSensitivityTable(out, file, meta.sweepHash))) {
    return `sensitivity: not computed, ${out} exists and is not this run's (it is never replaced without --force); run meltsweep sensitivity ${file} --force`;
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
    .option('--force', "replace an existing file at the sensitivity table's path (the table of this same results file is replaced without it)")
    .action(async (results: string, o: { outputs?: string[]; resamples?: number; seed?: number; output?: string; capped?: CappedChoice; force?: boolean }) => {
      process.stdout.write(`${await summarizeResults(results, o)}\n`);
    });
}
