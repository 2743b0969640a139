/**
 * `meltsweep plot map RESULTS --z OUTPUT [--x IN --y IN] [--contour 7,9] [--at name=value] -o FILE`:
 * one output over two swept inputs as an SVG, PNG or PDF file, with the same options, checks and
 * size handling as `plot column`.
 */
import type { Command } from 'commander';
import { writeFileAtomic } from '../../io/ipc-file.js';
import { parseAtOption, parseContourValues } from '../../report/report-options.js';
import { addFigureSizeOptions, checkOutputFile, figureOutput } from '../figure-output.js';

interface PlotMapOptions {
  z: string;
  x?: string;
  y?: string;
  contour?: string;
  at?: string;
  title?: string;
  output: string;
  width?: string;
  dpi?: string;
  force?: boolean;
}

/** Register `meltsweep plot map` under `plot`. */
export function registerPlotMap(plot: Command): void {
  const map = plot
    .command('map')
    .description('one output over two swept inputs of a results file, cell by cell (grid slices) or binned (other designs), with contour lines of chosen values')
    .argument('<results>', 'results file written by meltsweep run or merge')
    .requiredOption('--z <output>', 'the output coloured in the cells, e.g. crust_km')
    .option('--x <input>', 'swept input on the horizontal axis (default: the first swept input)')
    .option('--y <input>', 'swept input on the vertical axis (default: the next swept input)')
    .option('--contour <values>', 'comma-separated values of the output to draw contour lines of, e.g. 7,9')
    .option('--at <name=value,...>', 'grid designs: values of the other swept inputs (default: the middle grid value; snapped to the nearest grid value)')
    .option('--title <text>', 'title above the map (default: the output\'s description)')
    .requiredOption('-o, --output <file>', 'the file to write: .svg, .png or .pdf (text as outlines of the bundled font)');
  addFigureSizeOptions(map).action(async (results: string, o: PlotMapOptions) => {
    const { format, size } = figureOutput(o);
    const contours = o.contour === undefined ? undefined : parseContourValues('--contour', o.contour);
    const at = o.at === undefined ? undefined : parseAtOption(o.at);
    checkOutputFile('-o', o.output, o.force);
    // the plotting libraries load only when a picture is drawn
    const [{ renderMapFile }, { exportFigure, layoutWidthFor }] = await Promise.all([import('../../report/map-file.js'), import('../../report/export.js')]);
    const r = await renderMapFile(results, { z: o.z, x: o.x, y: o.y, at, contours, title: o.title, targetWidth: layoutWidthFor(size) });
    writeFileAtomic(o.output, await exportFigure(r.svg, format, size, o.title ?? `map of ${o.z}`));
    const empty = r.map.cells.filter((c) => c.value === null).length;
    process.stdout.write(`map: ${o.output} (${o.z} over ${r.map.x} and ${r.map.y}, ${r.map.cells.length} cells${empty > 0 ? `, ${empty} without a value` : ''})\n`);
    for (const note of r.notes) process.stderr.write(`note: ${note}\n`);
  });
}
