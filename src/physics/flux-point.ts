/**
 * Batch melting at one point of a wedge column: fixed pressure, the geotherm temperature and the
 * bulk water of the wedge (project physics reference, "Flux melting of a wedge column"; the
 * melting function of Katz, Spiegelman & Langmuir 2003, G-cubed 4(9), 1073, src/physics/melting.ts).
 *
 * - heat `fixed`: T = T_geo (the wedge flow resupplies the latent heat; an upper bound).
 * - heat `balanced`: the latent heat comes from the rock at constant P, entropy conserved:
 *   c_P ln(T / T_geo) + dS F = 0, i.e. T[K] = T_geo[K] exp(-dS F / c_P).
 * Either way F and T satisfy T + K X_melt(F)^gamma = T'(F) (the explicit inverse of the
 * anhydrous law), X_melt(F) = min(X_b / (D + F (1 - D)), X_sat(P)). The residual
 * h(F) = T'(F) - T(F) - K X_melt(F)^gamma increases strictly with F (T' increases, T and X_melt do
 * not), so there is one root in [0, 1]; it is solved in u = F^(1/beta1), in which T' is linear
 * up to cpx exhaustion, by Newton's method kept inside a shrinking bracket (bisection when a
 * step would leave it), warm-started from the caller's previous point.
 */
import { batchMeltWaterWtPct, dryTempFromCurves, dryTempSlopeFromCurves, powNonNeg, setMeltingCurves, waterDepressionC, waterSaturationWtPct, type MeltingCurves } from './melting.js';
import type { MeltParams } from './params.js';
import { KELVIN_OFFSET } from './units.js';

/** How melting at a point is paid for: `fixed` (T stays on the geotherm) or `balanced` (entropy). */
export type FluxHeat = 'fixed' | 'balanced';

/** The heat modes, default first. */
export const FLUX_HEAT_MODES: readonly FluxHeat[] = ['balanced', 'fixed'];

/** The state at a point (mutable so one object is reused along a column). */
export interface FluxPointState {
  /** melt fraction, 0-1 */
  f: number;
  /** temperature, degC (T_geo for `fixed`) */
  tC: number;
  /** water in the melt, wt% (in equilibrium; X_b / D capped at saturation as F -> 0) */
  xMeltWtPct: number;
}

/** A zeroed state object. */
export function createFluxPointState(): FluxPointState {
  return { f: 0, tC: 0, xMeltWtPct: 0 };
}

/** Temperature (degC) of the rock at melt fraction f for the heat mode (T_geo for fixed). */
export function fluxTempC(f: number, tGeoC: number, heat: FluxHeat, p: MeltParams): number {
  return heat === 'fixed' || f <= 0 ? tGeoC : (tGeoC + KELVIN_OFFSET) * Math.exp((-p.dS * f) / p.c_P) - KELVIN_OFFSET;
}

/**
 * Solve the point: fill `out` with F, T and X_melt at pGpa for geotherm temperature tGeoC (degC)
 * and bulk water bulkWtPct (wt%). `curves` is scratch (overwritten). Returns `out`.
 */
export function fluxMeltAtPoint(
  pGpa: number,
  tGeoC: number,
  bulkWtPct: number,
  heat: FluxHeat,
  p: MeltParams,
  curves: MeltingCurves,
  out: FluxPointState,
): FluxPointState {
  const c = setMeltingCurves(curves, pGpa, p);
  const xSat = bulkWtPct > 0 ? waterSaturationWtPct(pGpa, p) : 0;
  const x0 = bulkWtPct > 0 ? Math.min(bulkWtPct / p.D_H2O, xSat) : 0;
  const h0 = c.tSolC - tGeoC - waterDepressionC(x0, p);
  out.tC = tGeoC;
  if (h0 >= 0) {
    out.f = 0;
    out.xMeltWtPct = x0;
    return out;
  }
  const tGeoK = tGeoC + KELVIN_OFFSET;
  const balanced = heat === 'balanced';
  const entropyRate = p.dS / p.c_P;
  const oneMinusD = 1 - p.D_H2O;
  const beta1 = p.beta1;
  const span = c.tLherzC - c.tSolC;
  const cpxReachable = c.fCpx < 1;
  // residual r(u) in u = F^(1/beta1) and its slope dr/du (kept in `slope`)
  let slope = 0;
  const residual = (u: number): number => {
    const f = powNonNeg(u, beta1);
    const dfdu = u > 0 ? (beta1 * f) / u : beta1 === 1 ? 1 : 0;
    let tEff: number;
    let dTEff: number;
    if (cpxReachable && f >= c.fCpx) {
      tEff = dryTempFromCurves(f, c, p);
      dTEff = dryTempSlopeFromCurves(f, tEff, c, p) * dfdu;
    } else {
      tEff = c.tSolC + span * u;
      dTEff = span;
    }
    let water = 0;
    let dWater = 0;
    if (bulkWtPct > 0) {
      const denom = p.D_H2O + f * oneMinusD;
      const unsat = bulkWtPct / denom;
      if (unsat < xSat) {
        water = waterDepressionC(unsat, p);
        // dW/dF = gamma W / X dX/dF, dX/dF = -X (1 - D) / denom
        dWater = ((-p.gamma * water * oneMinusD) / denom) * dfdu;
      } else {
        water = waterDepressionC(xSat, p);
      }
    }
    let t = tGeoC;
    let dT = 0;
    if (balanced) {
      const tK = tGeoK * Math.exp(-entropyRate * f);
      t = tK - KELVIN_OFFSET;
      dT = -entropyRate * tK * dfdu;
    }
    slope = dTEff - dT - dWater;
    return tEff - t - water;
  };
  // safeguarded Newton on the bracket [lo, hi] (r(lo) < 0 < r(hi)); warm start from out.f
  let lo = 0;
  let hi = 1;
  let u: number;
  if (residual(1) <= 0) {
    u = 1;
  } else {
    const guess = out.f > 0 && out.f < 1 ? powNonNeg(out.f, 1 / beta1) : 0.3;
    u = guess;
    for (let i = 0; i < 100; i++) {
      const r = residual(u);
      // |r| below 1e-9 K: F is within ~1e-12 (dr/dF is hundreds of K or more)
      if (Math.abs(r) < 1e-9) break;
      if (r < 0) lo = u;
      else hi = u;
      let next = u - r / slope;
      if (!(next > lo && next < hi)) next = 0.5 * (lo + hi);
      const step = Math.abs(next - u);
      u = next;
      if (step < 1e-13 || hi - lo < 1e-13) break;
    }
  }
  const f = u >= 1 ? 1 : powNonNeg(u, beta1);
  out.f = f;
  out.tC = balanced ? tGeoK * Math.exp(-entropyRate * f) - KELVIN_OFFSET : tGeoC;
  out.xMeltWtPct = batchMeltWaterWtPct(f, pGpa, bulkWtPct, p);
  return out;
}
