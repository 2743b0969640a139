/**
 * The picture of a sweep map: one output over two swept inputs, as cells coloured by value.
 * - A grid slice is drawn cell by cell on category axes: one equal cell per grid value with its
 *   tick on the cell's centre, whatever the spacing of the grid (an uneven grid such as water
 *   0, 50, 100, 200, 400 ppm gets five equal rows, each labelled with its value).
 * - Binned samples are drawn on continuous axes over the sampled range (log axes in decades of the
 *   data: the axis starts where the data start, not at a round power of ten).
 * - Values are written in every cell that has one, or in none: when the longest label does not
 *   fit a cell (or there are too many cells) no cell is labelled and the colour bar alone reads them.
 * - Cells without a value (failed rows, or an output that is null there) are grey with a diagonal
 *   stroke, and the key says how many there are.
 * - Contour lines of chosen values (marching squares on the cell centres, map-contours.ts), each
 *   labelled with its value and unit.
 * Internally both axes run in "drawing units": the cell index for grid slices, log10 of the value
 * on log axes, the value itself otherwise; tick labels give the values.
 */
import { contourLevels, type ContourLevel } from './map-contours.js';
import { keyPanel, wrappedTitle, type FigureLayout, type KeyEntry } from './figure.js';
import { textWidthPx } from './font.js';
import { labelsFit } from './ticks.js';
import { formatNumber, labelsOfProcess, UNIT_SPACE } from './labels.js';
import type { PlotSpec } from './render.js';
import { mapSubtitle, type MapCell, type SweepMapData } from './sweep-map.js';
import { HAIRLINE, HEATMAP_SCHEME, INK, NO_VALUE_FILL, PAPER } from './theme.js';

/** Layer names of the marks a map draws along its data (for frame tests). */
export const MAP_MARKS = {
  cells: 'map_cells',
  noValue: 'no_value_cells',
  noValueStroke: 'no_value_stroke',
  values: 'cell_values',
  contourHalo: 'contour_halo',
  contours: 'contour_lines',
  contourLabels: 'contour_labels',
} as const;

/** Most cells that get their value written in them. */
export const MAX_LABELLED_CELLS = 100;
/** Font size of the values written in the cells, px. */
export const CELL_LABEL_SIZE = 9.5;
/** Font size of contour labels, px. */
const CONTOUR_LABEL_SIZE = 10;

/** Options of a map picture. */
export interface MapFigureOptions {
  /** output values to draw contour lines of */
  readonly contours?: readonly number[];
  /** title (default: the output's label, e.g. "Crust thickness") */
  readonly title?: string;
  /** width of the map panel, px (default 300) */
  readonly width?: number;
  /** height of the map panel, px (default: 0.8 x width) */
  readonly height?: number;
}

/** One axis in drawing units. */
interface DrawAxis {
  /** drawing-unit edges and centre of the cell in column (or row) k */
  readonly lo: (k: number) => number;
  readonly hi: (k: number) => number;
  readonly mid: (k: number) => number;
  readonly domain: readonly [number, number];
  /** Vega-Lite axis properties (tick values and labels) */
  readonly axis: Record<string, unknown>;
  /** drawing unit -> value (for contour coordinates in data units) */
  readonly toValue: (u: number) => number;
}

/** A category axis: one cell per grid value, ticks on every cell, labels thinned so they do not touch. */
function categoryAxis(values: readonly number[], cellPx: number, horizontal: boolean): DrawAxis {
  const labels = values.map(formatNumber);
  const room = horizontal ? Math.max(...labels.map((l) => textWidthPx(l, 10.5))) + 8 : 15;
  const every = Math.max(1, Math.ceil(room / Math.max(cellPx, 1e-9)));
  const shown = labels.map((l, k) => (k % every === 0 ? l : ''));
  const n = values.length;
  return {
    lo: (k) => k - 0.5,
    hi: (k) => k + 0.5,
    mid: (k) => k,
    domain: [-0.5, n - 0.5],
    axis: { values: values.map((_, k) => k), labelExpr: `${JSON.stringify(shown)}[round(datum.value)]`, grid: false, labelOverlap: false, labelFlush: false },
    toValue: (u) => {
      const k = Math.max(0, Math.min(n - 1, Math.floor(u)));
      const k1 = Math.min(n - 1, k + 1);
      return k1 === k ? values[k] : values[k] + (u - k) * (values[k1] - values[k]);
    },
  };
}

