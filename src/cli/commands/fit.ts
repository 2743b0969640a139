/**
 * `meltsweep fit`: observations in, a posterior over the swept inputs out (text or JSON), plus
 * RESULTS.fit.arrow, an HTML page and optionally a refined sweep. Parse, call, write: the
 * statistics are in src/fit, the file handling in src/io/fit-file.ts.
 */
import type { Command } from 'commander';
import fs from 'node:fs';
import path from 'node:path';
import { InputError } from '../../errors.js';
import { fitJson, formatFitSummary, observationsFromData, parseDiscrepancyOption, parseObserveOption, type Observation } from '../../fit/index.js';
import { fitPathFor, fitResultsFile } from '../../io/fit-file.js';
import { CAPPED_HELP, parseCappedOption, type CappedChoice } from '../../io/capped-rows.js';
import { checkFitOutput, writeFitTable, writeRefinedSweep } from '../../io/fit-output.js';
import { parseSweepData } from '../../spec/parse.js';

interface FitCliOptions {
  observe: string[];
  observations?: string;
  discrepancy: string[];
  predict?: string;
  output?: string;
  json?: boolean;
  refine?: string;
  force?: boolean;
  capped?: CappedChoice;
}

const collect = (v: string, list: string[]): string[] => [...list, v];

/** Observations from --observations FILE (YAML or JSON) and every --observe, all problems at once. */
function readObservations(o: FitCliOptions): Observation[] {
  const problems: string[] = [];
  const out: Observation[] = [];
  const attempt = (fn: () => void): void => {
    try {
      fn();
    } catch (err) {
      if (err instanceof InputError) problems.push(...err.problems);
      else throw err;
    }
  };
  if (o.observations !== undefined) {
    const file = o.observations;
    attempt(() => {
      if (!fs.existsSync(file) || !fs.statSync(file).isFile()) throw new InputError(`--observations: ${file} does not exist or is not a file`);
      out.push(...observationsFromData(parseSweepData(fs.readFileSync(file, 'utf8'), file), path.basename(file)));
    });
  }
  for (const raw of o.observe) attempt(() => out.push(parseObserveOption(raw)));
  if (problems.length > 0) throw new InputError(problems);
  return out;
}

/** Register `meltsweep fit`. */
export function registerFit(program: Command): void {
  program
    .command('fit')
    .description('fit observed outputs (value +- sd) to a results file: posterior of the swept inputs, RESULTS.fit.arrow and an HTML page')
    .argument('<results>', 'results file written by meltsweep run or merge')
    .option('--observe <name=value+-sd>', 'an observed output with one standard deviation, e.g. crust_km=7.1+-0.8 (repeatable)', collect, [])
    .option('--observations <file>', 'observations from a YAML or JSON file: { crust_km: { value: 7.1, sd: 0.8, discrepancy: 0.5 } }')
    .option('--discrepancy <name=sd>', 'model-discrepancy sd of an observed output, added in quadrature (repeatable)', collect, [])
    .option('--predict <list>', 'comma-separated outputs whose posterior predictive to summarise, e.g. f_max,onset_depth_km')
    .option('-o, --output <file.html>', 'the HTML page to write (default: RESULTS.fit.html)')
    .option('--json', 'print one JSON object instead of the text summary (warnings go to stderr)')
    .option('--capped <choice>', CAPPED_HELP, parseCappedOption)
    .option('--refine <next.yaml>', 'write a sweep file covering the posterior (0.5-99.5 % with a margin), same design, for meltsweep run')
    .option('--force', 'replace existing output files')
    .action(async (results: string, o: FitCliOptions) => {
      const observations = readObservations(o);
      const discrepancies = o.discrepancy.map((d) => parseDiscrepancyOption(d));
      const predict = o.predict === undefined ? [] : o.predict.split(',').map((s) => s.trim()).filter(Boolean);
      if (o.predict !== undefined && predict.length === 0) throw new InputError('--predict: the list is empty; give comma-separated output names, e.g. f_max,onset_depth_km');
      const tablePath = fitPathFor(results);
      const pagePath = o.output ?? fitPathFor(results, '.fit.html');
      if (!/\.html?$/i.test(pagePath)) throw new InputError(`-o: ${JSON.stringify(pagePath)} is not allowed; the page is an HTML file: give a name ending in .html`);
      if (o.refine !== undefined && !/\.(ya?ml|json)$/i.test(o.refine)) throw new InputError(`--refine: ${JSON.stringify(o.refine)} is not allowed; give a sweep file name ending in .yaml, .yml or .json`);
      checkFitOutput('fit table', tablePath, o.force === true);
      checkFitOutput('-o', pagePath, o.force === true);
      if (o.refine !== undefined) checkFitOutput('--refine', o.refine, o.force === true);

      const r = await fitResultsFile(results, { observations, discrepancies, predict, capped: o.capped });
      await writeFitTable(r, tablePath);
      // the plotting libraries load only when a page is written (they add ~0.3 s to start-up)
      const { writeFitPage } = await import('../../report/fit-page.js');
      await writeFitPage(r, pagePath);
      const refined = o.refine === undefined ? null : writeRefinedSweep(r, o.refine);

      if (o.json === true) {
        process.stdout.write(`${JSON.stringify(fitJson(r.fit, predict, r.bestRow), null, 2)}\n`);
        for (const w of r.fit.warnings) process.stderr.write(`warning: ${w.message}\n  next: ${w.nextStep}\n`);
        return;
      }
      const files = [`fit table: ${tablePath}`, `page: ${pagePath}`];
      if (refined !== null && o.refine !== undefined) {
        const ranges = refined.axes.map((a) => `${a.name} ${a.from}-${a.to}`).join(', ');
        files.push(`refined sweep: ${o.refine} (${ranges}); run it with meltsweep run ${o.refine}`);
      }
      process.stdout.write(`${formatFitSummary(r.fit, r.units, path.basename(results))}\n\n${files.join('\n')}\n`);
    });
}
