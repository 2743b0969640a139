/**
 * Hydrous peridotite melting: Katz, Spiegelman & Langmuir (2003), G-cubed 4(9), 1073.
 *
 * Conventions (project physics reference): T in degC, P in GPa, water in wt%.
 * All functions are pure and thread-safe; the parameter set is passed in.
 */
import type { MeltParams } from './params.js';

/**
 * x^e for x >= 0 with exact-form fast paths for the exponents of the published parameter set
 * (beta = 1.5, 1/beta = 2/3, gamma = 0.75): the column evaluates these millions of times and
 * Math.pow is several times slower than sqrt/cbrt. Results agree with Math.pow to rounding.
 * Internal speed helper, exported for the column integrators.
 */
export function powNonNeg(x: number, e: number): number {
  if (e === 1.5) return x * Math.sqrt(x);
  if (e === 2 / 3) return Math.cbrt(x * x);
  if (e === 0.75) return Math.sqrt(x * Math.sqrt(x));
  if (e === 1) return x;
  // exp(e ln x) is markedly faster than Math.pow in V8 and accurate to ~|e ln x| ulp
  return x > 0 && e > 0 ? Math.exp(e * Math.log(x)) : Math.pow(x, e);
}

/** Anhydrous solidus T_sol(P), degC. */
export function drySolidusC(pGpa: number, p: MeltParams): number {
  return p.A1 + pGpa * (p.A2 + pGpa * p.A3);
}

/** Lherzolite liquidus T_lherz(P), degC. */
export function lherzLiquidusC(pGpa: number, p: MeltParams): number {
  return p.B1 + pGpa * (p.B2 + pGpa * p.B3);
}

/** Liquidus T_liq(P), degC. */
export function liquidusC(pGpa: number, p: MeltParams): number {
  return p.C1 + pGpa * (p.C2 + pGpa * p.C3);
}

/**
 * Melt fraction at which clinopyroxene is exhausted, F_cpx_out = M_cpx / (r1 + r2 P), capped at 1.
 * The cap matters only for parameter overrides (large M_cpx, small or negative r1 + r2 P): when the
 * reaction coefficient cannot use up the cpx before the source is fully molten (R_cpx <= M_cpx,
 * including R_cpx <= 0), cpx is never exhausted and the beta1 law runs to F = 1 at T_lherz.
 */
export function fCpxOut(pGpa: number, p: MeltParams): number {
  const rCpx = p.r1 + p.r2 * pGpa;
  return rCpx > p.M_cpx ? p.M_cpx / rCpx : 1;
}

/** Temperature of cpx exhaustion (anhydrous), degC. */
export function cpxOutC(pGpa: number, p: MeltParams): number {
  const tSol = drySolidusC(pGpa, p);
  return powNonNeg(fCpxOut(pGpa, p), 1 / p.beta1) * (lherzLiquidusC(pGpa, p) - tSol) + tSol;
}

/** Water saturation of the melt X_sat(P) = chi1 P^lambda + chi2 P, wt%. */
export function waterSaturationWtPct(pGpa: number, p: MeltParams): number {
  return pGpa <= 0 ? 0 : p.chi1 * powNonNeg(pGpa, p.lambda) + p.chi2 * pGpa;
}

/**
 * A lower bound of X_sat(P) (wt%) that needs no power function: P^lambda >= 1 for P >= 1 and
 * P^lambda >= P for P < 1 (0 < lambda <= 1). Melt water at or below it is certainly unsaturated.
 */
export function waterSaturationLowerBound(pGpa: number, p: MeltParams): number {
  if (pGpa <= 0 || !(p.lambda > 0)) return 0;
  if (pGpa >= 1) return p.chi1 + p.chi2 * pGpa;
  return p.lambda <= 1 ? (p.chi1 + p.chi2) * pGpa : 0;
}

/**
 * A pressure (GPa) above which melt water xMeltWtPct is certainly below saturation: the smallest P
 * with xMeltWtPct <= waterSaturationLowerBound(P') for every P' >= P (that bound is nondecreasing).
 * Infinity when no such pressure exists.
 */
export function unsaturatedAbovePGpa(xMeltWtPct: number, p: MeltParams): number {
  if (!(xMeltWtPct > 0)) return 0;
  if (!(p.lambda > 0)) return Infinity;
  if (p.lambda <= 1 && xMeltWtPct <= p.chi1 + p.chi2) return xMeltWtPct / (p.chi1 + p.chi2);
  if (xMeltWtPct <= p.chi1 + p.chi2) return 1;
  return p.chi2 > 0 ? (xMeltWtPct - p.chi1) / p.chi2 : Infinity;
}

/** Slope dX_sat/dP of the water saturation (wt%/GPa); infinite at P = 0 when lambda < 1. */
export function waterSaturationSlope(pGpa: number, p: MeltParams): number {
  return pGpa <= 0 ? (p.lambda < 1 ? Infinity : p.lambda === 1 ? p.chi1 + p.chi2 : p.chi2) : p.chi1 * p.lambda * Math.pow(pGpa, p.lambda - 1) + p.chi2;
}

