/**
 * Sensitivity pictures of one output: first-order (S1) and total (ST) Sobol indices as bars with
 * their confidence intervals, and main-effect curves (the conditional mean of the output along
 * each input). The numbers come from the sensitivity analysis (src/analyze), unchanged.
 */
import type { MainEffectCurve, SensitivityRecord } from '../analyze/types.js';
import type { FieldLabels } from './labels.js';
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

/**
 * Bars of S1 and ST per input for one output, with whiskers for the bootstrap intervals where the
 * design gives them. Returns null when no index has a value.
 */
export function sensitivityBarsSpec(records: readonly SensitivityRecord[], output: string, inputs: readonly string[], options: { readonly labels: FieldLabels; readonly width?: number }): PlotSpec | null {
  const { labels } = options;
  const bars = indexBars(records, output);
  if (bars.length === 0) return null;
  const measures = (['S1', 'ST'] as const).filter((m) => bars.some((b) => b.measure === m));
  const rows = bars.map((b) => ({ ...b, input: labels.heading(b.input), measure: MEASURE_LABELS[b.measure] }));
  const intervals = rows.filter((b) => b.ci_low !== null && b.ci_high !== null);
  const lo = Math.min(0, ...bars.map((b) => Math.min(b.value, b.ci_low ?? b.value)));
  const hi = Math.max(1, ...bars.map((b) => Math.max(b.value, b.ci_high ?? b.value)));
  const y = { field: 'input', type: 'nominal' as const, sort: inputs.map((n) => labels.heading(n)), title: null, axis: { labelFontSize: 11, labelColor: INK, ticks: false, domain: false, labelPadding: 6 } };
  const yOffset = { field: 'measure', type: 'nominal' as const, sort: measures.map((m) => MEASURE_LABELS[m]) };
  const x = { type: 'quantitative' as const, title: 'Sobol index', scale: { domain: [lo, hi], nice: false }, axis: { grid: true, tickCount: 5 } };
  const colour = {
    field: 'measure',
    type: 'nominal' as const,
    title: null,
    scale: { domain: measures.map((m) => MEASURE_LABELS[m]), range: measures.map((m) => MEASURE_COLOURS[m]) },
    legend: { orient: 'bottom' as const, direction: 'horizontal' as const, symbolType: 'square' },
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
  const spec = {
    $schema: 'https://vega.github.io/schema/vega-lite/v6.json',
    title: { text: `Sobol indices of the ${labels.label(output)}`, subtitle: intervals.length > 0 ? 'bars: index; whiskers: bootstrap interval' : 'no intervals for this design' },
    width: options.width ?? 280,
    height: inputs.length * (12 * measures.length + 14),
    layer: layers,
  };
  return spec as unknown as PlotSpec;
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
  const panels = mine.map((c, k) => {
    const points = c.x.map((x, i) => ({ x, mean: c.mean[i], count: c.count[i] })).filter((q) => Number.isFinite(q.mean) && Number.isFinite(q.x));
    const log = logInputs.has(c.input) && points.every((q) => q.x > 0);
    const enc = {
      x: { field: 'x', type: 'quantitative' as const, title: labels.axisTitle(c.input), scale: { type: log ? ('log' as const) : ('linear' as const), zero: false, nice: true }, axis: { tickCount: 4, grid: false, labelOverlap: 'greedy' as const, labelFlush: true } },
      y: { field: 'mean', type: 'quantitative' as const, title: k === 0 ? yTitle : null, scale: { zero: false }, axis: { tickCount: 5, grid: true, labels: k === 0 } },
    };
    return {
      width: options.panelWidth ?? 140,
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
