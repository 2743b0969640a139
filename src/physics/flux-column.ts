/**
 * Flux melting of a wedge column at a prescribed geotherm (project physics reference, "Flux
 * melting of a wedge column at a prescribed geotherm"; melting function of Katz, Spiegelman &
 * Langmuir 2003, G-cubed 4(9), 1073). Every depth melts in equilibrium (batch) with the bulk water
 * of the wedge, at the geotherm temperature (`fixed`) or with the latent heat taken from the rock
 * (`balanced`), see src/physics/flux-point.ts.
 *
 * - Melting interval: F(P) > 0 exactly where the geotherm is above the wet solidus
 *   T_sol - K min(X_b / D, X_sat)^gamma (F -> 0 there), so its ends are the roots of that explicit
 *   difference: found by a scan that refines every sampled local maximum (thin intervals are not
 *   missed), then Brent's method to 1e-10 GPa.
 * - Integrals over the interval (F dz, F X_melt dz) by adaptive 15-point Gauss–Kronrod on pieces
 *   split at every kink of F(P): the geotherm's kinks (the lid base), the switch between
 *   water-saturated and unsaturated melt, and cpx exhaustion (each the root of an explicit function
 *   of P). Inside a piece the variable P = a + (b - a)(3u^2 - 2u^3) smooths the power-law start of
 *   F at an end of melting.
 * - F_max: the largest F over the integration nodes and piece ends, refined by Brent's minimiser.
 */
import type { Geotherm } from './flux-geotherm.js';
import { createFluxPointState, fluxMeltAtPoint, fluxTempC, type FluxHeat, type FluxPointState } from './flux-point.js';
import { positiveIntervals } from './flux-scan.js';
import { fluxWaterThreshold } from './flux-threshold.js';
import { GAUSS7_WEIGHTS_ASCENDING, KRONROD15_ASCENDING, KRONROD15_WEIGHTS_ASCENDING } from './gauss-kronrod.js';
import { createMeltingCurves, dryTempFromCurves, setMeltingCurves, waterDepressionC, waterSaturationWtPct, wetSolidusC, drySolidusC, type MeltingCurves } from './melting.js';
import type { MeltParams } from './params.js';
import { brentMinimize, brentRoot } from './scalar-search.js';
import { MODEL_MAX_P_GPA, type ColumnStatus } from './types.js';
import { depthKmFromPGpa, wtPctFromPpm } from './units.js';

/** How a flux column is computed. */
export interface FluxColumnOptions {
  readonly heat: FluxHeat;
  readonly params: MeltParams;
  /** return the profile arrays along the column (0 to the slab) */
  readonly withProfile?: boolean;
  /**
   * relative tolerance of the Gauss–Kronrod error estimate |K15 - G7| of the melt integrals (default
   * 1e-4; the estimate bounds the Gauss result, the Kronrod result kept is far better: within 2e-5
   * of the converged integrals over a random set of columns, see test/physics/flux-column.test.ts)
   */
  readonly relTol?: number;
}

/** Arrays along the whole column, surface to slab (ascending pressure). */
export interface FluxProfile {
  readonly p_gpa: Float64Array;
  readonly depth_km: Float64Array;
  readonly t_geo_c: Float64Array;
  readonly t_c: Float64Array;
  readonly f: Float64Array;
  readonly h2o_melt_wt_pct: Float64Array;
  readonly t_dry_solidus_c: Float64Array;
  readonly t_wet_solidus_c: Float64Array;
}

/** The result of one flux column: every result field of the process `flux` by name. */
export interface FluxColumnResult {
  status: ColumnStatus;
  reason: string | null;
  onset_p_gpa: number | null;
  onset_depth_km: number | null;
  top_p_gpa: number | null;
  top_depth_km: number | null;
  f_max: number | null;
  f_mean: number | null;
  melt_column_km: number | null;
  h2o_melt_wt_pct: number | null;
  water_threshold_ppm: number | null;
  /** the melting intervals [top, bottom] in GPa, shallow to deep */
  intervals?: readonly (readonly [number, number])[];
  profile?: FluxProfile;
}