/** A bin edge as its tick label: the value itself on linear axes (round bin widths), 2 significant digits on log axes. */
function edgeLabel(v: number, log: boolean): string {
  return log ? String(Number(v.toPrecision(2))) : formatNumber(v);
}

/**
 * Ticks of a binned axis, always on bin edges: on linear axes the edges that are multiples of the
 * smallest round step (1, 2, 2.5 or 5 x 10^k, a whole number of bins) whose labels do not touch; on log axes every
 * s-th edge from the first (the axis starts at the data), s the smallest that fits,
 * preferring strides that land on whole decades from the first edge.
 */
export function edgeTicks(edges: readonly number[], log: boolean, lengthPx: number, along: 'x' | 'y'): number[] {
  const t = log ? Math.log10 : (v: number) => v;
  const lo = t(edges[0]);
  const span = t(edges[edges.length - 1]) - lo || 1;
  const px = (v: number): number => ((t(v) - lo) / span) * lengthPx;
  const fits = (ticks: readonly number[]): boolean => labelsFit(ticks.map(px), ticks.map((v) => edgeLabel(v, log)), along);
  const strides = [1, 2, 3, 4, 5, 6, 8, 10, 12, 15, 20, 25, 30, 40, 50, 100];
  if (log) {
    // whole decades from the first edge first (bins per decade d: strides that divide d or are multiples of it)
    const perDecade = edges.length > 1 ? Math.max(1, Math.round(1 / Math.log10(edges[1] / edges[0]))) : 1;
    const divisors = Array.from({ length: perDecade }, (_, k) => k + 1).filter((s) => perDecade % s === 0);
    const aligned = [...divisors, ...[2, 3, 5, 10].map((m) => m * perDecade)];
    for (const s of [...aligned, ...strides.filter((x) => !aligned.includes(x))]) {
      const ticks = edges.filter((_, k) => k % s === 0);
      if (ticks.length < 2 || fits(ticks)) return ticks;
    }
    return [edges[0]];
  }
  const step = edges.length > 1 ? edges[1] - edges[0] : 1;
  // round tick steps (1, 2, 2.5, 5 x 10^k) that are whole numbers of bins, smallest first
  const e0 = Math.floor(Math.log10(step));
  const bigSteps = [0, 1, 2, 3, 4].flatMap((k) => [1, 2, 2.5, 5].map((m) => Number((m * 10 ** (e0 + k)).toPrecision(12)))).filter((v) => v >= step * (1 - 1e-9) && Math.abs(v / step - Math.round(v / step)) < 1e-6);
  for (const big of bigSteps) {
    const ticks = edges.filter((v) => Math.abs(v / big - Math.round(v / big)) < 1e-6);
    if (ticks.length >= 2 && fits(ticks)) return ticks;
  }
  return [edges[0], edges[edges.length - 1]];
}

/** A continuous axis over bin edges (log10 drawing units on log axes), ticks on the edges. */
function continuousAxis(edges: readonly number[], centres: readonly number[], log: boolean, lengthPx: number, along: 'x' | 'y'): DrawAxis {
  const t = log ? Math.log10 : (v: number) => v;
  const lo = edges[0];
  const hi = edges[edges.length - 1];
  const ticks = edgeTicks(edges, log, lengthPx, along);
  const positions = ticks.map(t);
  const labels = ticks.map((v) => edgeLabel(v, log));
  const axis: Record<string, unknown> = { values: positions, labelExpr: `${JSON.stringify(labels)}[indexof(${JSON.stringify(positions)}, datum.value)]`, grid: false, labelOverlap: false, labelFlush: false };
  return {
    lo: (k) => t(edges[k]),
    hi: (k) => t(edges[k + 1]),
    mid: (k) => t(centres[k]),
    domain: [t(lo), t(hi)],
    axis,
    toValue: (u) => (log ? 10 ** u : u),
  };
}

/** Cell edges along one direction from the map's cells (binned maps). */
function edgesOf(cells: readonly MapCell[], n: number, along: 'x' | 'y'): number[] {
  const out = new Array<number>(n + 1);
  for (const c of cells) {
    const k = along === 'x' ? c.i : c.j;
    out[k] = along === 'x' ? c.x0 : c.y0;
    out[k + 1] = along === 'x' ? c.x1 : c.y1;
  }
  return out;
}

