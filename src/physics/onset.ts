/**
 * Onset of decompression melting on the solid adiabat: the deepest pressure where the adiabat
 * reaches the wet solidus, i.e. where F(T_adiabat(P), P, X_bulk) first becomes positive
 * (Katz, Spiegelman & Langmuir 2003, G-cubed 4(9), 1073; with water the first melt holds
 * X_bulk / D_H2O, capped at saturation, so the F = 0 boundary is wetSolidusC).
 */
import { adiabatTempC, adiabatTempK } from './adiabat.js';
import { unsaturatedAbovePGpa, wetSolidusC } from './melting.js';
import type { MeltParams } from './params.js';
import { MODEL_MAX_P_GPA } from './types.js';
import { PA_PER_GPA } from './units.js';

/** Where melting starts on the adiabat. Pressures in GPa, temperatures in degC. */
export type OnsetResult =
  /** melting starts at pGpa (pTopGpa < pGpa <= pMaxGpa) */
  | { readonly kind: 'onset'; readonly pGpa: number }
  /** the adiabat stays at or below the wet solidus from pMaxGpa up to pTopGpa */
  | { readonly kind: 'none' }
  /** the adiabat is already above the wet solidus at pMaxGpa: onset is deeper than the model range */
  | { readonly kind: 'beyond'; readonly pMaxGpa: number; readonly tAdiabatC: number; readonly tSolidusC: number };

/**
 * Spacing (GPa) of the downward scan that brackets the deepest crossing. The solidus and the
 * adiabat are smooth on GPa scales; two crossings closer than this (a near-tangency) are treated as
 * none.
 */
export const ONSET_SCAN_GPA = 0.1;

/** Bracket width (GPa) at which the onset root is accepted; far inside the 1e-6 GPa requirement. */
export const ONSET_TOL_GPA = 1e-9;

/**
 * Find the deepest pressure in (pTopGpa, pMaxGpa] where the solid adiabat of potential
 * temperature tpC crosses the wet solidus of a source with bulkWaterWtPct of water.
 *
 * Method: where the excess T_adiabat - T_solidus provably falls monotonically with P (unsaturated
 * first melt, solidus steeper than the adiabat) one sign check brackets the crossing; elsewhere scan
 * downward in ONSET_SCAN_GPA steps until the adiabat is above the solidus. The bracket is refined
 * with the Illinois method to ONSET_TOL_GPA. No allocation apart from the returned object.
 *
 * @param tpC mantle potential temperature, degC
 * @param bulkWaterWtPct bulk water of the source, wt%
 * @param pTopGpa shallowest pressure considered (base of the lid), GPa
 * @param p parameter set
 * @param pMaxGpa deepest pressure of the model, GPa (default MODEL_MAX_P_GPA)
 */
export function findMeltOnset(
  tpC: number,
  bulkWaterWtPct: number,
  pTopGpa: number,
  p: MeltParams,
  pMaxGpa: number = MODEL_MAX_P_GPA,
): OnsetResult {
  const excess = (pGpa: number): number => adiabatTempC(tpC, pGpa, p) - wetSolidusC(pGpa, bulkWaterWtPct, p);
  const gMax = excess(pMaxGpa);
  if (gMax > 0) {
    const tSolidusC = wetSolidusC(pMaxGpa, bulkWaterWtPct, p);
    return { kind: 'beyond', pMaxGpa, tAdiabatC: tSolidusC + gMax, tSolidusC };
  }
  if (!(gMax <= 0)) throw new Error(`onset: adiabat or solidus is not finite at ${pMaxGpa} GPa`);
  let hi = pMaxGpa;
  let ghi = gMax;
  // Shortcut: where the first melt's water is certainly unsaturated the wet solidus is the dry one
  // shifted by a constant; if that is steeper than the adiabat over [pLow, pMax] (the adiabat is
  // convex, so its steepest point is pMax; the solidus slope is linear in P), the excess falls
  // monotonically with P there and a single sign check at pLow brackets the only crossing.
  const pLow = Math.max(unsaturatedAbovePGpa(bulkWaterWtPct / p.D_H2O, p), pTopGpa);
  if (pLow < pMaxGpa) {
    const adiabatSlopeMax = (p.alpha_s * adiabatTempK(tpC, pMaxGpa, p) * PA_PER_GPA) / (p.rho_s * p.c_P);
    const solidusSlopeMin = Math.min(p.A2 + 2 * p.A3 * pLow, p.A2 + 2 * p.A3 * pMaxGpa);
    if (adiabatSlopeMax < solidusSlopeMin) {
      const gLow = excess(pLow);
      if (gLow > 0) return { kind: 'onset', pGpa: refineRoot(excess, pLow, gLow, hi, ghi) };
      if (!(gLow <= 0)) throw new Error(`onset: adiabat or solidus is not finite at ${pLow} GPa`);
      hi = pLow;
      ghi = gLow;
    }
  }
  while (hi > pTopGpa) {
    const lo = Math.max(hi - ONSET_SCAN_GPA, pTopGpa);
    const glo = excess(lo);
    if (glo > 0) return { kind: 'onset', pGpa: refineRoot(excess, lo, glo, hi, ghi) };
    if (!(glo <= 0)) throw new Error(`onset: adiabat or solidus is not finite at ${lo} GPa`);
    hi = lo;
    ghi = glo;
  }
  return { kind: 'none' };
}

/**
 * Illinois-modified regula falsi for the crossing of a decreasing excess(P) in [lo, hi] with
 * excess(lo) > 0 >= excess(hi). Returns the crossing pressure, GPa.
 */
function refineRoot(excess: (pGpa: number) => number, lo0: number, glo0: number, hi0: number, ghi0: number): number {
  let lo = lo0;
  let glo = glo0;
  let hi = hi0;
  let ghi = ghi0;
  if (ghi === 0) return hi;
  let side = 0;
  for (let i = 0; i < 200 && hi - lo > ONSET_TOL_GPA; i++) {
    let x = (lo * ghi - hi * glo) / (ghi - glo);
    // keep strictly inside the bracket so that every iteration shrinks it
    if (!(x > lo && x < hi)) x = 0.5 * (lo + hi);
    const g = excess(x);
    if (g > 0) {
      lo = x;
      glo = g;
      if (side === 1) ghi *= 0.5;
      side = 1;
    } else if (g < 0) {
      hi = x;
      ghi = g;
      if (side === -1) glo *= 0.5;
      side = -1;
    } else if (g === 0) {
      return x;
    } else {
      throw new Error(`onset: adiabat or solidus is not finite at ${x} GPa`);
    }
  }
  return 0.5 * (lo + hi);
}

/** The reason of an `onset_beyond_range` row (the same words for every thermal model). */
export function beyondRangeReason(onset: Extract<OnsetResult, { kind: 'beyond' }>): string {
  return (
    `melting starts deeper than ${onset.pMaxGpa} GPa, the deepest pressure the model covers: ` +
    `at ${onset.pMaxGpa} GPa the adiabat (${onset.tAdiabatC.toFixed(1)} degC) is already above the solidus (${onset.tSolidusC.toFixed(1)} degC)`
  );
}
