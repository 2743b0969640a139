/**
 * Sensitivity pictures of one output: first-order (S1) and total (ST) Sobol indices as bars with
 * their confidence intervals, and main-effect curves (the conditional mean of the output along
 * each input). The numbers come from the sensitivity analysis (src/analyze), unchanged.
 */
import type { MainEffectCurve, SensitivityRecord } from '../analyze/types.js';
import { wrappedTitle, type FigureLayout } from './figure.js';
import { textWidthPx, wrapText } from './font.js';
import type { FieldLabels } from './labels.js';
import { linearTicks, logAxisTicks } from './ticks.js';
import type { PlotSpec } from './render.js';
import { INK, MEASURE_COLOURS } from './theme.js';

/** One bar of the index chart. */
export interface IndexBar {
  readonly input: string;
  readonly measure: 'S1' | 'ST';
  readonly value: number;
  readonly ci_low: number | null;
  readonly ci_high: number | null;
}

/** The S1 and ST bars of one output, in input order; measures without a value are left out. */
export function indexBars(records: readonly SensitivityRecord[], output: string): IndexBar[] {
  const bars: IndexBar[] = [];
  for (const r of records) {
    if (r.output !== output || (r.measure !== 'S1' && r.measure !== 'ST') || r.value === null || !Number.isFinite(r.value)) continue;
    bars.push({ input: r.input, measure: r.measure, value: r.value, ci_low: r.ci_low, ci_high: r.ci_high });
  }
  return bars;
}

/** Labels of the two measures in the legend. */
const MEASURE_LABELS = { S1: 'first order (S1)', ST: 'total (ST)' } as const;

/** Font size of the input names beside the bars, px. */
const INPUT_NAME_SIZE = 11;
/** Line height of a wrapped input name, px. */
const INPUT_LINE = 13;
/** Gap between an input name and its bars, px. */
const NAME_GAP = 6;
/** What a bar chart needs besides its names and bars: the theme's padding (10 + 14) and a margin, px. */
const BARS_CHROME = 10 + 14 + NAME_GAP + 4;
/** Natural total width of the bar chart, px (as in the report). */
export const BARS_NATURAL_WIDTH = 430;
/** Least share of the width the bars keep; longer input names wrap. */
const BARS_SHARE = 0.55;

/** How the input names are set at a total width: each name's lines and the column they need, px. */
export function inputNameLines(names: readonly string[], totalWidth: number): { readonly lines: readonly (readonly string[])[]; readonly width: number } {
  const room = Math.max(60, totalWidth * (1 - BARS_SHARE) - BARS_CHROME);
  const lines = names.map((n) => wrapText(n, room, INPUT_NAME_SIZE));
  const width = Math.max(...lines.flat().map((l) => textWidthPx(l, INPUT_NAME_SIZE)));
  return { lines, width };
}

/**
 * Bars of S1 and ST per input for one output, with whiskers for the bootstrap intervals where the
 * design gives them, laid out for a total width (px; default BARS_NATURAL_WIDTH): input names wrap
 * when they would leave the bars less than BARS_SHARE of the width, the title wraps, the x ticks
 * are as many as fit. Returns null when no index has a value.
 */
export function sensitivityBarsSpec(records: readonly SensitivityRecord[], output: string, inputs: readonly string[], options: { readonly labels: FieldLabels; readonly totalWidth?: number }): PlotSpec | null {
  const { labels } = options;
  const bars = indexBars(records, output);
  if (bars.length === 0) return null;
  const total = options.totalWidth ?? BARS_NATURAL_WIDTH;
  const measures = (['S1', 'ST'] as const).filter((m) => bars.some((b) => b.measure === m));
  const rows = bars.map((b) => ({ ...b, measure: MEASURE_LABELS[b.measure] }));
  const intervals = rows.filter((b) => b.ci_low !== null && b.ci_high !== null);
  const lo = Math.min(0, ...bars.map((b) => Math.min(b.value, b.ci_low ?? b.value)));
  const hi = Math.max(1, ...bars.map((b) => Math.max(b.value, b.ci_high ?? b.value)));
  const names = inputNameLines(inputs.map((n) => labels.heading(n)), total);
  const barsWidth = Math.max(60, Math.round(total - names.width - BARS_CHROME));
  const mostLines = Math.max(...names.lines.map((l) => l.length));
  const rowHeight = Math.max(12 * measures.length + 14, mostLines * INPUT_LINE + 8);
  const y = { field: 'input', type: 'nominal' as const, sort: [...inputs], title: null, axis: null };
  const yOffset = { field: 'measure', type: 'nominal' as const, sort: measures.map((m) => MEASURE_LABELS[m]) };
  const x = { type: 'quantitative' as const, title: 'Sobol index', scale: { domain: [lo, hi], nice: false }, axis: { grid: true, values: linearTicks(lo, hi, barsWidth), labelOverlap: false } };
  const colour = {
    field: 'measure',
    type: 'nominal' as const,
    title: null,
    scale: { domain: measures.map((m) => MEASURE_LABELS[m]), range: measures.map((m) => MEASURE_COLOURS[m]) },
    legend: { orient: 'bottom' as const, direction: total < 260 ? ('vertical' as const) : ('horizontal' as const), symbolType: 'square' },
  };
  const layers: Record<string, unknown>[] = [
    {
      name: 'index_bars',
      data: { values: rows },
      mark: { type: 'bar', height: { band: 0.9 } },
      encoding: { y, yOffset, x: { ...x, field: 'value' }, color: colour },
    },
  ];
  if (intervals.length > 0) {
    layers.push({
      name: 'index_intervals',
      data: { values: intervals },
      mark: { type: 'rule', color: INK, strokeWidth: 1.2 },
      encoding: { y, yOffset, x: { ...x, field: 'ci_low' }, x2: { field: 'ci_high' } },
    });
  }
  // the input names: one text layer per line count, each block centred on its row
  const named = inputs.map((n, k) => ({ input: n, lines: [...names.lines[k]] }));
  for (const count of [...new Set(named.map((r) => r.lines.length))]) {
    layers.push({
      name: `input_names_${count}`,
      data: { values: named.filter((r) => r.lines.length === count) },
      mark: { type: 'text', align: 'right', baseline: 'middle', fontSize: INPUT_NAME_SIZE, color: INK, lineHeight: INPUT_LINE, dx: -NAME_GAP, dy: (-(count - 1) * INPUT_LINE) / 2 },
      encoding: { y, x: { value: 0 }, text: { field: 'lines' } },
    });
  }
  const subtitle = intervals.length > 0 ? 'bars: index; whiskers: bootstrap interval' : 'no intervals for this design';
  const spec = {
    $schema: 'https://vega.github.io/schema/vega-lite/v6.json',
    title: wrappedTitle(`Sobol indices of the ${labels.label(output)}`, [subtitle], total - BARS_CHROME),
    width: barsWidth,
    height: inputs.length * rowHeight,
    layer: layers,
  };
  return spec as unknown as PlotSpec;
}