/** Absolute tolerance of located pressures, GPa (interval ends, kinks). */
export const FLUX_X_TOL_GPA = 1e-10;
/** Deepest adaptive bisection of an integration piece. */
const MAX_DEPTH = 14;
/** Points of the profile arrays (besides the inserted interval ends). */
const PROFILE_POINTS = 241;

/** Working state of one column (no module-level state: every call owns its scratch). */
interface Work {
  readonly geo: Geotherm;
  readonly bulk: number;
  readonly heat: FluxHeat;
  readonly p: MeltParams;
  readonly curves: MeltingCurves;
  readonly state: FluxPointState;
  evaluations: number;
  bestF: number;
  bestP: number;
  bestLo: number;
  bestHi: number;
}

function solveAt(w: Work, pGpa: number): FluxPointState {
  w.evaluations++;
  return fluxMeltAtPoint(pGpa, w.geo.tempC(pGpa), w.bulk, w.heat, w.p, w.curves, w.state);
}

/**
 * Residual of the melting equation at a prescribed melt fraction f (explicit, no solve):
 * T'(f) - T(f) - K X_melt(f)^gamma. Its sign tells whether the equilibrium F at P lies above
 * (negative) or below (positive) f.
 */
function residualAtFraction(w: Work, pGpa: number, f: number): number {
  const p = w.p;
  const c = setMeltingCurves(w.curves, pGpa, p);
  const tGeo = w.geo.tempC(pGpa);
  const xSat = waterSaturationWtPct(pGpa, p);
  const unsat = w.bulk > 0 ? w.bulk / (p.D_H2O + f * (1 - p.D_H2O)) : 0;
  const x = unsat < xSat ? unsat : xSat;
  return dryTempFromCurves(f, c, p) - fluxTempC(f, tGeo, w.heat, p) - waterDepressionC(x, p);
}

/** The kinks of F(P) strictly inside [a, b]: cpx exhaustion and the saturation switch. */
function meltKinks(w: Work, a: number, b: number): number[] {
  const p = w.p;
  const out: number[] = [];
  // cpx exhaustion: F(P) = F_cpx(P)  <=>  residual at F_cpx changes sign
  const cpx = (pGpa: number): number => {
    setMeltingCurves(w.curves, pGpa, p);
    const fc = w.curves.fCpx;
    return fc >= 1 ? 1 : residualAtFraction(w, pGpa, fc);
  };
  // saturation switch: F(P) = F_s(P), F_s = (X_b / X_sat - D) / (1 - D) (clamped to [0, 1])
  const sat = (pGpa: number): number => {
    const xSat = waterSaturationWtPct(pGpa, p);
    const fs = xSat > 0 ? (w.bulk / xSat - p.D_H2O) / (1 - p.D_H2O) : 1;
    return residualAtFraction(w, pGpa, fs <= 0 ? 0 : fs >= 1 ? 1 : fs);
  };
  const fns = w.bulk > 0 ? [cpx, sat] : [cpx];
  for (const g of fns) {
    for (const [lo, hi] of positiveIntervals(g, [a, b], FLUX_X_TOL_GPA)) {
      if (lo > a) out.push(lo);
      if (hi < b) out.push(hi);
    }
  }
  return out;
}

