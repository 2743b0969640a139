/**
 * Sweep maps: one output over two swept inputs as a heat map.
 * - grid designs: the slice of the grid where every other swept input sits at one of its grid
 *   values (chosen, or the middle value); one cell per grid point, edges half-way between values
 *   (geometric half-way on log axes);
 * - other designs: the samples binned onto a regular 2D grid over the two inputs' ranges, each
 *   cell the mean of the finite values in it (every other input varies inside a cell).
 * The picture of a map is map-figure.ts; its contours are map-contours.ts.
 */
import type { AxisSpec, SweepSpec } from '../spec/types.js';
import { processNameOf } from '../process/registry.js';
import { labelsOfProcess } from './labels.js';
import type { ResultsColumns } from './results-columns.js';

/** One cell of a map: its column and row, its centre, its edges and its value (null: no finite value). */
export interface MapCell {
  /** column (0 = smallest x) and row (0 = smallest y) */
  readonly i: number;
  readonly j: number;
  readonly x: number;
  readonly y: number;
  readonly x0: number;
  readonly x1: number;
  readonly y0: number;
  readonly y1: number;
  readonly value: number | null;
  /** rows behind the value */
  readonly n: number;
}

/** A map ready to draw. */
export interface SweepMapData {
  /** the process of the results (its registry gives the labels and units of the picture) */
  readonly process: string;
  readonly output: string;
  readonly x: string;
  readonly y: string;
  readonly xLog: boolean;
  readonly yLog: boolean;
  /** 'slice': a grid slice at fixed values of the other inputs; 'binned': bin means of samples */
  readonly mode: 'slice' | 'binned';
  /** where the other swept inputs sit (slice mode) */
  readonly at: readonly { readonly name: string; readonly value: number }[];
  /** columns and rows of cells */
  readonly nx: number;
  readonly ny: number;
  /** the x and y of the cell centres (slice: the grid values, ascending; binned: bin centres) */
  readonly xValues: readonly number[];
  readonly yValues: readonly number[];
  /** row-major: cells[j * nx + i] */
  readonly cells: readonly MapCell[];
}

/** Cell edges around sorted centres: half-way between neighbours (geometric on log axes). */
export function cellEdges(sorted: readonly number[], log: boolean): number[] {
  const n = sorted.length;
  const f = log ? Math.log : (v: number) => v;
  const g = log ? Math.exp : (v: number) => v;
  const t = sorted.map(f);
  if (n === 1) {
    const half = log ? Math.log(2) / 2 : Math.max(Math.abs(t[0]) * 0.05, 0.5);
    return [g(t[0] - half), g(t[0] + half)];
  }
  const edges = [g(t[0] - (t[1] - t[0]) / 2)];
  for (let i = 0; i + 1 < n; i++) edges.push(g((t[i] + t[i + 1]) / 2));
  edges.push(g(t[n - 1] + (t[n - 1] - t[n - 2]) / 2));
  return edges;
}

function axisOf(spec: SweepSpec, name: string): AxisSpec {
  const a = spec.axes.find((x) => x.name === name);
  if (a === undefined) throw new Error(`report: ${name} is not a swept input`);
  return a;
}

/** The grid value nearest to v. */
export function nearestValue(values: readonly number[], v: number): number {
  let best = values[0];
  for (const x of values) if (Math.abs(x - v) < Math.abs(best - v)) best = x;
  return best;
}

/** The middle of an axis's sorted grid values (the lower middle for an even count). */
export function middleValue(values: readonly number[]): number {
  const s = [...values].sort((a, b) => a - b);
  return s[Math.floor((s.length - 1) / 2)];
}

function close(a: number, b: number): boolean {
  return Math.abs(a - b) <= 1e-9 * Math.max(1, Math.abs(a), Math.abs(b));
}

/**
 * The slice of a grid sweep over inputs x and y with every other swept input at `at` (values are
 * snapped to the nearest grid value; absent ones default to the middle value).
 */
