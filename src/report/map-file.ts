/**
 * One map of a results file as a picture (`meltsweep plot map`): read the file, check the options
 * against its sweep (the same checks and messages as the report), build the map and render it at
 * a width. The CLI writes the file; export formats are src/report/export.ts.
 */
import { InputError } from '../errors.js';
import { resultsOfSpec } from '../process/registry.js';
import { didYouMean } from '../spec/suggest.js';
import { renderFigure } from './figure.js';
import { mapFigureLayout } from './map-figure.js';
import { resolveReportOptions } from './report-options.js';
import { readResultsColumns, readResultsInfo } from './results-columns.js';
import { binnedMap, gridSliceMap, type SweepMapData } from './sweep-map.js';
import type { RenderedSvg } from './render.js';

/** What `plot map` draws. */
export interface MapFileOptions {
  /** the output coloured in the cells */
  readonly z: string;
  /** swept inputs on the axes (default: the first two swept inputs) */
  readonly x?: string;
  readonly y?: string;
  /** grid designs: values of the other swept inputs (default: their middle grid values) */
  readonly at?: Readonly<Record<string, number>>;
  /** output values to draw contours of */
  readonly contours?: readonly number[];
  readonly title?: string;
  /** total width of the figure, layout px (default: its natural width) */
  readonly targetWidth?: number;
}

/**
 * Build and render the map of one output of a results file.
 * @throws InputError naming the option, the value and what is allowed (with the nearest name)
 */
export async function renderMapFile(file: string, o: MapFileOptions): Promise<RenderedSvg & { readonly map: SweepMapData; readonly notes: readonly string[] }> {
  const info = await readResultsInfo(file);
  const { spec, meta } = info;
  const results = resultsOfSpec(spec).map((r) => r.name);
  if (!results.includes(o.z)) throw new InputError(`--z: ${JSON.stringify(o.z)} is not an output column of this table; ${didYouMean(o.z, results)}outputs: ${results.join(', ')}`);
  if (!info.outputsWithValues.includes(o.z)) throw new InputError(`--z: ${o.z} holds no values in ${file}; outputs with values: ${info.outputsWithValues.join(', ') || 'none'}`);
  const opts = resolveReportOptions({ outputs: [o.z], x: o.x, y: o.y, at: o.at }, spec, info.outputsWithValues, file);
  if (opts.x === null || opts.y === null) {
    throw new InputError(`RESULTS: a map needs two swept inputs; ${file} sweeps ${spec.axes.map((a) => a.name).join(', ') || 'none'}`);
  }
  const table = await readResultsColumns(file, [o.z], meta.rowEnd - meta.rowStart, meta.inputs.map((i) => i.name));
  const map = spec.design.kind === 'grid' ? gridSliceMap(table, spec, o.z, opts.x, opts.y, opts.at) : binnedMap(table, spec, o.z, opts.x, opts.y);
  const r = await renderFigure(mapFigureLayout(map, { contours: o.contours, title: o.title }), o.targetWidth);
  return { svg: r.svg, warnings: r.warnings, map, notes: opts.notes };
}