/** Solidus depression dT_H2O = K X_melt^gamma (degC) for water in the melt (wt%). */
export function waterDepressionC(waterMeltWtPct: number, p: MeltParams): number {
  return waterMeltWtPct > 0 ? p.K * powNonNeg(waterMeltWtPct, p.gamma) : 0;
}

/**
 * Water in the melt (wt%) under batch partitioning with the saturation cap:
 * X_melt = min(X_bulk / (D + F (1 - D)), X_sat(P)).
 */
export function batchMeltWaterWtPct(f: number, pGpa: number, bulkWaterWtPct: number, p: MeltParams): number {
  if (bulkWaterWtPct <= 0) return 0;
  const unsaturated = bulkWaterWtPct / (p.D_H2O + f * (1 - p.D_H2O));
  if (unsaturated <= waterSaturationLowerBound(pGpa, p)) return unsaturated;
  const sat = waterSaturationWtPct(pGpa, p);
  return unsaturated < sat ? unsaturated : sat;
}

/**
 * Wet solidus (degC): the temperature where the first melt appears for a source with
 * bulkWaterWtPct of water (X_melt -> X_bulk / D as F -> 0, capped at saturation).
 */
export function wetSolidusC(pGpa: number, bulkWaterWtPct: number, p: MeltParams): number {
  return drySolidusC(pGpa, p) - waterDepressionC(batchMeltWaterWtPct(0, pGpa, bulkWaterWtPct, p), p);
}

/**
 * Anhydrous melt fraction for an effective temperature tEffC = T + dT_H2O (degC).
 * Piecewise: 0 below the solidus, the beta1 law up to cpx exhaustion, the beta2 law up to the
 * liquidus, 1 above.
 */
export function dryMeltFraction(tEffC: number, pGpa: number, p: MeltParams): number {
  const tSol = drySolidusC(pGpa, p);
  if (tEffC <= tSol) return 0;
  const tLherz = lherzLiquidusC(pGpa, p);
  const fCpx = fCpxOut(pGpa, p);
  const tCpx = powNonNeg(fCpx, 1 / p.beta1) * (tLherz - tSol) + tSol;
  if (tEffC < tCpx) return powNonNeg((tEffC - tSol) / (tLherz - tSol), p.beta1);
  const tLiq = liquidusC(pGpa, p);
  if (tEffC >= tLiq) return 1;
  return fCpx + (1 - fCpx) * powNonNeg((tEffC - tCpx) / (tLiq - tCpx), p.beta2);
}

/**
 * Effective temperature T' = T + dT_H2O (degC) at which the anhydrous law gives melt
 * fraction f: the explicit inverse of dryMeltFraction. f is clamped to [0, 1]
 * (f = 0 gives the anhydrous solidus, f = 1 the liquidus).
 */
export function dryTempForMeltFraction(f: number, pGpa: number, p: MeltParams): number {
  return dryTempFromCurves(f, setMeltingCurves(createMeltingCurves(), pGpa, p), p);
}

/**
 * The anhydrous curves at one pressure (all degC, fCpx a mass fraction). A column step evaluates
 * the melting law many times at the same pressure; computing these once per pressure keeps the
 * inner solve to one power function per evaluation. Fields are mutable so one object can be
 * reused along a column without allocation.
 */
export interface MeltingCurves {
  tSolC: number;
  tLherzC: number;
  fCpx: number;
  tCpxC: number;
  tLiqC: number;
}

/** A zeroed MeltingCurves scratch object (fill it with setMeltingCurves). */
export function createMeltingCurves(): MeltingCurves {
  return { tSolC: 0, tLherzC: 0, fCpx: 0, tCpxC: 0, tLiqC: 0 };
}

/** Fill `out` with the anhydrous curves at pGpa and return it. */
export function setMeltingCurves(out: MeltingCurves, pGpa: number, p: MeltParams): MeltingCurves {
  const tSol = drySolidusC(pGpa, p);
  const tLherz = lherzLiquidusC(pGpa, p);
  const fCpx = fCpxOut(pGpa, p);
  out.tSolC = tSol;
  out.tLherzC = tLherz;
  out.fCpx = fCpx;
  out.tCpxC = powNonNeg(fCpx, 1 / p.beta1) * (tLherz - tSol) + tSol;
  out.tLiqC = liquidusC(pGpa, p);
  return out;
}

/** Explicit inverse T'(f) (degC) of the anhydrous law from precomputed curves; f clamped to [0, 1]. */
export function dryTempFromCurves(f: number, c: MeltingCurves, p: MeltParams): number {
  const ff = f < 0 ? 0 : f > 1 ? 1 : f;
  if (ff < c.fCpx || c.fCpx >= 1) return c.tSolC + (c.tLherzC - c.tSolC) * powNonNeg(ff, 1 / p.beta1);
  return c.tCpxC + (c.tLiqC - c.tCpxC) * powNonNeg((ff - c.fCpx) / (1 - c.fCpx), 1 / p.beta2);
}