/** Integrals over one piece [a, b] with the smoothing variable; adds into sums. */
function integratePiece(w: Work, a: number, b: number, relTol: number, sums: { f: number; fx: number }): void {
  const len = b - a;
  const stack: [number, number, number][] = [[0, 1, 0]];
  while (stack.length > 0) {
    const [u0, u1, depth] = stack.pop()!;
    const half = 0.5 * (u1 - u0);
    const mid = 0.5 * (u0 + u1);
    let kF = 0;
    let gF = 0;
    let kFX = 0;
    let prevP = a + len * (u0 * u0 * (3 - 2 * u0));
    const nodes = KRONROD15_ASCENDING.length;
    let pendingBest = false;
    for (let i = 0; i < nodes; i++) {
      const u = mid + half * KRONROD15_ASCENDING[i];
      const pGpa = a + len * (u * u * (3 - 2 * u));
      const jac = 6 * len * u * (1 - u);
      const s = solveAt(w, pGpa);
      const wf = s.f * jac;
      kF += KRONROD15_WEIGHTS_ASCENDING[i] * wf;
      gF += GAUSS7_WEIGHTS_ASCENDING[i] * wf;
      kFX += KRONROD15_WEIGHTS_ASCENDING[i] * wf * s.xMeltWtPct;
      if (pendingBest) {
        w.bestHi = pGpa;
        pendingBest = false;
      }
      if (s.f > w.bestF) {
        w.bestF = s.f;
        w.bestP = pGpa;
        w.bestLo = prevP;
        w.bestHi = a + len * (u1 * u1 * (3 - 2 * u1));
        pendingBest = true;
      }
      prevP = pGpa;
    }
    kF *= half;
    gF *= half;
    kFX *= half;
    const err = Math.abs(kF - gF);
    if (err <= relTol * Math.abs(kF) + 1e-15 * len || depth >= MAX_DEPTH) {
      sums.f += kF;
      sums.fx += kFX;
    } else {
      stack.push([u0, mid, depth + 1], [mid, u1, depth + 1]);
    }
  }
}

function nullValues(status: ColumnStatus, reason: string | null, threshold: number | null): FluxColumnResult {
  const melts = status === 'no_melt';
  return {
    status,
    reason,
    onset_p_gpa: null,
    onset_depth_km: null,
    top_p_gpa: null,
    top_depth_km: null,
    f_max: melts ? 0 : null,
    f_mean: null,
    melt_column_km: melts ? 0 : null,
    h2o_melt_wt_pct: null,
    water_threshold_ppm: threshold,
  };
}

/**
 * One flux column.
 * @param geo the geotherm down to the slab top (src/physics/flux-geotherm.ts)
 * @param waterPpm bulk water of the wedge, ppm by weight
 * @returns every result field; status `ok` (melts), `no_melt`, or `onset_beyond_range` when melting
 *   reaches below the deepest pressure the melting parameters cover (MODEL_MAX_P_GPA)
 */
export function fluxColumn(geo: Geotherm, waterPpm: number, options: FluxColumnOptions): FluxColumnResult {
  const p = options.params;
  const relTol = options.relTol ?? 1e-4;
  const bulk = wtPctFromPpm(waterPpm);
  const w: Work = {
    geo, bulk, heat: options.heat, p, curves: createMeltingCurves(), state: createFluxPointState(),
    evaluations: 0, bestF: 0, bestP: 0, bestLo: 0, bestHi: 0,
  };
  const threshold = fluxWaterThreshold(geo, p).ppm;
  // the melting interval(s): where the geotherm is above the wet solidus
  const breaks = [0, ...geo.kinksGpa];
  const xSatSwitch = saturationSwitchGpa(bulk, geo.pSlabGpa, p);
  if (xSatSwitch !== null) breaks.push(xSatSwitch);
  breaks.sort((x, y) => x - y);
  breaks.push(geo.pSlabGpa);
  const overstep = (pGpa: number): number => geo.tempC(pGpa) - wetSolidusC(pGpa, bulk, p);
  const intervals = positiveIntervals(overstep, breaks, FLUX_X_TOL_GPA);
  const profile = options.withProfile ? fluxProfile(w, intervals) : undefined;
  if (intervals.length === 0) {
    const r = nullValues('no_melt', null, threshold);
    if (profile !== undefined) r.profile = profile;
    r.intervals = [];
    return r;
  }
  const top = intervals[0][0];
  const onset = intervals[intervals.length - 1][1];
  if (onset > MODEL_MAX_P_GPA) {
    const r = nullValues(
      'onset_beyond_range',
      `melting reaches ${onset.toFixed(3)} GPa, below the ${MODEL_MAX_P_GPA} GPa the melting parameters cover (slab top at ${geo.pSlabGpa.toFixed(3)} GPa)`,
      threshold,
    );
    if (profile !== undefined) r.profile = profile;
    return r;
  }
  const sums = { f: 0, fx: 0 };
  for (const [a, b] of intervals) {
    const cuts = [a, ...geo.kinksGpa.filter((k) => k > a && k < b), ...meltKinks(w, a, b), b].sort((x, y) => x - y);
    for (let i = 1; i < cuts.length; i++) {
      const lo = cuts[i - 1];
      const hi = cuts[i];
      if (hi > lo) integratePiece(w, lo, hi, relTol, sums);
      // piece ends: F is continuous; its largest value may sit on a kink
      const s = solveAt(w, hi);
      if (s.f > w.bestF) {
        w.bestF = s.f;
        w.bestP = hi;
        w.bestLo = hi;
        w.bestHi = hi;
      }
    }
  }
  let fMax = w.bestF;
  if (w.bestHi > w.bestLo) {
    const m = brentMinimize((x) => -solveAt(w, x).f, w.bestLo, w.bestHi, FLUX_X_TOL_GPA);
    if (-m.fx > fMax) fMax = -m.fx;
  }
  const meltGpa = sums.f;
  return {
    status: 'ok',
    reason: null,
    onset_p_gpa: onset,
    onset_depth_km: depthKmFromPGpa(onset, p.rho_s, p.g),
    top_p_gpa: top,
    top_depth_km: depthKmFromPGpa(top, p.rho_s, p.g),
    f_max: fMax,
    f_mean: meltGpa / (onset - top),
    melt_column_km: depthKmFromPGpa(meltGpa, p.rho_s, p.g),
    h2o_melt_wt_pct: meltGpa > 0 ? sums.fx / meltGpa : null,
    water_threshold_ppm: threshold,
    intervals,
    ...(profile !== undefined ? { profile } : {}),
  };
}