export function gridSliceMap(table: ResultsColumns, spec: SweepSpec, output: string, x: string, y: string, at: Partial<Record<string, number>> = {}): SweepMapData {
  const ax = axisOf(spec, x);
  const ay = axisOf(spec, y);
  const others = spec.axes.filter((a) => a.name !== x && a.name !== y).map((a) => ({ name: a.name, value: nearestValue(a.values, at[a.name] ?? middleValue(a.values)) }));
  const xs = [...new Set(ax.values)].sort((a, b) => a - b);
  const ys = [...new Set(ay.values)].sort((a, b) => a - b);
  const inSlice = (r: number): boolean => others.every((o) => close(table.inputs[o.name][r], o.value));
  if (xs.length * ys.length > MAX_MAP_CELLS) {
    // too many grid points to draw one cell each: bin the slice instead
    const bins = Math.floor(Math.sqrt(MAX_MAP_CELLS));
    return { ...binnedMap(table, spec, output, x, y, Math.min(bins, Math.max(xs.length, ys.length)), inSlice), at: others };
  }
  const xIndex = new Map(xs.map((v, i) => [v, i]));
  const yIndex = new Map(ys.map((v, i) => [v, i]));
  const xe = cellEdges(xs, ax.scale === 'log');
  const ye = cellEdges(ys, ay.scale === 'log');
  const sum = new Float64Array(xs.length * ys.length);
  const cnt = new Float64Array(xs.length * ys.length);
  const col = table.outputs[output];
  const xin = table.inputs[x];
  const yin = table.inputs[y];
  for (let r = 0; r < table.rows; r++) {
    if (!Number.isFinite(col[r]) || !inSlice(r)) continue;
    // the table holds the grid values themselves (written from the same spec)
    const i = xIndex.get(xin[r]) ?? xs.findIndex((v) => close(v, xin[r]));
    const j = yIndex.get(yin[r]) ?? ys.findIndex((v) => close(v, yin[r]));
    if (i < 0 || j < 0) continue;
    sum[j * xs.length + i] += col[r];
    cnt[j * xs.length + i] += 1;
  }
  const cells: MapCell[] = [];
  ys.forEach((yv, j) =>
    xs.forEach((xv, i) => {
      const k = j * xs.length + i;
      cells.push({ i, j, x: xv, y: yv, x0: xe[i], x1: xe[i + 1], y0: ye[j], y1: ye[j + 1], value: cnt[k] > 0 ? sum[k] / cnt[k] : null, n: cnt[k] });
    }),
  );
  return { process: processNameOf(spec), output, x, y, xLog: ax.scale === 'log', yLog: ay.scale === 'log', mode: 'slice', at: others, nx: xs.length, ny: ys.length, xValues: xs, yValues: ys, cells };
}

/** Bins per axis for n samples: about four samples per cell, 3 to 24 bins. */
export function defaultBins(n: number): number {
  return Math.max(3, Math.min(24, Math.round(Math.sqrt(n / 4))));
}

/** Most cells a map draws one by one; larger grid slices are binned. */
export const MAX_MAP_CELLS = 10_000;

/** Bin widths of linear map axes: 1, 2, 2.5 or 5 x 10^k. */
const NICE_MANTISSAS = [1, 2, 2.5, 5];

/**
 * Bin edges over [min, max] for about `bins` bins.
 * - Linear axes: a round bin width (1, 2, 2.5 or 5 x 10^k, the nearest to (max - min) / bins) with
 *   edges on its multiples, so ticks on the edges read as round numbers (1400, 1450, ...); the
 *   first and last bins may reach a little beyond the range to the next multiple.
 * - Log axes: a whole number of bins per decade, starting at min (a log axis starts at the data),
 *   so every decade from min (5, 50, 500 ppm) is an edge; the last edge is max.
 */
