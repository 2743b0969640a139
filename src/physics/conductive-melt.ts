/**
 * Equilibrium melt fraction and its temperature slope at the fixed pressures of a grid, for the
 * Newton iteration of the conductive column.
 *
 * The melting law is Katz, Spiegelman & Langmuir (2003), G-cubed 4(9), 1073, with batch water
 * partitioning and the saturation cap, exactly as `meltFraction` in melting.ts (which stays the
 * reference; a test checks the two agree). The column asks for F and dF/dT at the same few hundred
 * pressures dozens of times, so this module precomputes the pressure-only terms once per node and
 * solves the implicit water equation by a safeguarded Newton iteration started from the previous
 * value at that node, instead of a cold bracketed solve each time.
 */
import {
  drySolidusC,
  fCpxOut,
  lherzLiquidusC,
  liquidusC,
  waterSaturationWtPct,
  wetSolidusC,
} from './melting.js';
import type { MeltParams } from './params.js';

/** Pressure-only terms of the melting law at each grid node (all temperatures in degC). */
export interface NodeMeltTable {
  readonly n: number;
  readonly bulkWaterWtPct: number;
  readonly tSolC: Float64Array;
  /** T_lherz - T_sol, degC */
  readonly spanLherzC: Float64Array;
  readonly fCpx: Float64Array;
  readonly tCpxC: Float64Array;
  /** T_liq - T_cpx_out, degC */
  readonly spanLiqC: Float64Array;
  readonly tLiqC: Float64Array;
  readonly xSatWtPct: Float64Array;
  /** wet solidus (first melt), degC: below it F = 0 */
  readonly tWetSolC: Float64Array;
  readonly beta1: number;
  readonly beta2: number;
  readonly kWater: number;
  readonly gammaWater: number;
  readonly dWater: number;
}

/**
 * Precompute the melting-law terms that depend only on pressure.
 * @param pGpa pressure of each node, GPa
 * @param bulkWaterWtPct bulk water of the source, wt% (batch partitioning)
 */
export function buildNodeMeltTable(pGpa: Float64Array, bulkWaterWtPct: number, p: MeltParams): NodeMeltTable {
  const n = pGpa.length;
  const tSolC = new Float64Array(n);
  const spanLherzC = new Float64Array(n);
  const fCpx = new Float64Array(n);
  const tCpxC = new Float64Array(n);
  const spanLiqC = new Float64Array(n);
  const tLiqC = new Float64Array(n);
  const xSatWtPct = new Float64Array(n);
  const tWetSolC = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const pi = pGpa[i];
    const tSol = drySolidusC(pi, p);
    const span = lherzLiquidusC(pi, p) - tSol;
    const fc = fCpxOut(pi, p);
    const tCpx = Math.pow(fc, 1 / p.beta1) * span + tSol;
    const tLiq = liquidusC(pi, p);
    tSolC[i] = tSol;
    spanLherzC[i] = span;
    fCpx[i] = fc;
    tCpxC[i] = tCpx;
    spanLiqC[i] = tLiq - tCpx;
    tLiqC[i] = tLiq;
    xSatWtPct[i] = waterSaturationWtPct(pi, p);
    tWetSolC[i] = bulkWaterWtPct > 0 ? wetSolidusC(pi, bulkWaterWtPct, p) : tSol;
  }
  return {
    n, bulkWaterWtPct, tSolC, spanLherzC, fCpx, tCpxC, spanLiqC, tLiqC, xSatWtPct, tWetSolC,
    beta1: p.beta1, beta2: p.beta2, kWater: p.K, gammaWater: p.gamma, dWater: p.D_H2O,
  };
}

/**
 * Anhydrous melt fraction at effective temperature tEffC (degC) at node i; writes dF/dT' into
 * slope[0]. Same piecewise law as dryMeltFraction in melting.ts.
 */
