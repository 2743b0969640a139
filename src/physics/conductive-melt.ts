/**
 * Node-level melting state for the Newton iteration of the conductive column.
 *
 * The column is solved for u = T + c_u F_eq(T) at each node (an enthalpy-like variable, c_u =
 * U_LATENT_SCALE_K) rather than for T: F_eq(T) has an unbounded slope at the solidus when beta1 < 1
 * (and at cpx exhaustion when beta2 < 1), while T(u) and F(u) are monotone with slopes in [0, 1] and
 * [0, 1/c_u] for any melting law, so the discrete equations are Lipschitz in u and Newton with
 * backtracking behaves. The change of variable does not change the solution.
 *
 * Given u, the equilibrium state is found in F, where the temperature is explicit
 * (Katz, Spiegelman & Langmuir 2003, G-cubed 4(9), 1073, batch water with the saturation cap):
 *     T_eq(F) = T'(F, P) - K X_melt(F)^gamma,  X_melt = min(X_bulk / (D + F (1 - D)), X_sat(P)),
 *     T_eq(F) + c_u F = u   (increasing in F: one root in [0, 1]).
 * The anhydrous inverse T'(F) comes from melting.ts (dryTempFromCurves); a test checks that the F found
 * equals meltFraction(T) of melting.ts.
 */
import {
  createMeltingCurves,
  dryTempFromCurves,
  dryTempSlopeFromCurves,
  setMeltingCurves,
  waterDepressionC,
  waterSaturationWtPct,
  wetSolidusC,
  type MeltingCurves,
} from './melting.js';
import type { MeltParams } from './params.js';
import { KELVIN_OFFSET } from './units.js';

/** c_u in u = T + c_u F, K: of the order of the latent-heat temperature drop dS T / c_P. */
export const U_LATENT_SCALE_K = 500;

/** Pressure-only terms of the melting law at each grid node. */
export interface NodeMeltTable {
  readonly n: number;
  /** bulk water of the source, wt% */
  readonly bulkWaterWtPct: number;
  /** anhydrous curves at each node (degC) */
  readonly curves: readonly MeltingCurves[];
  /** water saturation of the melt at each node, wt% */
  readonly xSatWtPct: Float64Array;
  /** wet solidus (first melt) at each node, K: below it F = 0 */
  readonly tWetSolK: Float64Array;
  readonly params: MeltParams;
}

/**
 * Precompute the melting-law terms that depend only on pressure.
 * @param pGpa pressure of each node, GPa
 * @param bulkWaterWtPct bulk water of the source, wt% (batch partitioning)
 * @param meltsUpToPGpa nodes deeper than this never melt (the melting law is not used outside the
 *   model's pressure range), GPa; default Infinity
 */
export function buildNodeMeltTable(
  pGpa: Float64Array,
  bulkWaterWtPct: number,
  p: MeltParams,
  meltsUpToPGpa: number = Number.POSITIVE_INFINITY,
): NodeMeltTable {
  const n = pGpa.length;
  const curves: MeltingCurves[] = new Array<MeltingCurves>(n);
  const xSatWtPct = new Float64Array(n);
  const tWetSolK = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    curves[i] = setMeltingCurves(createMeltingCurves(), pGpa[i], p);
    xSatWtPct[i] = waterSaturationWtPct(pGpa[i], p);
    tWetSolK[i] =
      pGpa[i] > meltsUpToPGpa
        ? Number.POSITIVE_INFINITY
        : (bulkWaterWtPct > 0 ? wetSolidusC(pGpa[i], bulkWaterWtPct, p) : curves[i].tSolC) + KELVIN_OFFSET;
  }
  return { n, bulkWaterWtPct, curves, xSatWtPct, tWetSolK, params: p };
}

/**
 * Equilibrium state at node i for the unknown u (K): T and F_eq with T + c_u F_eq = u.
 *
 * @param uK u = T + c_u F, K
 * @param fGuess previous melt fraction at this node (starting point of the solve)
 * @param out length >= 4; on return out[0] = T (K), out[1] = F_eq, out[2] = dT/du, out[3] = dF/du (1/K)
 */
