/**
 * The pictures of a fit, as Vega-Lite specs: prior against posterior for one input, the matrix of
 * two-input posterior densities, and an observation against the prior and posterior predictive of
 * its output. Masses come from the fit unchanged; a density is mass per unit of the axis (per unit
 * of ln x on log axes, drawn on a log scale, so that equal areas hold equal mass).
 */
import type { FitHistogram, FitPairDensity, FitSummary } from '../fit/types.js';
import type { PlotSpec } from './render.js';
import { CATEGORICAL, HEATMAP_SCHEME, INK } from './theme.js';
import { formatFitNumber as fmt } from '../fit/format.js';

const POSTERIOR = CATEGORICAL[0];
const OBSERVED = CATEGORICAL[1];
const PRIOR = '#6f7883';
const SCHEMA = 'https://vega.github.io/schema/vega-lite/v6.json';

/** "name (unit)". */
export function titleWithUnit(name: string, unit: string): string {
  return unit === '' ? name : `${name} (${unit})`;
}

interface Bar {
  readonly x0: number;
  readonly x1: number;
  readonly density: number;
  readonly which: string;
}

function width(a: number, b: number, log: boolean): number {
  return log ? Math.log(b / a) : b - a;
}

/** Prior and posterior densities on the cells of a histogram. */
function bars(h: FitHistogram, log: boolean): Bar[] {
  const out: Bar[] = [];
  for (let i = 0; i + 1 < h.edges.length; i++) {
    const w = width(h.edges[i], h.edges[i + 1], log);
    if (!(w > 0)) continue;
    out.push({ x0: h.edges[i], x1: h.edges[i + 1], density: h.prior[i] / w, which: 'prior' });
    out.push({ x0: h.edges[i], x1: h.edges[i + 1], density: h.posterior[i] / w, which: 'posterior' });
  }
  return out;
}

/** The posterior as filled cells, the prior as an outline on top (both stay visible). */
function densityLayers(name: string, h: FitHistogram, log: boolean, yTitle: string, x: Record<string, unknown>): Record<string, unknown>[] {
  const all = bars(h, log);
  const y = { field: 'density', type: 'quantitative', title: yTitle, axis: { tickCount: 4, grid: true, format: '.2~g' } };
  return [
    {
      name: `${name}_posterior`,
      data: { values: all.filter((b) => b.which === 'posterior') },
      mark: { type: 'rect', opacity: 0.85, stroke: null },
      encoding: { x, x2: { field: 'x1' }, y, y2: { datum: 0 }, color: colour },
    },
    {
      name: `${name}_prior`,
      data: { values: all.filter((b) => b.which === 'prior') },
      mark: { type: 'rect', filled: false, strokeWidth: 1.1, opacity: 0.9 },
      encoding: { x, x2: { field: 'x1' }, y, y2: { datum: 0 }, color: colour },
    },
  ];
}

const colour = {
  field: 'which',
  type: 'nominal' as const,
  title: null,
  scale: { domain: ['prior', 'posterior'], range: [PRIOR, POSTERIOR] },
  legend: { orient: 'top' as const, direction: 'horizontal' as const, symbolType: 'square' },
};

/**
 * Prior against posterior for one swept input: both as densities on the same cells, the
 * posterior's 16-84 % band shaded and its median as a line.
 */
export function marginalSpec(h: FitHistogram, summary: FitSummary, unit: string, log: boolean): PlotSpec {
  const x = { field: 'x0', type: 'quantitative' as const, title: titleWithUnit(h.name, unit), scale: { type: log ? ('log' as const) : ('linear' as const), domain: [h.edges[0], h.edges[h.edges.length - 1]], nice: false, zero: false } };
  const spec = {
    $schema: SCHEMA,
    title: { text: h.name, subtitle: `median ${fmt(summary.p50)}, 68 % in ${fmt(summary.p16)}-${fmt(summary.p84)}${unit ? ` ${unit}` : ''}` },
    width: 300,
    height: 160,
    layer: [
      {
        data: { values: [{ a: summary.p16, b: summary.p84 }] },
        mark: { type: 'rect', color: POSTERIOR, opacity: 0.1 },
        encoding: { x: { ...x, field: 'a' }, x2: { field: 'b' } },
      },
      ...densityLayers('marginal', h, log, log ? 'density per ln unit' : 'density', x),
      {
        data: { values: [{ m: summary.p50 }] },
        mark: { type: 'rule', color: INK, strokeWidth: 1.4, strokeDash: [4, 3] },
        encoding: { x: { ...x, field: 'm' } },
      },
    ],
  };
  return spec as unknown as PlotSpec;
}


/**
 * The matrix of two-input posterior densities: the row of input j holds one panel per earlier
 * input i (x = input i, y = input j), a lower triangle. The best-fitting row is marked with a cross.
 */