/**
 * Slope dT'/df (degC per unit melt fraction) of the anhydrous inverse at f, given tEffC =
 * dryTempFromCurves(f, c, p) so that no second power function is needed. Infinite at f = 0 and at
 * cpx exhaustion when beta > 1 (the melting law has zero slope in T there).
 */
export function dryTempSlopeFromCurves(f: number, tEffC: number, c: MeltingCurves, p: MeltParams): number {
  if (f < c.fCpx || c.fCpx >= 1) {
    if (f > 0) return (tEffC - c.tSolC) / (p.beta1 * f);
    return p.beta1 > 1 ? Infinity : p.beta1 === 1 ? c.tLherzC - c.tSolC : 0;
  }
  if (f > c.fCpx) return (tEffC - c.tCpxC) / (p.beta2 * (f - c.fCpx));
  return p.beta2 > 1 ? Infinity : p.beta2 === 1 ? (c.tLiqC - c.tCpxC) / (1 - c.fCpx) : 0;
}

/**
 * Slope dT'/dP at fixed melt fraction f (degC/GPa) of the anhydrous inverse at pressure pGpa, given
 * the curves `c` at that pressure and tEffC = dryTempFromCurves(f, c, p). Differentiates the curve
 * polynomials, F_cpx_out(P) and T_cpx_out(P) analytically; used for dF/dP along an isentrope.
 */
export function dryTempPressureSlope(f: number, tEffC: number, pGpa: number, c: MeltingCurves, p: MeltParams): number {
  const dSol = p.A2 + 2 * p.A3 * pGpa;
  const dLherz = p.B2 + 2 * p.B3 * pGpa;
  const span = c.tLherzC - c.tSolC;
  if (f < c.fCpx || c.fCpx >= 1) {
    const u = span !== 0 ? (tEffC - c.tSolC) / span : 0; // f^(1/beta1)
    return dSol + (dLherz - dSol) * u;
  }
  const rCpx = p.r1 + p.r2 * pGpa;
  const dFCpx = (-p.M_cpx * p.r2) / (rCpx * rCpx);
  const uCpx = span !== 0 ? (c.tCpxC - c.tSolC) / span : 0; // fCpx^(1/beta1)
  const dTCpx = dSol + (dLherz - dSol) * uCpx + (c.fCpx > 0 ? (uCpx / (p.beta1 * c.fCpx)) * dFCpx * span : 0);
  const dLiq = p.C2 + 2 * p.C3 * pGpa;
  const spanLiq = c.tLiqC - c.tCpxC;
  const w = spanLiq !== 0 ? (tEffC - c.tCpxC) / spanLiq : 0;
  const oneMinus = 1 - c.fCpx;
  const v = (f - c.fCpx) / oneMinus;
  const dv = (dFCpx * (f - 1)) / (oneMinus * oneMinus);
  const dw = v > 0 ? (w / (p.beta2 * v)) * dv : 0;
  return dTCpx + (dLiq - dTCpx) * w + spanLiq * dw;
}

/**
 * Temperature (degC) at which the source holds melt fraction f at pressure pGpa, with
 * melt water xMeltWtPct in equilibrium: T = T'(f) - K X_melt^gamma. Explicit: no solve.
 */
export function tempForMeltFractionC(f: number, pGpa: number, xMeltWtPct: number, p: MeltParams): number {
  return dryTempForMeltFraction(f, pGpa, p) - waterDepressionC(xMeltWtPct, p);
}

/**
 * Equilibrium melt fraction F(T, P, X_bulk) with batch water partitioning and the
 * saturation cap (Katz et al. 2003). F appears on both sides; the residual
 * g(F) = F_dry(T + dT_H2O(X_melt(F))) - F decreases monotonically in F, so a safeguarded
 * secant/bisection on [0, 1] converges to a unique root.
 *
 * @param tC temperature, degC
 * @param pGpa pressure, GPa
 * @param bulkWaterWtPct bulk water of the source, wt%
 * @returns melt fraction in [0, 1]
 */
export function meltFraction(tC: number, pGpa: number, bulkWaterWtPct: number, p: MeltParams): number {
  if (bulkWaterWtPct <= 0) return dryMeltFraction(tC, pGpa, p);
  const residual = (f: number): number =>
    dryMeltFraction(tC + waterDepressionC(batchMeltWaterWtPct(f, pGpa, bulkWaterWtPct, p), p), pGpa, p) - f;
  let lo = 0;
  let glo = residual(0);
  if (glo <= 0) return 0;
  let hi = 1;
  let ghi = residual(1);
  if (ghi >= 0) return 1;
  // Illinois-modified regula falsi: keeps the bracket, converges superlinearly.
  let side = 0;
  for (let i = 0; i < 200; i++) {
    const f = (lo * ghi - hi * glo) / (ghi - glo);
    const g = residual(f);
    if (Math.abs(g) < 1e-14 || hi - lo < 1e-14) return f;
    if (g > 0) {
      lo = f;
      glo = g;
      if (side === 1) ghi *= 0.5;
      side = 1;
    } else {
      hi = f;
      ghi = g;
      if (side === -1) glo *= 0.5;
      side = -1;
    }
  }
  return 0.5 * (lo + hi);
}
