/**
 * Columns whose onset lies deeper than the model covers (`model.deep_onset: cap`).
 *
 * On its solid adiabat such a source is already above its wet solidus at P_cap = MODEL_MAX_P_GPA:
 * it started melting deeper, where the melting law is not calibrated. Instead of dropping the
 * column, it is computed from P_cap upward, starting from the state the source has at P_cap
 * when it is allowed to melt there at constant entropy:
 *
 *   c_P ln(T_start / T_ad(P_cap)) + dS F_start = 0,   T_start = T(F_start, P_cap) on the melting curve
 *
 * i.e. the isentropic step of the column (isentropic-step.ts) with zero pressure change from the
 * unmelted adiabatic state. Why this state and not F(T_ad(P_cap), P_cap): the latent heat of the melt
 * already present must come out of the sensible heat, or the column would carry more energy than
 * the source had; this is the state the real column reaches at P_cap in the limit where its onset
 * lies just below P_cap, and the one a caller gets by continuity as the onset approaches P_cap from
 * above. What it leaves out is the melting path below P_cap (the (alpha/rho)_mix dP work there and
 * the melt produced over it), so F_start is a lower bound on the melt present at P_cap when the
 * onset lies well below it, and the crust (int F dP from P_cap up) is a lower bound too: the
 * interval below P_cap is missing from the integral. Water: batch melt holds X_bulk / (D + F(1-D))
 * (capped at saturation); fractional extraction runs over the same zero-pressure step (Rayleigh in
 * F), so the residue leaves P_cap already depleted.
 */
import { adiabatTempK } from './adiabat.js';
import { IsentropicStepper } from './isentropic-step.js';
import { setMeltingCurves, waterSaturationWtPct } from './melting.js';
import type { MeltParams } from './params.js';
import type { WaterMode } from './types.js';

/** The state a melting path starts from: melt fraction, temperature and water at its deepest pressure. */
export interface PathStart {
  /** melt fraction already present, 0-1 */
  readonly f: number;
  /** temperature, K */
  readonly tK: number;
  /** water in the melt, wt% */
  readonly xMeltWtPct: number;
  /** water in the residue, wt% of the residue (the source water for batch melting with f = 0) */
  readonly xResidueWtPct: number;
  /** water carried away by the melt per unit mass of source so far, wt% */
  readonly waterExtractedWtPct: number;
}

/**
 * The starting state of a column whose source is above its wet solidus at pCapGpa on the solid
 * adiabat: melted at constant entropy and pressure from T_ad(pCapGpa) (see the module comment).
 *
 * @param tpC mantle potential temperature, degC
 * @param bulkWaterWtPct bulk water of the source, wt%
 * @param pCapGpa the deepest pressure the model covers, GPa
 * @param mode water mode
 * @param p parameter set
 * @throws Error when the adiabat is not above the solidus at pCapGpa (then the onset is not capped)
 */
export function cappedStart(tpC: number, bulkWaterWtPct: number, pCapGpa: number, mode: WaterMode, p: MeltParams): PathStart {
  const s = new IsentropicStepper(p, mode, bulkWaterWtPct);
  const tAdK = adiabatTempK(tpC, pCapGpa, p);
  setMeltingCurves(s.curves, pCapGpa, p);
  const xs = waterSaturationWtPct(pCapGpa, p);
  s.xs = xs;
  s.xsPath = xs;
  s.dPPa = 0;
  s.f0 = 0;
  s.t0K = tAdK;
  s.logT0 = Math.log(tAdK);
  s.xr0 = bulkWaterWtPct;
  s.solveStep(Number.NaN, s.fractional ? 1 - 1e-12 : 1);
  if (!(s.onCurve && s.f1 > 0)) throw new Error(`capped onset: the adiabat is not above the solidus at ${pCapGpa} GPa`);
  const f = s.f1;
  const x0 = bulkWaterWtPct;
  const xm = x0 > 0 ? s.xm : 0;
  const extracted = x0 > 0 ? (s.fractional ? s.extractedIncrement(f) : f * xm) : 0;
  const xr = x0 > 0 ? (s.fractional ? s.xr : (x0 - f * xm) / (1 - f)) : 0;
  return { f, tK: s.t1K, xMeltWtPct: xm, xResidueWtPct: xr, waterExtractedWtPct: extracted };
}
