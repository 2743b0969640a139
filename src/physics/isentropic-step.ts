/**
 * One implicit step of the isentropic melting column (Katz, Spiegelman & Langmuir 2003, G-cubed
 * 4(9), 1073, appendix; project physics reference), stepping in F rather than T. At the new pressure
 * P1 the temperature on the melting curve is explicit in F, T(F, P1) = T'(F, P1) - K X_melt(F)^gamma
 * (tempForMeltFractionC), so the discrete entropy balance
 *
 *   R(F1) = c_P ln(T(F1,P1)/T0) + (alpha/rho)_mix((F0+F1)/2) |P1-P0| + dS (F1 - F0) = 0
 *
 * (T in K, P in Pa) is one scalar equation, increasing in F1, solved by Newton's method inside a
 * bracket. Water in the melt follows the batch law, or for fractional melting the exact solution of
 * (1-F) dX_res = (X_res - X_melt) dF over the step, so no nested solve is needed.
 */
import {
  createMeltingCurves,
  dryTempFromCurves,
  dryTempPressureSlope,
  dryTempSlopeFromCurves,
  powNonNeg,
  waterDepressionC,
  waterSaturationSlope,
  type MeltingCurves,
} from './melting.js';
import type { MeltParams } from './params.js';
import type { WaterMode } from './types.js';
import { KELVIN_OFFSET, PA_PER_GPA } from './units.js';

/**
 * Newton correction (melt fraction) below which the per-step solve accepts F + dF, updating T to
 * first order: the error left is of order dF^2 (quadratic convergence). Measured effect on the
 * aggregates against a 1e-12 tolerance: < 1e-6 relative, far below the step discretisation error.
 */
const TOL_DF = 1e-7;
/** Bracket width (melt fraction) at which the per-step solve stops regardless. */
const TOL_F = 1e-14;
/** Iteration cap per step; the bisection fallback halves the bracket whenever Newton leaves it. */
const MAX_ITER = 100;

/**
 * State of one column integration. One instance per column; the hot loop reuses its fields, so a
 * step allocates nothing. Not shared between columns or threads. Usage per step: set the per-step
 * constants (curves at P1, xs, xsPath, dPPa, f0, t0K, logT0, xr0), call solveStep, read f1, t1K,
 * onCurve and the water state (xm, xr, sat) at F1, then slopes() for dF/dP there.
 */
export class IsentropicStepper {
  readonly curves: MeltingCurves = createMeltingCurves();
  readonly fractional: boolean;
  readonly x0: number;
  readonly D: number;
  readonly expUnsat: number;
  readonly aSolid: number;
  readonly aDiff: number;
  // per-step constants
  /** water saturation at the new pressure, wt% (Infinity when certainly not reached) */
  xs = 0;
  /** water saturation governing the residue within the step (mid-pressure; fractional mode), wt% */
  xsPath = 0;
  dPPa = 0;
  f0 = 0;
  t0K = 0;
  logT0 = 0;
  /** residue water at the start of the step (fractional), wt% of residue */
  xr0 = 0;
  // outputs of the last residual evaluation
  tK = 0;
  tEff = 0;
  dTdF = 0;
  dep = 0;
  xm = 0;
  /** dX_melt/dF at fixed P */
  dxm = 0;
  /** whether X_melt sits at saturation (then it moves with P) */
  sat = false;
  xr = 0;
  dR = 0;
  /** melt fraction and saturation state of the last residual evaluation */
  fEval = 0;
  satEval = false;

  constructor(
    readonly p: MeltParams,
    mode: WaterMode,
    bulkWaterWtPct: number,
  ) {
    this.fractional = mode === 'fractional';
    this.x0 = bulkWaterWtPct;
    this.D = p.D_H2O;
    this.expUnsat = 1 / p.D_H2O - 1;
    this.aSolid = p.alpha_s / p.rho_s;
    this.aDiff = p.alpha_f / p.rho_f - p.alpha_s / p.rho_s;
  }

