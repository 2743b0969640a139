/**
 * `meltsweep report`: one self-contained HTML file about a results file (run metadata, maps,
 * sensitivity pictures, representative columns). Parse, call, write: the page is src/report.
 */
import type { Command } from 'commander';
import { InputError } from '../../errors.js';
import type { ExportSize } from '../../report/export-options.js';
import { parseAtOption, parseContourOption } from '../../report/report-options.js';
import { CAPPED_HELP, parseCappedOption, type CappedChoice } from '../../io/capped-rows.js';
import { checkOutputFile, figureSize } from '../figure-output.js';
import { parseNumberOption } from '../options.js';

interface ReportCliOptions {
  output?: string;
  outputs?: string;
  x?: string;
  y?: string;
  at?: string;
  resamples?: number;
  seed?: number;
  title?: string;
  contour: string[];
  figures?: string;
  width?: string;
  dpi?: string;
  force?: boolean;
  capped?: CappedChoice;
}

/** The export size of `report --figures`. @throws InputError for --width/--dpi without --figures */
function figuresSize(o: ReportCliOptions): ExportSize {
  const problems: string[] = [];
  if (o.figures === undefined) {
    for (const [flag, v] of [['--width', o.width], ['--dpi', o.dpi]] as const) if (v !== undefined) problems.push(`${flag}: applies to the files of --figures DIR; give --figures too`);
    if (problems.length > 0) throw new InputError(problems);
    return {};
  }
  const size = figureSize(o, problems);
  if (problems.length > 0) throw new InputError(problems);
  return size;
}

/** `r7.arrow` -> `r7.report.html`. */
export function reportPathFor(resultsPath: string): string {
  return `${resultsPath.replace(/\.arrow$/i, '')}.report.html`;
}

/** Register `meltsweep report`. */
export function registerReport(program: Command): void {
  program
    .command('report')
    .description('write a self-contained HTML report of a results file: run metadata, maps over two inputs, sensitivity bars and curves, representative columns')
    .argument('<results>', 'results file written by meltsweep run or merge')
    .option('-o, --output <file.html>', 'the HTML file to write (default: RESULTS.report.html)')
    .option('--outputs <list>', 'comma-separated outputs to draw (default: crust_km, f_max, onset_depth_km, h2o_melt_wt_pct, melt_flux_kg_m2_yr where they hold values)')
    .option('--x <input>', 'swept input on the horizontal axis of the maps (default: the first swept input)')
    .option('--y <input>', 'swept input on the vertical axis of the maps (default: the next swept input)')
    .option('--at <name=value,...>', 'grid designs: values of the other swept inputs for the map slices (default: the middle grid value; snapped to the nearest grid value)')
    .option('--resamples <n>', 'bootstrap resamples for saltelli designs (default 500)', (v: string) => parseNumberOption('--resamples', v, 10, 100000, 'resamples'))
    .option('--seed <n>', 'bootstrap seed (default 1)', (v: string) => parseNumberOption('--seed', v, 0, 2 ** 31, ''))
    .option('--title <text>', 'page title (default: "meltsweep report: <sweep name>")')
    .option('--contour <output=values>', 'contour lines on the map of an output, e.g. crust_km=7 or crust_km=7,9 (repeatable)', (v: string, prev: string[]) => [...prev, v], [] as string[])
    .option('--figures <dir>', 'also write every figure of the report into DIR as SVG, PNG and PDF files (NN-KIND-OUTPUT.svg|png|pdf)')
    .option('--width <width>', '--figures: figure width, physical (85mm, 17.8cm, 3.35in; maps and column diagrams are laid out to it) or PNG pixels (1200px)')
    .option('--dpi <n>', '--figures: PNG resolution in dots per inch (default 300)')
    .option('--force', 'replace an existing report file and, with --figures, existing figure files')
    .option('--capped <choice>', CAPPED_HELP, parseCappedOption)
    .action(async (results: string, o: ReportCliOptions) => {
      const out = o.output ?? reportPathFor(results);
      if (!/\.html?$/i.test(out)) throw new InputError(`-o: ${JSON.stringify(out)} is not allowed; the report is an HTML file: give a name ending in .html`);
      const size = figuresSize(o);
      const contours = parseContourOption(o.contour);
      if (o.figures !== undefined) {
        const { checkFiguresDir } = await import('../../report/report-figures.js');
        checkFiguresDir(o.figures, o.force);
      }
      checkOutputFile('-o', out, o.force);
      // the plotting libraries load only when a report is written (they add ~0.3 s to start-up)
      const { writeHtmlReport } = await import('../../report/html-report.js');
      const report = await writeHtmlReport(results, out, {
        outputs: o.outputs === undefined ? undefined : o.outputs.split(',').map((s) => s.trim()).filter(Boolean),
        x: o.x,
        y: o.y,
        at: o.at === undefined ? undefined : parseAtOption(o.at),
        resamples: o.resamples,
        seed: o.seed,
        title: o.title,
        contours,
        capped: o.capped,
      });
      process.stdout.write(`report: ${out} (${report.plots.length} pictures)\n`);
      if (o.figures !== undefined) {
        const { writeReportFigures } = await import('../../report/report-figures.js');
        const files = await writeReportFigures(o.figures, report.figures, size, o.force);
        process.stdout.write(`figures: ${files.length} files in ${o.figures} (${report.figures.length} figures as SVG, PNG and PDF)\n`);
      }
    });
}