export function nodeStateFromU(tb: NodeMeltTable, i: number, uK: number, fGuess: number, out: Float64Array): void {
  solveNode(tb, i, uK, U_LATENT_SCALE_K, fGuess, out);
}

/**
 * Equilibrium state at node i for a given temperature: F_eq(T, P_i, X_bulk), with the same outputs
 * as nodeStateFromU (dT/du and dF/du at that state), so u = T + c_u out[1].
 *
 * @param tK temperature, K
 * @param fGuess previous melt fraction at this node (starting point of the solve)
 * @param out length >= 4; out[0] = T (K), out[1] = F_eq, out[2] = dT/du, out[3] = dF/du (1/K)
 */
export function nodeStateFromT(tb: NodeMeltTable, i: number, tK: number, fGuess: number, out: Float64Array): void {
  solveNode(tb, i, tK, 0, fGuess, out);
  out[0] = tK;
}

/**
 * Solve T_eq(F) + cEff F = target for F in [0, 1] (cEff = c_u: target is u; cEff = 0: target is T)
 * by Newton steps kept inside a shrinking bracket (bisection when a step leaves it; T_eq may have a
 * zero or infinite slope at the solidus and at cpx exhaustion).
 */
function solveNode(tb: NodeMeltTable, i: number, target: number, cEff: number, fGuess: number, out: Float64Array): void {
  const c = U_LATENT_SCALE_K;
  if (!(target > tb.tWetSolK[i])) {
    out[0] = target;
    out[1] = 0;
    out[2] = 1;
    out[3] = 0;
    return;
  }
  const p = tb.params;
  const curves = tb.curves[i];
  const x0 = tb.bulkWaterWtPct;
  const d = p.D_H2O;
  const xSat = tb.xSatWtPct[i];
  // h(F) = T_eq(F) + cEff F - target; h(0) < 0 here. slope[0] receives dT_eq/dF.
  const hAt = (f: number, slope: Float64Array): number => {
    const tEff = dryTempFromCurves(f, curves, p);
    let s = dryTempSlopeFromCurves(f, tEff, curves, p);
    let t = tEff;
    if (x0 > 0) {
      const den = d + f * (1 - d);
      const xu = x0 / den;
      const x = xu < xSat ? xu : xSat;
      const dep = waterDepressionC(x, p);
      t -= dep;
      // dT_eq/dF gains -d(dep)/dF = gamma dep (1 - D) / (D + F (1 - D)) while unsaturated
      if (xu < xSat) s += (p.gamma * dep * (1 - d)) / den;
    }
    slope[0] = s;
    return t + KELVIN_OFFSET + cEff * f - target;
  };
  const slope = out;
  if (hAt(1, slope) <= 0) {
    // above the liquidus: fully molten, the rest is sensible heat
    out[0] = target - cEff;
    out[1] = 1;
    out[2] = 1;
    out[3] = 0;
    return;
  }
  let lo = 0;
  let hi = 1;
  let f = fGuess > 0 && fGuess < 1 ? fGuess : Math.min(0.5, (target - tb.tWetSolK[i]) / (2 * c));
  let tSlope = 0;
  for (let it = 0; it < 200; it++) {
    const h = hAt(f, slope);
    tSlope = slope[0];
    if (h > 0) hi = f;
    else lo = f;
    // with cEff = c_u, h' >= c_u, so |h| < 1e-9 K puts F within 2e-12 of the root
    if (Math.abs(h) < 1e-9 || hi - lo < 1e-14) break;
    let next = f - h / (tSlope + cEff);
    if (!(next > lo && next < hi)) next = 0.5 * (lo + hi);
    f = next;
  }
  out[0] = target - cEff * f;
  out[1] = f;
  if (Number.isFinite(tSlope)) {
    const denom = tSlope + c;
    out[2] = tSlope / denom;
    out[3] = 1 / denom;
  } else {
    out[2] = 1;
    out[3] = 0;
  }
}
