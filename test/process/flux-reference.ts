/**
 * An independent reference implementation of the flux column, written separately from
 * src/physics for the agreement test: the same formulation (project physics reference, "Flux
 * melting of a wedge column at a prescribed geotherm"; Katz, Spiegelman & Langmuir 2003 written
 * out here in its forward form) done the plain way: a fine even depth grid, bisection for F at
 * every node, trapezoids for the integrals, grid minimum for the water threshold, bisection for
 * the interval ends. Slow and simple on purpose; it shares no code with src/.
 */

// Katz et al. (2003) Table 2 values (from memory, as in the physics reference) and the conventions
const A = [1085.7, 132.9, -5.1];
const B = [1475.0, 80.0, -3.2];
const C = [1780.0, 45.0, -2.0];
const R1 = 0.5;
const R2 = 0.08;
const BETA1 = 1.5;
const BETA2 = 1.5;
const K = 43;
const GAMMA = 0.75;
const D = 0.01;
const CHI1 = 12;
const CHI2 = 1;
const LAMBDA = 0.6;
const MCPX = 0.17;
const CP = 1000;
const ALPHA = 40e-6;
const RHO = 3300;
const G = 9.81;
const DS = 300;

const quad = (c: number[], p: number): number => c[0] + c[1] * p + c[2] * p * p;
const pOfZ = (zKm: number): number => (zKm * 1000 * RHO * G) / 1e9;
const xSat = (p: number): number => (p <= 0 ? 0 : CHI1 * Math.pow(p, LAMBDA) + CHI2 * p);

/** Forward anhydrous melt fraction at effective temperature t (degC), pressure p (GPa). */
function fDry(t: number, p: number): number {
  const ts = quad(A, p);
  const tl = quad(B, p);
  const tliq = quad(C, p);
  if (t <= ts) return 0;
  const fcpx = MCPX / (R1 + R2 * p);
  const tcpx = Math.pow(fcpx, 1 / BETA1) * (tl - ts) + ts;
  if (t < tcpx) return Math.pow((t - ts) / (tl - ts), BETA1);
  if (t >= tliq) return 1;
  return fcpx + (1 - fcpx) * Math.pow((t - tcpx) / (tliq - tcpx), BETA2);
}

export interface RefInputs {
  tp: number;
  water: number;
  lid: number;
  slab: number;
  heat: 'fixed' | 'balanced';
}

/** The lid-adiabat geotherm (degC) at depth z (km). */
export function refGeotherm(zKm: number, i: RefInputs): number {
  const adiabat = (z: number): number => (i.tp + 273.15) * Math.exp((ALPHA * pOfZ(z) * 1e9) / (RHO * CP)) - 273.15;
  return zKm < i.lid ? (adiabat(i.lid) * zKm) / i.lid : adiabat(zKm);
}

/** F, T and X_melt at depth z by bisection on g(F) = F_dry(T(F) + K X(F)^gamma) - F. */
export function refPoint(zKm: number, i: RefInputs): { f: number; x: number } {
  const p = pOfZ(zKm);
  const tg = refGeotherm(zKm, i);
  const xb = i.water * 1e-4;
  const xOf = (f: number): number => Math.min(xb / (D + f * (1 - D)), xSat(p));
  const tOf = (f: number): number => (i.heat === 'fixed' ? tg : (tg + 273.15) * Math.exp((-DS * f) / CP) - 273.15);
  const g = (f: number): number => fDry(tOf(f) + K * Math.pow(xOf(f), GAMMA), p) - f;
  if (g(0) <= 0) return { f: 0, x: xOf(0) };
  let lo = 0;
  let hi = 1;
  if (g(1) >= 0) return { f: 1, x: xOf(1) };
  for (let k = 0; k < 60; k++) {
    const mid = 0.5 * (lo + hi);
    if (g(mid) > 0) lo = mid;
    else hi = mid;
  }
  const f = 0.5 * (lo + hi);
  return { f, x: xOf(f) };
}

export interface RefResult {
  onset_depth_km: number | null;
  top_depth_km: number | null;
  f_max: number;
  f_mean: number | null;
  melt_column_km: number;
  h2o_melt_wt_pct: number | null;
  water_threshold_ppm: number | null;
}

/** The column on n even depth intervals from the surface to the slab. */
export function refColumn(i: RefInputs, n = 20000): RefResult {
  const dz = i.slab / n;
  const zs = Array.from({ length: n + 1 }, (_, k) => k * dz);
  const pts = zs.map((z) => refPoint(z, i));
  let sumF = 0;
  let sumFX = 0;
  let fMax = 0;
  for (let k = 0; k < n; k++) {
    sumF += 0.5 * (pts[k].f + pts[k + 1].f) * dz;
    sumFX += 0.5 * (pts[k].f * pts[k].x + pts[k + 1].f * pts[k + 1].x) * dz;
  }
  for (const q of pts) fMax = Math.max(fMax, q.f);
  // interval ends: first and last melting node, refined by bisection against the neighbour
  const melting = (z: number): boolean => refPoint(z, i).f > 0;
  const first = pts.findIndex((q) => q.f > 0);
  let last = -1;
  for (let k = n; k >= 0; k--) if (pts[k].f > 0) { last = k; break; }
  const refine = (a: number, b: number): number => {
    // melting(a) !== melting(b)
    const ma = melting(a);
    for (let k = 0; k < 60; k++) {
      const mid = 0.5 * (a + b);
      if (melting(mid) === ma) a = mid;
      else b = mid;
    }
    return 0.5 * (a + b);
  };
  const top = first < 0 ? null : first === 0 ? 0 : refine(zs[first - 1], zs[first]);
  const onset = last < 0 ? null : last === n ? i.slab : refine(zs[last], zs[last + 1]);
  // threshold: grid minimum of D ((T_sol - T_geo) / K)^(1/gamma) where it does not exceed saturation
  let thr: number | null = null;
  for (let k = 0; k <= n; k++) {
    const p = pOfZ(zs[k]);
    const d = quad(A, p) - refGeotherm(zs[k], i);
    if (d <= 0) { thr = 0; break; }
    const need = Math.pow(d / K, 1 / GAMMA);
    if (need <= xSat(p)) thr = Math.min(thr ?? Infinity, D * need * 1e4);
  }
  return {
    onset_depth_km: onset,
    top_depth_km: top,
    f_max: fMax,
    f_mean: onset === null || top === null ? null : sumF / (onset - top),
    melt_column_km: sumF,
    h2o_melt_wt_pct: sumF > 0 ? sumFX / sumF : null,
    water_threshold_ppm: thr,
  };
}
