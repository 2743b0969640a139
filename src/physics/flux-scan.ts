/**
 * Sign structure of a function along a column: sample it on segments between known kinks, refine
 * every sampled local maximum that stays at or below zero (so a thin positive interval between two
 * samples is not missed), and find every crossing with Brent's method. Used for the melting
 * interval of a wedge column and for the water threshold (src/physics/flux-column.ts,
 * flux-threshold.ts).
 */
import { brentMinimize, brentRoot } from './scalar-search.js';

/** Largest spacing of the samples, GPa (a segment also gets at least MIN_SAMPLES intervals). */
export const SCAN_SPACING_GPA = 0.1;
const MIN_SAMPLES = 6;

/** The sample grid of segments bounded by `breaks` (ascending, first and last = the ends). */
export interface ScanGrid {
  readonly x: number[];
  /** index in x of the first point of each segment, plus the last index */
  readonly segmentStarts: number[];
}

/** Samples of [breaks[0], breaks[last]]: every break is a sample; segments split evenly. */
export function scanGrid(breaks: readonly number[]): ScanGrid {
  const x: number[] = [breaks[0]];
  const segmentStarts: number[] = [0];
  for (let k = 1; k < breaks.length; k++) {
    const a = breaks[k - 1];
    const b = breaks[k];
    const n = Math.max(MIN_SAMPLES, Math.ceil((b - a) / SCAN_SPACING_GPA));
    for (let i = 1; i <= n; i++) x.push(i === n ? b : a + ((b - a) * i) / n);
    segmentStarts.push(x.length - 1);
  }
  return { x, segmentStarts };
}

/**
 * The intervals where g > 0 on [breaks[0], breaks[last]], ends located to xTol. g must be smooth
 * inside each segment between consecutive breaks. Intervals are returned ascending as [lo, hi]
 * pairs; an interval that reaches an end of the range ends exactly there.
 */
export function positiveIntervals(g: (x: number) => number, breaks: readonly number[], xTol: number): [number, number][] {
  const grid = scanGrid(breaks);
  const xs = grid.x;
  const gs = xs.map(g);
  // refine sampled local maxima at or below zero inside a segment: a thin positive bump between samples
  const extraX: number[] = [];
  const extraG: number[] = [];
  const isBreak = new Set(grid.segmentStarts);
  for (let i = 1; i < xs.length - 1; i++) {
    if (isBreak.has(i)) continue;
    if (gs[i] > 0 || gs[i - 1] > 0 || gs[i + 1] > 0) continue;
    if (!(gs[i] >= gs[i - 1] && gs[i] >= gs[i + 1])) continue;
    const m = brentMinimize((x) => -g(x), xs[i - 1], xs[i + 1], xTol);
    if (-m.fx > 0) {
      extraX.push(m.x);
      extraG.push(-m.fx);
    }
  }
  let px = xs;
  let pg = gs;
  if (extraX.length > 0) {
    const all = xs.map((x, i) => [x, gs[i]] as [number, number]).concat(extraX.map((x, i) => [x, extraG[i]] as [number, number]));
    all.sort((a, b) => a[0] - b[0]);
    px = all.map((q) => q[0]);
    pg = all.map((q) => q[1]);
  }
  const out: [number, number][] = [];
  let start: number | null = pg[0] > 0 ? px[0] : null;
  for (let i = 1; i < px.length; i++) {
    const was = pg[i - 1] > 0;
    const is = pg[i] > 0;
    if (was === is) continue;
    const r = brentRoot(g, px[i - 1], px[i], pg[i - 1], pg[i], xTol);
    if (is) {
      start = r;
    } else if (start !== null) {
      if (r > start) out.push([start, r]);
      start = null;
    }
  }
  if (start !== null && px[px.length - 1] > start) out.push([start, px[px.length - 1]]);
  return out;
}