function drawAxes(map: SweepMapData, width: number, height: number): { x: DrawAxis; y: DrawAxis } {
  if (map.mode === 'slice') return { x: categoryAxis(map.xValues, width / map.nx, true), y: categoryAxis(map.yValues, height / map.ny, false) };
  return { x: continuousAxis(edgesOf(map.cells, map.nx, 'x'), map.xValues, map.xLog, width, 'x'), y: continuousAxis(edgesOf(map.cells, map.ny, 'y'), map.yValues, map.yLog, height, 'y') };
}

/** The cell value as written in a cell: 3 significant digits, no thousands separator. */
export function cellLabel(value: number): string {
  return String(Number(value.toPrecision(3)));
}

/**
 * Whether every cell with a value gets its value written: all labels fit their cells at
 * CELL_LABEL_SIZE (cells of a map are all the same size on the page), and the map has at most
 * MAX_LABELLED_CELLS cells. Never some: a partly labelled map reads as missing data.
 */
export function labelsFitEveryCell(map: SweepMapData, width: number, height: number): boolean {
  if (map.cells.length > MAX_LABELLED_CELLS) return false;
  const { x, y } = drawAxes(map, width, height);
  const pxX = width / (x.domain[1] - x.domain[0]);
  const pxY = height / (y.domain[1] - y.domain[0]);
  for (const c of map.cells) {
    if (c.value === null) continue;
    const w = (x.hi(c.i) - x.lo(c.i)) * pxX;
    const h = (y.hi(c.j) - y.lo(c.j)) * pxY;
    if (textWidthPx(cellLabel(c.value), CELL_LABEL_SIZE) + 4 > w || CELL_LABEL_SIZE + 3 > h) return false;
  }
  return true;
}

/** The contours of a map in drawing units (nodes at the cell centres). */
function mapContours(map: SweepMapData, x: DrawAxis, y: DrawAxis, levels: readonly number[]): ContourLevel[] {
  const values = new Float64Array(map.nx * map.ny).fill(Number.NaN);
  for (const c of map.cells) if (c.value !== null) values[c.j * map.nx + c.i] = c.value;
  const xs = Array.from({ length: map.nx }, (_, i) => x.mid(i));
  const ys = Array.from({ length: map.ny }, (_, j) => y.mid(j));
  return contourLevels({ nx: map.nx, ny: map.ny, xs, ys, values }, levels);
}

/**
 * Contour lines of a map in data units (x and y in the inputs' units): for tests and tables.
 * Grid slices interpolate linearly between neighbouring grid values.
 */
export function mapContourLines(map: SweepMapData, levels: readonly number[]): { level: number; lines: [number, number][][] }[] {
  const { x, y } = drawAxes(map, 300, 240);
  return mapContours(map, x, y, levels).map((c) => ({ level: c.level, lines: c.lines.map((line) => line.map(([u, v]): [number, number] => [x.toValue(u), y.toValue(v)])) }));
}

/**
 * Where a contour's label goes: on its longest line, at a fraction of the line's length that
 * differs from level to level (1/3 and 2/3 for two levels), so neighbouring contours do not put
 * their labels side by side; kept clear of the frame edges.
 */
function labelPlaces(contours: readonly ContourLevel[], x: DrawAxis, y: DrawAxis, width: number, height: number, text: (level: number) => string): { u: number; v: number; text: string }[] {
  const pxX = width / (x.domain[1] - x.domain[0]);
  const pxY = height / (y.domain[1] - y.domain[0]);
  const step = (a: readonly [number, number], b: readonly [number, number]) => Math.hypot((b[0] - a[0]) * pxX, (b[1] - a[1]) * pxY);
  const out: { u: number; v: number; text: string }[] = [];
  contours.forEach((c, k) => {
    let best: readonly (readonly [number, number])[] | null = null;
    let bestLen = 0;
    for (const line of c.lines) {
      let len = 0;
      for (let q = 1; q < line.length; q++) len += step(line[q - 1], line[q]);
      if (best === null || len > bestLen) [best, bestLen] = [line, len];
    }
    if (best === null) return;
    // the point at this fraction of the line's length
    let target = (bestLen * (k + 1)) / (contours.length + 1);
    let [u, v] = best[0];
    for (let q = 1; q < best.length; q++) {
      const d = step(best[q - 1], best[q]);
      if (d >= target && d > 0) {
        const t = target / d;
        [u, v] = [best[q - 1][0] + t * (best[q][0] - best[q - 1][0]), best[q - 1][1] + t * (best[q][1] - best[q - 1][1])];
        break;
      }
      target -= d;
      [u, v] = best[q];
    }
    const label = text(c.level);
    const halfW = (textWidthPx(label, CONTOUR_LABEL_SIZE) / 2 + 3) / pxX;
    const halfH = (CONTOUR_LABEL_SIZE / 2 + 3) / pxY;
    const clamp = (w: number, lo: number, hi: number) => (lo > hi ? (lo + hi) / 2 : Math.min(hi, Math.max(lo, w)));
    out.push({ u: clamp(u, x.domain[0] + halfW, x.domain[1] - halfW), v: clamp(v, y.domain[0] + halfH, y.domain[1] - halfH), text: label });
  });
  return out;
}

