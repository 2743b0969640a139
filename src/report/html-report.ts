/**
 * The self-contained HTML report of a results file: run metadata, a heat map per output over two
 * swept inputs, main-effect curves and Sobol index bars per output, and a column diagram of
 * representative scenarios. Every picture is an inline SVG rendered in Node; the page needs no
 * network access and runs no script.
 */
import fs from 'node:fs';
import path from 'node:path';
import type { SensitivityReport } from '../analyze/types.js';
import { InputError } from '../errors.js';
import { writeFileAtomic } from '../io/ipc-file.js';
import { defaultModel } from '../physics/column.js';
import type { ModelOptions } from '../physics/types.js';
import { DEFAULT_PROCESS, processNamed } from '../process/registry.js';
import type { DecompressionModelSpec } from '../spec/validate-model.js';
import { analyzeResultsFile } from '../io/sensitivity-file.js';
import { cappedNote } from '../io/capped-rows.js';
import { columnDiagramLayout } from './column-diagram.js';
import { columnDiagramData, scenarioLabels, type DiagramScenario } from './column-diagram-data.js';
import { htmlFigure, htmlPage, escapeHtml } from './html.js';
import { labelsOfProcess, type FieldLabels } from './labels.js';

/** Words for the representative picks in legends. */
const WHICH: Readonly<Record<string, string>> = { min: 'smallest', median: 'median', max: 'largest' };
import { renderSvg, type PlotSpec } from './render.js';
import { resolveReportOptions, type ReportOptions } from './report-options.js';
import { metadataSection } from './report-metadata.js';
import { readResultsColumns, readResultsInfo, type ResultsColumns } from './results-columns.js';
import { mainEffectsSpec, sensitivityBarsLayout } from './sensitivity-bars.js';
import { binnedMap, gridSliceMap, mapSubtitle } from './sweep-map.js';
import { mapFigureLayout } from './map-figure.js';
import { renderFigure, type FigureLayout } from './figure.js';
import type { ReportFigure } from './report-figures.js';

/** Kinds of picture in a report, as in each figure's data-plot attribute. */
export type ReportPlotKind = 'map' | 'main-effects' | 'indices' | 'column';

/** A built report. */
export interface HtmlReport {
  readonly html: string;
  /** the pictures, in page order */
  readonly plots: readonly { readonly kind: ReportPlotKind; readonly output: string | null }[];
  /** what was left out or approximated, in plain words (also shown on the page) */
  readonly notes: readonly string[];
  /** warnings of the plotting libraries (none expected) */
  readonly warnings: readonly string[];
  /** the pictures with their SVG and layout, for `report --figures` */
  readonly figures: readonly ReportFigure[];
}

/** Representative scenarios: the ok rows with the smallest, median and largest value of `output`. */
export function representativeRows(table: ResultsColumns, output: string): { readonly which: string; readonly row: number }[] {
  const col = table.outputs[output];
  const ok: number[] = [];
  for (let r = 0; r < table.rows; r++) if (table.status[r] === 0 && Number.isFinite(col[r])) ok.push(r);
  if (ok.length === 0) return [];
  ok.sort((a, b) => col[a] - col[b] || a - b);
  const picks = [
    { which: 'min', row: ok[0] },
    { which: 'median', row: ok[Math.floor((ok.length - 1) / 2)] },
    { which: 'max', row: ok[ok.length - 1] },
  ];
  return picks.filter((p, i) => picks.findIndex((q) => q.row === p.row) === i);
}

/** The model a sweep's rows were computed with (parameters as stored in the file). */
function sweepModel(model: DecompressionModelSpec, params: ModelOptions['params']): ModelOptions {
  const accuracy = model.step_gpa !== undefined ? { stepGpa: model.step_gpa } : model.tolerance !== undefined ? { tolerance: model.tolerance } : {};
  return defaultModel({ thermal: model.thermal, water: model.water, ...accuracy, params, deepOnset: model.deep_onset ?? 'drop' });
}

/**
 * Build the report of a results file (a whole sweep; for a shard the sensitivity section is left out).
 * @throws InputError for a missing or foreign file and for bad options (see resolveReportOptions)
 */
