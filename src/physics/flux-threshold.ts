/**
 * The water threshold of a wedge column (project physics reference, "Flux melting of a wedge
 * column"): the least bulk water for which the column melts anywhere above the slab,
 *   X_b* = min over P in [0, P_slab] of D_H2O ((T_sol(P) - T_geo(P)) / K)^(1/gamma),
 * 0 where the geotherm reaches the dry solidus, and only over pressures where that melt water
 * does not exceed saturation, X_sat(P) (deeper melt would need more water than the melt can hold).
 * null when no pressure qualifies. As F -> 0 the heat mode does not matter (T -> T_geo).
 *
 * Minimising X_b* is minimising d(P) = T_sol - T_geo over the feasible set
 * e(P) = K X_sat(P)^gamma - d(P) >= 0. The minimum is a local minimum of d inside the set, an end
 * of a feasible interval (a root of e, where X_b* = D X_sat) or an end of the range: all are
 * collected by a scan on the segments between the geotherm's kinks, refined by Brent's methods.
 */
import type { Geotherm } from './flux-geotherm.js';
import { positiveIntervals, scanGrid } from './flux-scan.js';
import { drySolidusC, powNonNeg, waterDepressionC, waterSaturationWtPct } from './melting.js';
import type { MeltParams } from './params.js';
import { brentMinimize } from './scalar-search.js';

/** Where the threshold is searched to, GPa (absolute tolerance of the located pressures). */
const X_TOL_GPA = 1e-10;

/** ppm per wt% (100 ppm = 0.01 wt%, project conventions). */
const PPM_PER_WT_PCT = 1e4;

/**
 * The water threshold (ppm) of a geotherm, or null when no bulk water melts the column.
 * Also returns the pressure (GPa) where it is reached (null with the threshold).
 */
export function fluxWaterThreshold(geo: Geotherm, p: MeltParams): { ppm: number | null; pGpa: number | null } {
  const d = (pGpa: number): number => drySolidusC(pGpa, p) - geo.tempC(pGpa);
  const e = (pGpa: number): number => waterDepressionC(waterSaturationWtPct(pGpa, p), p) - d(pGpa);
  const breaks = [0, ...geo.kinksGpa, geo.pSlabGpa];
  const grid = scanGrid(breaks);
  const xs = grid.x;
  const ds = xs.map(d);
  let bestD = Infinity;
  let bestP: number | null = null;
  const consider = (pGpa: number, dv: number): void => {
    if (dv < bestD) {
      bestD = dv;
      bestP = pGpa;
    }
  };
  // sampled points and refined local minima of d (segment ends included as samples)
  const isBreak = new Set(grid.segmentStarts);
  for (let i = 0; i < xs.length; i++) {
    if (ds[i] <= 0) return { ppm: 0, pGpa: xs[i] };
    if (e(xs[i]) >= 0) consider(xs[i], ds[i]);
    if (i === 0 || i === xs.length - 1 || isBreak.has(i)) continue;
    if (ds[i] <= ds[i - 1] && ds[i] <= ds[i + 1]) {
      const m = brentMinimize(d, xs[i - 1], xs[i + 1], X_TOL_GPA);
      if (m.fx <= 0) return { ppm: 0, pGpa: m.x };
      if (e(m.x) >= 0) consider(m.x, m.fx);
    }
  }
  // ends of the feasible intervals: there X_melt = X_sat exactly
  for (const [lo, hi] of positiveIntervals(e, breaks, X_TOL_GPA)) {
    for (const r of [lo, hi]) consider(r, Math.max(0, Math.min(d(r), waterDepressionC(waterSaturationWtPct(r, p), p))));
  }
  if (bestP === null) return { ppm: null, pGpa: null };
  const xMelt = powNonNeg(bestD / p.K, 1 / p.gamma);
  return { ppm: p.D_H2O * xMelt * PPM_PER_WT_PCT, pGpa: bestP };
}