  /** Water in the melt at trial melt fraction f (sets xm, xr, sat); returns dX_melt/dF. */
  meltWater(f: number): number {
    const D = this.D;
    const xs = this.xs;
    if (!this.fractional) {
      const den = D + f * (1 - D);
      const xu = this.x0 / den;
      if (xu < xs) {
        this.xm = xu;
        this.sat = false;
        return (-xu * (1 - D)) / den;
      }
      this.xm = xs;
      this.sat = true;
      return 0;
    }
    // residue water at f: the exact solution of (1-F) dX_res = (X_res - X_melt) dF from the start of
    // the step, with the saturation of the step's mid-pressure (second order in the step)
    const xsE = this.xsPath;
    const f0 = this.f0;
    const xr0 = this.xr0;
    let xr: number;
    let dxr: number;
    if (xr0 <= D * xsE) {
      // unsaturated from the start of the step: Rayleigh
      xr = xr0 * powNonNeg((1 - f) / (1 - f0), this.expUnsat);
      dxr = (-this.expUnsat * xr) / (1 - f);
    } else {
      // saturated at the start: X_melt = X_sat until X_res falls to D X_sat at F_c (if it does)
      const oneMinusFc = xr0 < xsE ? ((xsE - xr0) * (1 - f0)) / ((1 - D) * xsE) : 0;
      if (1 - f >= oneMinusFc) {
        const c = ((xr0 - xsE) * (1 - f0)) / (1 - f);
        xr = xsE + c;
        dxr = c / (1 - f);
      } else {
        xr = D * xsE * powNonNeg((1 - f) / oneMinusFc, this.expUnsat);
        dxr = (-this.expUnsat * xr) / (1 - f);
      }
    }
    this.xr = xr;
    // the melt at the new pressure is capped by the saturation there
    if (xr / D < xs) {
      this.xm = xr / D;
      this.sat = false;
      return dxr / D;
    }
    this.xm = xs;
    this.sat = true;
    return 0;
  }

  /**
   * Water removed with the melt per unit mass of source between f0 and f (fractional mode), wt%:
   * int X_melt dF over the step, evaluated from its own closed form (not from the residue), so that
   * extracted + residue = initial is a real check of the two formulas.
   */
  extractedIncrement(f: number): number {
    const D = this.D;
    const xs = this.xsPath;
    const f0 = this.f0;
    const xr0 = this.xr0;
    if (f <= f0) return 0;
    if (xr0 <= D * xs) return xr0 * (1 - f0) * (1 - powNonNeg((1 - f) / (1 - f0), 1 / D));
    const oneMinusFc = xr0 < xs ? ((xs - xr0) * (1 - f0)) / ((1 - D) * xs) : 0;
    if (1 - f >= oneMinusFc) return xs * (f - f0);
    const fc = 1 - oneMinusFc;
    return xs * (fc - f0) + D * xs * oneMinusFc * (1 - powNonNeg((1 - f) / oneMinusFc, 1 / D));
  }

  /** Discrete entropy residual R(f) at the new pressure (sets tK, tEff, dTdF, dep, xm, dxm, sat, xr, dR). */
  residual(f: number): number {
    const p = this.p;
    this.fEval = f;
    const tEff = dryTempFromCurves(f, this.curves, p);
    let dTdF = dryTempSlopeFromCurves(f, tEff, this.curves, p);
    let tC = tEff;
    let dep = 0;
    if (this.x0 > 0) {
      const dxm = this.meltWater(f);
      this.dxm = dxm;
      const xm = this.xm;
      if (xm > 0) {
        dep = waterDepressionC(xm, p);
        tC -= dep;
        dTdF -= (p.gamma * dep * dxm) / xm;
      }
    } else {
      this.xm = 0;
      this.xr = 0;
      this.dxm = 0;
      this.sat = false;
    }
    const tK = tC + KELVIN_OFFSET;
    this.satEval = this.sat;
    this.tK = tK;
    this.tEff = tEff;
    this.dep = dep;
    this.dTdF = dTdF;
    this.dR = (p.c_P * dTdF) / tK + 0.5 * this.aDiff * this.dPPa + p.dS;
    return p.c_P * (Math.log(tK) - this.logT0) + (this.aSolid + 0.5 * (this.f0 + f) * this.aDiff) * this.dPPa + p.dS * (f - this.f0);
  }

  /**
   * Slope dF/dP (1/GPa) of the isentrope through the state of the last residual evaluation, from the
   * continuous entropy relation: dF/dP = ((alpha/rho)_mix - (c_P/T) dT/dP|_F) / ((c_P/T) dT/dF|_P + dS).
   * Sets wP = dW/dP, W the water carried by the melt per unit mass of source (wt%/GPa).
   * Used only for the end corrections of the quadrature; may be non-finite at singular points.
   */
  slopes(f: number, pGpa: number): number {
    const p = this.p;
    let tP = dryTempPressureSlope(f, this.tEff, pGpa, this.curves, p);
    let xmP = 0;
    if (this.sat && this.xm > 0) {
      xmP = waterSaturationSlope(pGpa, p);
      tP -= ((p.gamma * this.dep) / this.xm) * xmP;
    }
    const fP =
      ((this.aSolid + f * this.aDiff) * PA_PER_GPA - (p.c_P * tP) / this.tK) / ((p.c_P * this.dTdF) / this.tK + p.dS);
    this.wP = this.fractional ? this.xm * fP : (this.xm + f * this.dxm) * fP + f * xmP;
    return fP;
  }