export async function buildHtmlReport(file: string, options: ReportOptions = {}): Promise<HtmlReport> {
  const info = await readResultsInfo(file);
  const { meta, spec } = info;
  const opts = resolveReportOptions(options, spec, info.outputsWithValues, file);
  // every word of the page about a field is that of the table's own process
  const labels = labelsOfProcess(meta.process, spec.model);
  const capped = options.capped ?? 'include';
  const table = await readResultsColumns(file, opts.outputs, meta.rowEnd - meta.rowStart, meta.inputs.map((i) => i.name), capped);
  const notes = [...opts.notes];
  const cappedText = cappedNote(table.cappedRows ?? null, capped);
  if (cappedText !== null) notes.push(cappedText);
  const analysisNotes: string[] = [];
  const warnings: string[] = [];
  const plots: { kind: ReportPlotKind; output: string | null }[] = [];
  const figures: ReportFigure[] = [];
  // a figure is a fixed spec, or a layout that `report --figures` can draw again at another width
  const figure = async (kind: ReportPlotKind, output: string | null, plot: PlotSpec | FigureLayout, caption: string): Promise<string> => {
    const idPrefix = `p${figures.length + 1}-`;
    const layout = 'build' in plot ? (plot as FigureLayout) : null;
    const r = layout !== null ? await renderFigure(layout, undefined, idPrefix) : await renderSvg(plot as PlotSpec, { idPrefix });
    warnings.push(...r.warnings);
    plots.push({ kind, output });
    figures.push({ kind, output, svg: r.svg, layout, caption });
    return htmlFigure(kind, r.svg, caption, output === null ? {} : { output });
  };

  // maps
  const maps: string[] = [];
  if (opts.x !== null && opts.y !== null) {
    for (const output of opts.outputs) {
      const map = spec.design.kind === 'grid' ? gridSliceMap(table, spec, output, opts.x, opts.y, opts.at) : binnedMap(table, spec, output, opts.x, opts.y);
      const levels = opts.contours[output];
      const contourText = levels === undefined ? '' : ` Contour lines at ${levels.map((v) => labels.valueWithUnit(output, v)).join(', ')}.`;
      const caption = `${labels.heading(output)} (${output}) over the ${labels.label(opts.x)} and the ${labels.label(opts.y)}: ${mapSubtitle(map)}. Grey cells with a stroke: no value.${contourText}`;
      maps.push(await figure('map', output, mapFigureLayout(map, { contours: levels }), caption));
    }
  }

  // sensitivity
  const sens: string[] = [];
  let report: SensitivityReport | null = null;
  if (meta.rowStart !== 0 || meta.rowEnd !== meta.pointCount) {
    notes.push(`this file is shard ${meta.shard} (rows ${meta.rowStart}-${meta.rowEnd} of ${meta.pointCount}): sensitivity needs the whole sweep, merge the shards first`);
  } else if (opts.outputs.length > 0 && spec.axes.length > 0) {
    report = await analyzeResultsFile(file, { outputs: opts.outputs, resamples: options.resamples, seed: options.seed, capped });
    analysisNotes.push(...report.warnings, ...report.notes.filter((n) => n !== cappedText));
    const logInputs = new Set<string>(spec.axes.filter((a) => a.scale === 'log').map((a) => a.name));
    for (const output of opts.outputs) {
      const bars = sensitivityBarsLayout(report.records, output, report.inputs, labels);
      const curves = mainEffectsSpec(report.mainEffects, output, { labels, logInputs });
      const pair: string[] = [];
      const hasTotal = report.records.some((r) => r.output === output && r.measure === 'ST' && r.value !== null);
      const what = hasTotal ? 'First-order (S1) and total (ST) Sobol indices' : 'First-order Sobol indices (S1; total indices need a saltelli design or a grid)';
      if (bars !== null) pair.push(await figure('indices', output, bars, `${what} of the ${labels.label(output)} (${output}), ${report.design} design.`));
      if (curves !== null) pair.push(await figure('main-effects', output, curves, `Mean of the ${labels.label(output)} (${output}) along each swept input.`));
      if (pair.length > 0) sens.push(`${outputHeading(labels, output)}\n<div class="plots pair">\n${pair.join('\n')}\n</div>`);
    }
  }

  // representative columns
  const columns: string[] = [];
  const repOutput = opts.outputs.includes('crust_km') ? 'crust_km' : opts.outputs[0];
  // the column diagram draws decompression columns; other processes bring their own pictures
  if (repOutput !== undefined && meta.process === DEFAULT_PROCESS) {
    const picks = representativeRows(table, repOutput);
    if (picks.length > 0) {
      const scenarios = picks.map((p) => ({
        tp_c: table.inputs.tp_c[p.row],
        water_ppm: table.inputs.water_ppm[p.row],
        lid_km: table.inputs.lid_km[p.row],
        upwelling_mm_yr: table.inputs.upwelling_mm_yr[p.row],
      }));
      const auto = scenarioLabels(scenarios);
      const items: DiagramScenario[] = picks.map((p, k) => ({
        scenario: scenarios[k],
        label: `${WHICH[p.which]}: ${labels.label(repOutput)} ${labels.valueWithUnit(repOutput, table.outputs[repOutput][p.row])}; ${auto[k]}`,
      }));
      const data = columnDiagramData(items, sweepModel(spec.model as DecompressionModelSpec, meta.params));
      const plot = columnDiagramLayout(data, { title: representativeTitle(labels, repOutput), subtitle: `among the ok rows of ${spec.name}` });
      const wet = data.wetWaters.length > 0 ? ' Near the surface each wet solidus bends back to the dry one: the water the melt can hold falls to zero as pressure goes to zero, so the last kilometres melt as if dry.' : '';
      columns.push(await figure('column', repOutput, plot, `Temperature and melt fraction against depth for the ok rows with the smallest, median and largest ${labels.label(repOutput)} (${repOutput}). The key below the diagram explains the marks.${wet}`));
    } else {
      notes.push(`no ok row has a value of ${repOutput}: no representative columns`);
    }
  } else if (meta.process !== DEFAULT_PROCESS) {
    // another process brings its own picture (ProcessDefinition.diagram), read from the registry
    const proc = processNamed(meta.process);
    const diagram = proc.diagram === undefined ? undefined : await proc.diagram();
    const byOutput = diagram === undefined ? undefined : opts.outputs.includes(diagram.representativeOutput) ? diagram.representativeOutput : opts.outputs[0];
    if (diagram !== undefined && byOutput !== undefined) {
      const picks = representativeRows(table, byOutput);
      if (picks.length > 0) {
        const items = picks.map((p) => ({
          inputs: Object.fromEntries(meta.inputs.map((i) => [i.name, table.inputs[i.name][p.row]])),
          label: `${WHICH[p.which]}: ${labels.label(byOutput)} ${labels.valueWithUnit(byOutput, table.outputs[byOutput][p.row])}`,
        }));
        const fig = diagram.figure(items, proc.resolveModel(spec.model, { withProfile: true }), {
          title: representativeTitle(labels, byOutput),
          subtitle: `among the ok rows of ${spec.name}`,
        });
        notes.push(...fig.notes);
        columns.push(await figure('column', byOutput, fig.layout, `The ${proc.title} for the ok rows with the smallest, median and largest ${labels.label(byOutput)} (${byOutput}). The key below the diagram explains the marks.`));
      } else {
        notes.push(`no ok row has a value of ${byOutput}: no representative columns`);
      }
    }
  }

  const title = options.title ?? `meltsweep report: ${spec.name}`;
  const section = (heading: string, content: string): string => `<section class="card">\n<h2>${escapeHtml(heading)}</h2>\n${content}\n</section>`;
  const body = [
    `<header class="top"><h1>${escapeHtml(title)}</h1><p class="meta">${escapeHtml(path.basename(file))} · meltsweep ${escapeHtml(meta.toolVersion)} · sweep ${escapeHtml(meta.sweepHash.slice(0, 12))}</p></header>`,
    section('Run', metadataSection(meta, spec, table, labels)),
    maps.length > 0 && opts.x !== null && opts.y !== null ? section(`Maps over the ${labels.label(opts.x)} and the ${labels.label(opts.y)}`, `<div class="plots">\n${maps.join('\n')}\n</div>`) : '',
    sens.length > 0 ? section('Sensitivity', sens.join('\n')) : '',
    columns.length > 0 ? section('Representative columns', `<div class="plots wide">\n${columns.join('\n')}\n</div>`) : '',
    notes.length + analysisNotes.length > 0 ? section('Notes', notesHtml(notes, analysisNotes)) : '',
    `<footer>Model estimates from a one-dimensional parameterised melting model, not observations. Not a tool for volcanic hazard assessment.</footer>`,
  ].filter(Boolean);
  return { html: htmlPage(title, body.join('\n')), plots, notes: [...notes, ...analysisNotes], warnings, figures };
}