function dryAtNode(tb: NodeMeltTable, i: number, tEffC: number, slope: Float64Array): number {
  const dt = tEffC - tb.tSolC[i];
  if (dt <= 0) {
    slope[0] = 0;
    return 0;
  }
  if (tEffC < tb.tCpxC[i]) {
    const span = tb.spanLherzC[i];
    const u = dt / span;
    const f = Math.pow(u, tb.beta1);
    slope[0] = (tb.beta1 * f) / dt;
    return f;
  }
  if (tEffC >= tb.tLiqC[i]) {
    slope[0] = 0;
    return 1;
  }
  const fc = tb.fCpx[i];
  const d2 = tEffC - tb.tCpxC[i];
  if (d2 <= 0) {
    slope[0] = 0;
    return fc;
  }
  const g = Math.pow(d2 / tb.spanLiqC[i], tb.beta2);
  slope[0] = ((1 - fc) * tb.beta2 * g) / d2;
  return fc + (1 - fc) * g;
}

/**
 * Equilibrium melt fraction F(T, P_i, X_bulk) at node i with batch water, and dF/dT.
 *
 * Solves g(F) = F_dry(T + K X_melt(F)^gamma) - F = 0 (Katz et al. 2003, eqs. 16-19). g' <= -1
 * everywhere, so Newton from the previous value converges in a few steps; a bracket [lo, hi]
 * guards the kinks (saturation cap, cpx exhaustion).
 *
 * @param tC temperature, degC
 * @param fGuess previous melt fraction at this node (any value in [0, 1])
 * @param work scratch of length >= 2; on return work[0] = F, work[1] = dF/dT (1/K)
 */
export function nodeMeltFraction(tb: NodeMeltTable, i: number, tC: number, fGuess: number, work: Float64Array): void {
  if (!(tC > tb.tWetSolC[i])) {
    work[0] = 0;
    work[1] = 0;
    return;
  }
  const x0 = tb.bulkWaterWtPct;
  if (x0 <= 0) {
    const f = dryAtNode(tb, i, tC, work);
    work[1] = work[0];
    work[0] = f;
    return;
  }
  wetSolve(tb, i, tC, fGuess, work);
}

function wetSolve(tb: NodeMeltTable, i: number, tC: number, fGuess: number, work: Float64Array): void {
  const x0 = tb.bulkWaterWtPct;
  const d = tb.dWater;
  const xSat = tb.xSatWtPct[i];
  const slope = work;
  let lo = 0;
  let hi = 1;
  let f = fGuess > 0 && fGuess < 1 ? fGuess : 0.5 * (tb.fCpx[i] > 0 ? tb.fCpx[i] : 0.1);
  let gPrime = -1;
  let fDrySlope = 0;
  for (let it = 0; it < 60; it++) {
    const denom = d + f * (1 - d);
    const xUnsat = x0 / denom;
    const saturated = xUnsat >= xSat;
    const x = saturated ? xSat : xUnsat;
    const depression = x > 0 ? tb.kWater * Math.pow(x, tb.gammaWater) : 0;
    const fDry = dryAtNode(tb, i, tC + depression, slope);
    fDrySlope = slope[0];
    // d(depression)/dF = -gamma * depression * (1 - D) / (D + F (1 - D)) while unsaturated
    const dDepdF = saturated ? 0 : (-tb.gammaWater * depression * (1 - d)) / denom;
    const g = fDry - f;
    gPrime = fDrySlope * dDepdF - 1;
    if (g > 0) lo = f;
    else hi = f;
    let next = f - g / gPrime;
    if (!(next > lo && next < hi)) next = 0.5 * (lo + hi);
    const step = Math.abs(next - f);
    f = next;
    if (step < 1e-14 || hi - lo < 1e-14) break;
  }
  work[0] = f;
  // implicit function theorem: dF/dT = F_dry' / (1 - F_dry' dDep/dF) = -F_dry' / g'
  work[1] = -fDrySlope / gPrime;
}