/**
 * The pressure (GPa) where the water of first melt, X_b / D, reaches saturation X_sat(P) (above it
 * the first melt is saturated), or null when that does not happen inside (0, pSlabGpa).
 */
export function saturationSwitchGpa(bulkWtPct: number, pSlabGpa: number, p: MeltParams): number | null {
  if (!(bulkWtPct > 0)) return null;
  const target = bulkWtPct / p.D_H2O;
  const g = (pGpa: number): number => waterSaturationWtPct(pGpa, p) - target;
  const gHi = g(pSlabGpa);
  if (!(gHi > 0)) return null;
  const r = brentRoot(g, 0, pSlabGpa, g(0), gHi, FLUX_X_TOL_GPA);
  return r > 0 && r < pSlabGpa ? r : null;
}

/** Profile arrays on an even grid from the surface to the slab, with the interval ends inserted. */
function fluxProfile(w: Work, intervals: readonly (readonly [number, number])[]): FluxProfile {
  const p = w.p;
  const ps: number[] = [];
  for (let i = 0; i < PROFILE_POINTS; i++) ps.push((w.geo.pSlabGpa * i) / (PROFILE_POINTS - 1));
  for (const [a, b] of intervals) ps.push(a, b);
  for (const k of w.geo.kinksGpa) ps.push(k);
  ps.sort((x, y) => x - y);
  const uniq = ps.filter((x, i) => i === 0 || x > ps[i - 1]);
  const n = uniq.length;
  const out: FluxProfile = {
    p_gpa: Float64Array.from(uniq),
    depth_km: new Float64Array(n),
    t_geo_c: new Float64Array(n),
    t_c: new Float64Array(n),
    f: new Float64Array(n),
    h2o_melt_wt_pct: new Float64Array(n),
    t_dry_solidus_c: new Float64Array(n),
    t_wet_solidus_c: new Float64Array(n),
  };
  for (let i = 0; i < n; i++) {
    const pg = uniq[i];
    const s = solveAt(w, pg);
    out.depth_km[i] = depthKmFromPGpa(pg, p.rho_s, p.g);
    out.t_geo_c[i] = w.geo.tempC(pg);
    out.t_c[i] = s.tC;
    out.f[i] = s.f;
    out.h2o_melt_wt_pct[i] = s.f > 0 ? s.xMeltWtPct : Number.NaN;
    out.t_dry_solidus_c[i] = drySolidusC(pg, p);
    out.t_wet_solidus_c[i] = wetSolidusC(pg, w.bulk, p);
  }
  return out;
}
