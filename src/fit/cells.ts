/**
 * Cells of a swept input: where each row's weight goes, and how a mass function on cells is read
 * back as a distribution (quantiles).
 *
 * Interpolation convention (used for every quantile the fit reports):
 * - the quantity is measured in t = x (linear axes) or t = ln x (log axes);
 * - grid axes: each grid value owns the cell between the midpoints (in t) to its neighbours; the
 *   outer cells end at the first and last grid value (no mass outside the swept range);
 * - sampled axes (latin-hypercube, sobol, saltelli) and outputs: equal cells in t over the range;
 * - a cell's mass is spread uniformly in t over the cell, so the cumulative distribution is
 *   piecewise linear in t through the cell edges, and the p-quantile is the t where it reaches p
 *   (the first such t where the distribution is flat), mapped back to x.
 */
import type { FitAxis } from './types.js';

/** Equal cells of a sampled axis (fine enough that quantiles are set by the rows, not the cells). */
export const SAMPLED_CELLS = 1024;

/** How a row's value finds its cell. */
export interface Cells {
  readonly log: boolean;
  /** number of cells */
  readonly count: number;
  /** cell edges in t (length count + 1) */
  readonly edgesT: Float64Array;
  /** the cell of value x (clamped to the range); -1 for NaN */
  index(x: number): number;
  /** index() of x[0 .. n) into out (one tight loop) */
  indexAll(x: Float64Array, n: number, out: Int32Array): void;
}

function toT(x: number, log: boolean): number {
  return log ? Math.log(x) : x;
}

/** Map t back to the input's unit. */
export function fromT(t: number, log: boolean): number {
  return log ? Math.exp(t) : t;
}

/** Cells of equal width in t over [lo, hi] (lo < hi), `count` of them. */
export function equalCells(lo: number, hi: number, count: number, log: boolean): Cells {
  const t0 = toT(lo, log);
  const t1 = toT(hi, log);
  const width = (t1 - t0) / count;
  const edgesT = new Float64Array(count + 1);
  for (let i = 0; i <= count; i++) edgesT[i] = t0 + i * width;
  edgesT[count] = t1;
  return uniformCells(log, edgesT, t0, width > 0 ? 1 / width : 0, 0);
}

/**
 * Cells found by one multiplication: cell = floor((t - t0) x inv + shift), clamped to the cells
 * (shift 0: equal cells starting at t0; shift 0.5: the nearest of evenly spaced grid values, as
 * Math.round does).
 */
function uniformCells(log: boolean, edgesT: Float64Array, t0: number, inv: number, shift: number): Cells {
  const last = edgesT.length - 2;
  return {
    log,
    count: last + 1,
    edgesT,
    index(x: number): number {
      if (x !== x) return -1;
      const i = Math.floor(((log ? Math.log(x) : x) - t0) * inv + shift);
      return i < 0 ? 0 : i > last ? last : i;
    },
    indexAll(x: Float64Array, n: number, out: Int32Array): void {
      for (let r = 0; r < n; r++) {
        const v = x[r];
        if (v !== v) {
          out[r] = -1;
          continue;
        }
        const i = Math.floor(((log ? Math.log(v) : v) - t0) * inv + shift);
        out[r] = i < 0 ? 0 : i > last ? last : i;
      }
    },
  };
}

/** Cells of a grid axis: one per distinct value, edges at the midpoints in t. */
export function gridCells(values: readonly number[], log: boolean): Cells {
  const v = [...new Set(values)].sort((a, b) => a - b);
  const t = v.map((x) => toT(x, log));
  const m = v.length;
  const edgesT = new Float64Array(m + 1);
  edgesT[0] = t[0];
  for (let i = 1; i < m; i++) edgesT[i] = 0.5 * (t[i - 1] + t[i]);
  edgesT[m] = t[m - 1];
  const last = m - 1;
  // evenly spaced in t (the usual from/to/count or step axis): the cell is one rounding away
  const step = m > 1 ? (t[last] - t[0]) / last : 0;
  const even = m > 1 && t.every((ti, i) => Math.abs(ti - (t[0] + i * step)) <= 1e-9 * Math.max(1, Math.abs(ti)));
  if (even) return uniformCells(log, edgesT, t[0], 1 / step, 0.5);
  return {
    log,
    count: m,
    edgesT,
    indexAll(x: Float64Array, n: number, out: Int32Array): void {
      for (let r = 0; r < n; r++) out[r] = this.index(x[r]);
    },
    index(x: number): number {
      if (x !== x) return -1;
      // the last edge at or below x, by bisection over the interior edges
      const tx = log ? Math.log(x) : x;
      let lo = 0;
      let hi = last;
      while (lo < hi) {
        const mid = (lo + hi + 1) >> 1;
        if (edgesT[mid] <= tx) lo = mid;
        else hi = mid - 1;
      }
      return lo;
    },
  };
}

/** The cells of a swept input: grid values for grid designs, equal cells for sampled designs. */
export function axisCells(axis: FitAxis, grid: boolean): Cells {
  const log = axis.scale === 'log';
  if (grid || axis.min === axis.max) return gridCells(axis.values.length > 0 ? axis.values : [axis.min], log);
  return equalCells(axis.min, axis.max, SAMPLED_CELLS, log);
}

/**
 * The p-quantile (0 <= p <= 1) of a mass function on cells (see the convention above); `mass`
 * need not be normalised; `total` is its sum. Returns x in the input's unit.
 */
export function cellQuantile(mass: ArrayLike<number>, total: number, edgesT: ArrayLike<number>, log: boolean, p: number): number {
  const n = mass.length;
  const target = p * total;
  let cum = 0;
  for (let i = 0; i < n; i++) {
    const m = mass[i];
    if (m > 0 && cum + m >= target) {
      const frac = Math.min(1, Math.max(0, (target - cum) / m));
      return fromT(edgesT[i] + frac * (edgesT[i + 1] - edgesT[i]), log);
    }
    cum += m;
  }
  // p = 1 with rounding: the upper edge of the last cell holding mass
  for (let i = n - 1; i >= 0; i--) if (mass[i] > 0) return fromT(edgesT[i + 1], log);
  return NaN;
}

/**
 * Regroup cells into at most `max` display cells (consecutive runs of about equal size), for
 * pictures. Returns the group of each cell and the group edges in t.
 */
export function groupCells(edgesT: Float64Array, max: number): { readonly groupOf: Int32Array; readonly edgesT: Float64Array } {
  const n = edgesT.length - 1;
  const groups = Math.min(n, max);
  const groupOf = new Int32Array(n);
  const edges = new Float64Array(groups + 1);
  for (let i = 0; i < n; i++) groupOf[i] = Math.floor((i * groups) / n);
  for (let g = 0; g <= groups; g++) edges[g] = edgesT[Math.ceil((g * n) / groups)];
  return { groupOf, edgesT: edges };
}
