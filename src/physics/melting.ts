/**
 * Hydrous peridotite melting: Katz, Spiegelman & Langmuir (2003), G-cubed 4(9), 1073.
 *
 * Conventions (project physics reference): T in degC, P in GPa, water in wt%.
 * All functions are pure and thread-safe; the parameter set is passed in.
 */
import type { MeltParams } from './params.js';

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

/** Melt fraction at which clinopyroxene is exhausted, F_cpx_out = M_cpx / (r1 + r2 P). */
export function fCpxOut(pGpa: number, p: MeltParams): number {
  return p.M_cpx / (p.r1 + p.r2 * pGpa);
}

/** Temperature of cpx exhaustion (anhydrous), degC. */
export function cpxOutC(pGpa: number, p: MeltParams): number {
  const tSol = drySolidusC(pGpa, p);
  return Math.pow(fCpxOut(pGpa, p), 1 / p.beta1) * (lherzLiquidusC(pGpa, p) - tSol) + tSol;
}

/** Water saturation of the melt X_sat(P) = chi1 P^lambda + chi2 P, wt%. */
export function waterSaturationWtPct(pGpa: number, p: MeltParams): number {
  return pGpa <= 0 ? 0 : p.chi1 * Math.pow(pGpa, p.lambda) + p.chi2 * pGpa;
}

/** Solidus depression dT_H2O = K X_melt^gamma (degC) for water in the melt (wt%). */
export function waterDepressionC(waterMeltWtPct: number, p: MeltParams): number {
  return waterMeltWtPct > 0 ? p.K * Math.pow(waterMeltWtPct, p.gamma) : 0;
}

/**
 * Water in the melt (wt%) under batch partitioning with the saturation cap:
 * X_melt = min(X_bulk / (D + F (1 - D)), X_sat(P)).
 */
export function batchMeltWaterWtPct(f: number, pGpa: number, bulkWaterWtPct: number, p: MeltParams): number {
  if (bulkWaterWtPct <= 0) return 0;
  const unsaturated = bulkWaterWtPct / (p.D_H2O + f * (1 - p.D_H2O));
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
  const tCpx = Math.pow(fCpx, 1 / p.beta1) * (tLherz - tSol) + tSol;
  if (tEffC < tCpx) return Math.pow((tEffC - tSol) / (tLherz - tSol), p.beta1);
  const tLiq = liquidusC(pGpa, p);
  if (tEffC >= tLiq) return 1;
  return fCpx + (1 - fCpx) * Math.pow((tEffC - tCpx) / (tLiq - tCpx), p.beta2);
}

/**
 * Effective temperature T' = T + dT_H2O (degC) at which the anhydrous law gives melt
 * fraction f: the explicit inverse of dryMeltFraction for 0 <= f <= 1.
 */
export function dryTempForMeltFraction(f: number, pGpa: number, p: MeltParams): number {
  const tSol = drySolidusC(pGpa, p);
  const tLherz = lherzLiquidusC(pGpa, p);
  const fCpx = fCpxOut(pGpa, p);
  if (f < fCpx) return tSol + (tLherz - tSol) * Math.pow(f, 1 / p.beta1);
  const tCpx = Math.pow(fCpx, 1 / p.beta1) * (tLherz - tSol) + tSol;
  const tLiq = liquidusC(pGpa, p);
  return tCpx + (tLiq - tCpx) * Math.pow((f - fCpx) / (1 - fCpx), 1 / p.beta2);
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
 * saturation cap (Katz et al. 2003, eqs. 16-19). F appears on both sides; the residual
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