/** The index bars as a figure `report --figures` lays out again at its width (null: no index has a value). */
export function sensitivityBarsLayout(records: readonly SensitivityRecord[], output: string, inputs: readonly string[], labels: FieldLabels): FigureLayout | null {
  if (indexBars(records, output).length === 0) return null;
  return { build: (total) => sensitivityBarsSpec(records, output, inputs, { labels, totalWidth: total }) as PlotSpec, natural: BARS_NATURAL_WIDTH, min: 200 };
}

/** Room left on each side of the data on a main-effect axis (fraction of its span): no point sits on the frame. */
const EFFECT_PAD = 0.05;

/** The x domain of a main-effect panel: the data's extent padded on both sides (in log10 on log axes). */
function paddedDomain(xs: readonly number[], log: boolean): { domain: [number, number] } {
  const t = xs.map((x) => (log ? Math.log10(x) : x));
  let lo = Math.min(...t);
  let hi = Math.max(...t);
  if (!(hi > lo)) [lo, hi] = [lo - 0.5, hi + 0.5];
  const pad = (hi - lo) * EFFECT_PAD;
  const back = (v: number): number => (log ? 10 ** v : v);
  return { domain: [back(lo - pad), back(hi + pad)] };
}

/** Tick values of a main-effect panel: inside the data's extent, as many as fit without touching. */
function effectTicks(xs: readonly number[], log: boolean, panelWidth: number): number[] {
  const [lo, hi] = paddedDomain(xs, log).domain;
  const dataLo = Math.min(...xs);
  const dataHi = Math.max(...xs);
  const share = log ? Math.log10(dataHi / dataLo) / Math.log10(hi / lo) : (dataHi - dataLo) / (hi - lo);
  const width = panelWidth * (Number.isFinite(share) && share > 0 ? share : 1);
  return log ? logAxisTicks(dataLo, dataHi, width) : linearTicks(dataLo, dataHi, width);
}

/**
 * Main-effect curves of one output: one small panel per input (its own x axis with its unit, a
 * shared y axis in the output's unit). Grids: one point per axis value; other designs: bin means.
 * Returns null when no curve has a value.
 */
export function mainEffectsSpec(
  curves: readonly MainEffectCurve[],
  output: string,
  options: { readonly labels: FieldLabels; readonly logInputs?: ReadonlySet<string>; readonly panelWidth?: number; readonly height?: number },
): PlotSpec | null {
  const { labels } = options;
  const logInputs = options.logInputs ?? new Set<string>();
  const mine = curves.filter((c) => c.output === output && c.mean.some((m) => Number.isFinite(m)));
  if (mine.length === 0) return null;
  const yTitle = labels.axisTitle(output);
  const panelWidth = options.panelWidth ?? 140;
  const panels = mine.map((c, k) => {
    const points = c.x.map((x, i) => ({ x, mean: c.mean[i], count: c.count[i] })).filter((q) => Number.isFinite(q.mean) && Number.isFinite(q.x));
    const log = logInputs.has(c.input) && points.every((q) => q.x > 0);
    const enc = {
      x: { field: 'x', type: 'quantitative' as const, title: labels.axisTitle(c.input), scale: { type: log ? ('log' as const) : ('linear' as const), ...paddedDomain(points.map((q) => q.x), log), nice: false }, axis: { values: effectTicks(points.map((q) => q.x), log, panelWidth), grid: false, labelOverlap: false, labelFlush: false } },
      y: { field: 'mean', type: 'quantitative' as const, title: k === 0 ? yTitle : null, scale: { zero: false, padding: 6 }, axis: { tickCount: 5, grid: true, labels: k === 0 } },
    };
    return {
      width: panelWidth,
      height: options.height ?? 140,
      data: { values: points },
      layer: [
        { name: `main_effect_line_${k}`, mark: { type: 'line', color: INK, strokeWidth: 1.8, interpolate: 'monotone' }, encoding: enc },
        { mark: { type: 'point', color: INK, size: c.binned ? 18 : 24, filled: true }, encoding: enc },
      ],
    };
  });
  const spec = {
    $schema: 'https://vega.github.io/schema/vega-lite/v6.json',
    title: { text: `Main effects on the ${labels.label(output)}`, subtitle: `mean along each input${mine[0].binned ? ', in quantile bins' : ', at each grid value'}` },
    hconcat: panels,
    spacing: 14,
    resolve: { scale: { y: 'shared' as const } },
  };
  return spec as unknown as PlotSpec;
}