export function binEdges(min: number, max: number, bins: number, log: boolean): number[] {
  if (log && min > 0 && max > min) {
    const decades = Math.log10(max / min);
    const perDecade = Math.max(1, Math.round(bins / decades));
    // the last edge is max itself: the last bin is up to half a bin wider or narrower than the others
    const n = Math.max(1, Math.round(decades * perDecade));
    return Array.from({ length: n + 1 }, (_, k) => (k === n ? max : Number((min * 10 ** (k / perDecade)).toPrecision(12))));
  }
  if (!(max > min)) return Array.from({ length: bins + 1 }, (_, i) => min + i / bins);
  const raw = (max - min) / bins;
  const e = Math.floor(Math.log10(raw));
  const candidates = [e - 1, e, e + 1].flatMap((k) => NICE_MANTISSAS.map((m) => m * 10 ** k));
  const step = candidates.reduce((best, c) => (Math.abs(Math.log(c / raw)) < Math.abs(Math.log(best / raw)) ? c : best));
  const first = Math.floor(min / step + 1e-9);
  const last = Math.ceil(max / step - 1e-9);
  return Array.from({ length: Math.max(1, last - first) + 1 }, (_, k) => Number(((first + k) * step).toPrecision(12)));
}

/** The bin of v among ascending edges (values outside go to the first or last bin). */
function binIndex(edges: readonly number[], v: number): number {
  let lo = 0;
  let hi = edges.length - 2;
  while (lo < hi) {
    const mid = (lo + hi + 1) >> 1;
    if (edges[mid] <= v) lo = mid;
    else hi = mid - 1;
  }
  return lo;
}

/**
 * Samples of a non-grid design binned onto about bins x bins cells over the ranges of x and y
 * (binEdges: round bin widths, or log-spaced on log axes); each cell holds the mean of the finite
 * output values in it. `include` restricts the rows (default: every row).
 */
export function binnedMap(table: ResultsColumns, spec: SweepSpec, output: string, x: string, y: string, bins = defaultBins(table.rows), include: (row: number) => boolean = () => true): SweepMapData {
  const ax = axisOf(spec, x);
  const ay = axisOf(spec, y);
  const xLog = ax.scale === 'log' && ax.min > 0;
  const yLog = ay.scale === 'log' && ay.min > 0;
  const xe = binEdges(ax.min, ax.max, bins, xLog);
  const ye = binEdges(ay.min, ay.max, bins, yLog);
  const nx = xe.length - 1;
  const ny = ye.length - 1;
  const sum = new Float64Array(nx * ny);
  const cnt = new Float64Array(nx * ny);
  const col = table.outputs[output];
  for (let r = 0; r < table.rows; r++) {
    const v = col[r];
    if (!Number.isFinite(v) || !include(r)) continue;
    const k = binIndex(ye, table.inputs[y][r]) * nx + binIndex(xe, table.inputs[x][r]);
    sum[k] += v;
    cnt[k] += 1;
  }
  const cells: MapCell[] = [];
  const mid = (e: readonly number[], i: number, log: boolean) => (log ? Math.sqrt(e[i] * e[i + 1]) : (e[i] + e[i + 1]) / 2);
  for (let j = 0; j < ny; j++) {
    for (let i = 0; i < nx; i++) {
      const k = j * nx + i;
      cells.push({ i, j, x: mid(xe, i, xLog), y: mid(ye, j, yLog), x0: xe[i], x1: xe[i + 1], y0: ye[j], y1: ye[j + 1], value: cnt[k] > 0 ? sum[k] / cnt[k] : null, n: cnt[k] });
    }
  }
  const centres = (e: readonly number[], log: boolean) => Array.from({ length: e.length - 1 }, (_, i) => mid(e, i, log));
  return { process: processNameOf(spec), output, x, y, xLog, yLog, mode: 'binned', at: [], nx, ny, xValues: centres(xe, xLog), yValues: centres(ye, yLog), cells };
}

/** A subtitle saying what the map shows. */
export function mapSubtitle(map: SweepMapData): string {
  const labels = labelsOfProcess(map.process);
  const fixedValueLabel = (name: string, value: number): string => labels.fixedValue(name, value);
  if (map.mode === 'binned' && map.at.length > 0) return `slice at ${map.at.map((a) => fixedValueLabel(a.name, a.value)).join(', ')}; mean of the grid points in each cell`;
  if (map.mode === 'binned') return `mean of the samples in each cell; the other inputs vary within a cell`;
  return map.at.length === 0 ? 'every grid point' : `slice at ${map.at.map((a) => fixedValueLabel(a.name, a.value)).join(', ')}`;
}