/** "Representative columns by crust thickness: smallest, median, largest". */
function representativeTitle(labels: FieldLabels, output: string): string {
  return `Representative columns by ${labels.label(output)}: smallest, median, largest`;
}

/** The heading of an output's sensitivity pictures: its label, its column name beside it. */
function outputHeading(labels: FieldLabels, output: string): string {
  return `<h3>${escapeHtml(labels.heading(output))} <code>${escapeHtml(output)}</code></h3>`;
}

function notesHtml(notes: readonly string[], analysisNotes: readonly string[]): string {
  const list = (xs: readonly string[]): string => `<ul class="notes">${xs.map((n) => `<li>${escapeHtml(n)}</li>`).join('')}</ul>`;
  const own = notes.length > 0 ? list(notes) : '';
  const analysis = analysisNotes.length > 0 ? `<details><summary>${escapeHtml(`Notes of the sensitivity analysis (${analysisNotes.length})`)}</summary>${list(analysisNotes)}</details>` : '';
  return own + analysis;
}

/**
 * Build the report and write it atomically to outPath.
 * @throws InputError when the output folder does not exist
 */
export async function writeHtmlReport(file: string, outPath: string, options: ReportOptions = {}): Promise<HtmlReport> {
  const dir = path.dirname(path.resolve(outPath));
  if (!fs.existsSync(dir)) throw new InputError(`-o: folder ${dir} does not exist`);
  const report = await buildHtmlReport(file, options);
  writeFileAtomic(outPath, report.html);
  return report;
}