/** The Vega-Lite spec of a map (cells, values or none, contours, colour bar, key). */
export function sweepMapSpec(map: SweepMapData, options: MapFigureOptions = {}): PlotSpec {
  const width = Math.round(options.width ?? 300);
  const height = Math.round(options.height ?? width * 0.8);
  const labels = labelsOfProcess(map.process);
  const info = labels.info(map.output);
  const { x, y } = drawAxes(map, width, height);
  const withValue = map.cells.filter((c) => c.value !== null);
  const without = map.cells.filter((c) => c.value === null);
  const rect = (c: MapCell) => ({ u0: x.lo(c.i), u1: x.hi(c.i), v0: y.lo(c.j), v1: y.hi(c.j), u: x.mid(c.i), v: y.mid(c.j) });
  const values = withValue.map((c) => c.value as number);
  const lo = values.length > 0 ? Math.min(...values) : 0;
  const hi = values.length > 0 ? Math.max(...values) : 1;
  const xScale = { domain: [...x.domain], nice: false, zero: false };
  const yScale = { domain: [...y.domain], nice: false, zero: false };
  const xEnc = { field: 'u0', type: 'quantitative' as const, title: labels.axisTitle(map.x), scale: xScale, axis: x.axis };
  const yEnc = { field: 'v0', type: 'quantitative' as const, title: labels.axisTitle(map.y), scale: yScale, axis: y.axis };
  const at = (u: string, v: string) => ({ x: { field: u, type: 'quantitative' as const, scale: xScale }, y: { field: v, type: 'quantitative' as const, scale: yScale } });
  const layers: Record<string, unknown>[] = [];
  // empty layers are left out: an empty data set gives the scales an infinite extent
  if (without.length > 0) {
    layers.push({
      name: MAP_MARKS.noValue,
      data: { values: without.map(rect) },
      mark: { type: 'rect', fill: NO_VALUE_FILL, stroke: PAPER, strokeWidth: 0.6 },
      encoding: { x: xEnc, x2: { field: 'u1' }, y: yEnc, y2: { field: 'v1' } },
    });
    layers.push({
      name: MAP_MARKS.noValueStroke,
      data: { values: without.map(rect) },
      mark: { type: 'rule', stroke: HAIRLINE, strokeWidth: 0.9 },
      encoding: { ...at('u0', 'v0'), x2: { field: 'u1' }, y2: { field: 'v1' } },
    });
  }
  if (withValue.length > 0) {
    layers.push({
      name: MAP_MARKS.cells,
      data: { values: withValue.map((c) => ({ ...rect(c), value: c.value })) },
      mark: { type: 'rect', stroke: PAPER, strokeWidth: 0.6 },
      encoding: {
        x: xEnc,
        x2: { field: 'u1' },
        y: yEnc,
        y2: { field: 'v1' },
        color: {
          field: 'value',
          type: 'quantitative',
          title: labels.axisTitle(map.output),
          scale: { scheme: HEATMAP_SCHEME, zero: false, nice: false, domain: lo === hi ? [lo - 0.5, hi + 0.5] : [lo, hi] },
          // a colour bar under the map, as wide as the map: the map keeps the width of a journal column
          legend: { orient: 'bottom', direction: 'horizontal', gradientLength: width, gradientThickness: 10, format: '.4~r', titleLimit: width, titlePadding: 4, offset: 10 },
        },
      },
    });
  }
  if (withValue.length > 0 && labelsFitEveryCell(map, width, height)) {
    const mid = (lo + hi) / 2;
    layers.push({
      name: MAP_MARKS.values,
      data: { values: withValue.map((c) => ({ ...rect(c), label: cellLabel(c.value as number), light: (c.value as number) > mid })) },
      mark: { type: 'text', fontSize: CELL_LABEL_SIZE, baseline: 'middle', align: 'center' },
      encoding: { ...at('u', 'v'), text: { field: 'label', type: 'nominal' }, color: { condition: { test: 'datum.light', value: INK }, value: PAPER } },
    });
  }
  const contours = options.contours !== undefined && options.contours.length > 0 ? mapContours(map, x, y, options.contours) : [];
  const segments = contours.flatMap((c) => c.segments.map((s) => ({ u1: s.x1, v1: s.y1, u2: s.x2, v2: s.y2, level: c.level })));
  if (segments.length > 0) {
    const segEnc = { ...at('u1', 'v1'), x2: { field: 'u2' }, y2: { field: 'v2' } };
    layers.push({ name: MAP_MARKS.contourHalo, data: { values: segments }, mark: { type: 'rule', stroke: PAPER, strokeWidth: 3.4, strokeCap: 'round', opacity: 0.85 }, encoding: segEnc });
    layers.push({ name: MAP_MARKS.contours, data: { values: segments }, mark: { type: 'rule', stroke: INK, strokeWidth: 1.5, strokeCap: 'round' }, encoding: segEnc });
    const places = labelPlaces(contours, x, y, width, height, (level) => labels.valueWithUnit(map.output, level));
    const text = { ...at('u', 'v'), text: { field: 'text', type: 'nominal' as const } };
    const textMark = { type: 'text', fontSize: CONTOUR_LABEL_SIZE, fontWeight: 600, baseline: 'middle', align: 'center' };
    layers.push({ data: { values: places }, mark: { ...textMark, stroke: PAPER, strokeWidth: 3.5, strokeJoin: 'round', color: PAPER }, encoding: text });
    layers.push({ name: MAP_MARKS.contourLabels, data: { values: places }, mark: { ...textMark, color: INK }, encoding: text });
  }

  // the key: what the contours and the grey cells are
  const entries: KeyEntry[] = [];
  if (options.contours !== undefined && options.contours.length > 0) {
    const drawn = contours.filter((c) => c.segments.length > 0).map((c) => formatNumber(c.level));
    const missing = contours.filter((c) => c.segments.length === 0).map((c) => formatNumber(c.level));
    const unit = info.displayUnit === '' ? '' : `${UNIT_SPACE}${info.displayUnit}`;
    const text = drawn.length > 0 ? `contour${drawn.length > 1 ? 's' : ''} of ${labels.label(map.output)} at ${drawn.join(', ')}${unit}` : `no contour of ${labels.label(map.output)} in the map`;
    entries.push({ swatch: { kind: 'line', colour: INK, width: 1.5 }, label: missing.length > 0 ? `${text} (${missing.join(', ')}${unit}: outside the values shown)` : text });
  }
  if (without.length > 0) {
    const why = map.mode === 'binned' ? 'no sample with a value falls in these cells' : 'the output is null there (no_melt, failed or not applicable)';
    entries.push({ swatch: { kind: 'bar', colour: '#c9ced4' }, label: `grey with a stroke: no value in ${without.length} of ${map.cells.length} cells; ${why}` });
  }
  const keyWidth = width + 40;
  const key = entries.length > 0 ? keyPanel([{ entries }], keyWidth) : null;
  const main = { width, height, layer: layers };
  const title = wrappedTitle(options.title ?? labels.heading(map.output), [`${map.output}; ${mapSubtitle(map)}`], keyWidth);
  // the key's marks carry their own colours (scale null): its colour scale must not be shared with the map's
  const spec =
    key === null
      ? { $schema: 'https://vega.github.io/schema/vega-lite/v6.json', title, ...main }
      : { $schema: 'https://vega.github.io/schema/vega-lite/v6.json', title, vconcat: [main, key.spec], spacing: 14, resolve: { scale: { x: 'independent', y: 'independent', color: 'independent' } } };
  return spec as unknown as PlotSpec;
}

/** The layout of a map for renderFigure (main panel: the map). */
export function mapFigureLayout(map: SweepMapData, options: MapFigureOptions = {}): FigureLayout {
  return { build: (w) => sweepMapSpec(map, { ...options, width: w, height: options.height ?? Math.round(w * 0.8) }), natural: options.width ?? 300, min: 120 };
}