export function pairMatrixSpec(
  names: readonly string[],
  pairs: readonly FitPairDensity[],
  units: Readonly<Record<string, string>>,
  logInputs: ReadonlySet<string>,
  best: Readonly<Record<string, number>>,
): PlotSpec | null {
  if (names.length < 2) return null;
  const panel = (p: FitPairDensity, showY: boolean) => {
    const xl = logInputs.has(p.x);
    const yl = logInputs.has(p.y);
    const nx = p.xEdges.length - 1;
    const cells: { x0: number; x1: number; y0: number; y1: number; density: number }[] = [];
    let peak = 0;
    for (let j = 0; j + 1 < p.yEdges.length; j++) {
      for (let i = 0; i < nx; i++) {
        const area = width(p.xEdges[i], p.xEdges[i + 1], xl) * width(p.yEdges[j], p.yEdges[j + 1], yl);
        const d = area > 0 ? p.mass[j * nx + i] / area : 0;
        if (d > peak) peak = d;
        cells.push({ x0: p.xEdges[i], x1: p.xEdges[i + 1], y0: p.yEdges[j], y1: p.yEdges[j + 1], density: d });
      }
    }
    // relative density: 1 at the peak, so every panel reads on one colour scale
    const values = cells.map((c) => ({ ...c, relative: peak > 0 ? c.density / peak : 0 }));
    const x = { field: 'x0', type: 'quantitative' as const, title: titleWithUnit(p.x, units[p.x] ?? ''), scale: { type: xl ? ('log' as const) : ('linear' as const), domain: [p.xEdges[0], p.xEdges[nx]], nice: false, zero: false }, axis: { tickCount: 4, labelOverlap: 'greedy' as const, grid: false } };
    const y = { field: 'y0', type: 'quantitative' as const, title: showY ? titleWithUnit(p.y, units[p.y] ?? '') : titleWithUnit(p.y, ''), scale: { type: yl ? ('log' as const) : ('linear' as const), domain: [p.yEdges[0], p.yEdges[p.yEdges.length - 1]], nice: false, zero: false }, axis: { tickCount: 4, grid: false } };
    return {
      width: 170,
      height: 150,
      layer: [
        {
          name: `pair_${p.x}_${p.y}`,
          data: { values },
          mark: { type: 'rect', stroke: null },
          encoding: {
            x,
            x2: { field: 'x1' },
            y,
            y2: { field: 'y1' },
            color: { field: 'relative', type: 'quantitative', title: 'posterior density (relative to its peak)', scale: { scheme: HEATMAP_SCHEME, domain: [0, 1] }, legend: { orient: 'bottom', gradientLength: 220, titleLimit: 320 } },
          },
        },
        {
          data: { values: [{ bx: best[p.x], by: best[p.y] }] },
          mark: { type: 'point', shape: 'cross', size: 90, filled: true, color: '#ffffff', stroke: INK, strokeWidth: 0.8 },
          encoding: { x: { ...x, field: 'bx' }, y: { ...y, field: 'by' } },
        },
      ],
    };
  };
  const rows = names.slice(1).map((yName, j) => ({
    hconcat: names.slice(0, j + 1).map((xName, i) => {
      const p = pairs.find((q) => q.x === xName && q.y === yName);
      if (p === undefined) throw new Error(`report: no pair density for ${xName} and ${yName}`);
      return panel(p, i === 0);
    }),
  }));
  const spec = {
    $schema: SCHEMA,
    title: { text: 'Posterior over pairs of inputs', subtitle: 'density relative to each panel’s peak; cross: best-fitting row' },
    vconcat: rows,
    spacing: 16,
    resolve: { scale: { color: 'shared' as const } },
  };
  return spec as unknown as PlotSpec;
}

/**
 * One output: its prior predictive (every used row, equal weights) and posterior predictive as
 * densities, with the observation and its 1 and 2 sd bands when the output was observed.
 */
export function predictiveSpec(h: FitHistogram, unit: string, observed: { readonly value: number; readonly totalSd: number } | null, summary: FitSummary): PlotSpec {
  const x = { field: 'x0', type: 'quantitative' as const, title: titleWithUnit(h.name, unit), scale: { domain: [h.edges[0], h.edges[h.edges.length - 1]], nice: false, zero: false } };
  const layers: Record<string, unknown>[] = [];
  if (observed !== null) {
    layers.push({
      data: { values: [{ a: observed.value - 2 * observed.totalSd, b: observed.value + 2 * observed.totalSd, k: 2 }, { a: observed.value - observed.totalSd, b: observed.value + observed.totalSd, k: 1 }] },
      mark: { type: 'rect', color: OBSERVED, opacity: 0.09 },
      encoding: { x: { ...x, field: 'a' }, x2: { field: 'b' } },
    });
  }
  layers.push(...densityLayers('predictive', h, false, 'density', x));
  if (observed !== null) {
    layers.push({
      name: 'observed_value',
      data: { values: [{ v: observed.value }] },
      mark: { type: 'rule', color: OBSERVED, strokeWidth: 2 },
      encoding: { x: { ...x, field: 'v' } },
    });
  }
  const subtitle =
    observed !== null
      ? `observed ${fmt(observed.value)} ± ${fmt(observed.totalSd)} (line, 1 and 2 sd bands); posterior predictive median ${fmt(summary.p50)}`
      : `posterior predictive median ${fmt(summary.p50)}, 95 % in ${fmt(summary.p2_5)}-${fmt(summary.p97_5)}`;
  const spec = { $schema: SCHEMA, title: { text: h.name, subtitle }, width: 300, height: 160, layer: layers };
  return spec as unknown as PlotSpec;
}