  /** the water-integrand slope set by slopes() */
  wP = 0;

  // result of solveStep
  f1 = 0;
  t1K = 0;
  onCurve = true;

  /**
   * Solve the step whose constants are set: find F1 in [F0, fHi] with R(F1) = 0 by Newton's method
   * inside a bracket, falling back to bisection when Newton leaves it. `guess` is a predicted F1
   * (NaN for none); `tolDf` the Newton correction at which F + dF is accepted (default TOL_DF).
   * Sets f1, t1K, onCurve, and leaves xm, xr, sat at F1.
   *
   * R is increasing in F. R(F0) >= 0 means the melting curve at F0 lies above the decompressed
   * assemblage: no new melt this step (F held, the assemblage follows its own adiabat). R(fHi) < 0
   * means even the liquidus is too cold for the column's entropy: fully molten, off the curve.
   * R(F0) is evaluated only when needed: with no guess, or when Newton heads below F0.
   */
  solveStep(guess: number, fHi: number, tolDf: number = TOL_DF): void {
    const p = this.p;
    const f0 = this.f0;
    let lo = f0;
    let hi = fHi;
    let loKnown = false; // R(lo) < 0 established
    let hiKnown = false; // R(hi) > 0 established
    let f = guess;
    if (!(f > f0 && f < fHi)) {
      const r0 = this.residual(f0);
      if (!(r0 < 0)) return this.hold(r0);
      loKnown = true;
      // R(F) - R(F0) >= (dS + min(0, aDiff dP / 2)) (F - F0) because T(F) rises with F: an upper bound
      const minSlope = p.dS + Math.min(0, 0.5 * this.aDiff * this.dPPa);
      if (minSlope > 0 && f0 - r0 / minSlope < fHi) {
        hi = f0 - r0 / minSlope;
        hiKnown = true;
      }
      // T - T(F0) ~ (T_lherz - T_sol) (F^(1/beta1) - F0^(1/beta1)) alone over-shoots the root
      const c = this.curves;
      const u0 = Math.pow(f0, 1 / p.beta1) + (-r0 * this.t0K) / (p.c_P * (c.tLherzC - c.tSolC));
      f = u0 > 0 ? Math.pow(u0, p.beta1) : 0.5 * (lo + hi);
      if (!(f > lo && f < hi)) f = 0.5 * (lo + hi);
    }
    let r = Number.NaN;
    for (let it = 0; it < MAX_ITER; it++) {
      r = this.residual(f);
      if (r < 0) {
        lo = f;
        loKnown = true;
      } else if (r > 0) {
        hi = f;
        hiKnown = true;
      } else if (r === 0) {
        return this.accept(f, 0);
      } else {
        throw new Error(`isentropic path: entropy residual is not finite at F = ${f}`);
      }
      const d = -r / this.dR;
      const fn = f + d;
      if (Math.abs(d) <= tolDf && fn >= lo && fn <= hi) return this.accept(f, d);
      if (hi - lo <= TOL_F) break;
      if (fn > lo && fn < hi) {
        f = fn;
        continue;
      }
      if (!loKnown) {
        const r0 = this.residual(f0);
        if (!(r0 < 0)) return this.hold(r0);
        loKnown = true;
      }
      f = 0.5 * (lo + hi);
    }
    if (r < 0 && !hiKnown && f >= fHi - 1e-12) {
      this.residual(fHi);
      this.f1 = fHi;
      this.t1K = this.offCurveTempK(fHi);
      this.onCurve = false;
      return;
    }
    this.residual(f);
    this.accept(f, 0);
  }

  /** Accept F1 = f + d from the evaluation at f, with T updated to first order in d. */
  private accept(f: number, d: number): void {
    this.f1 = f + d;
    this.t1K = this.tK + this.dTdF * d;
    if (d !== 0 && this.x0 > 0) this.dxm = this.meltWater(f + d);
    this.onCurve = true;
  }

  /** No new melt this step (R(F0) = r0 >= 0, evaluated last so xm, xr are at F0). */
  private hold(r0: number): void {
    if (Number.isNaN(r0)) throw new Error('isentropic path: entropy residual is not finite');
    this.f1 = this.f0;
    this.t1K = this.offCurveTempK(this.f0);
    this.onCurve = false;
  }

  /** Temperature (K) after the step off the melting curve: F goes from f0 to f with no solve. */
  offCurveTempK(f: number): number {
    const p = this.p;
    const mix = (this.aSolid + 0.5 * (this.f0 + f) * this.aDiff) * this.dPPa;
    return this.t0K * Math.exp(-(mix + p.dS * (f - this.f0)) / p.c_P);
  }
}
