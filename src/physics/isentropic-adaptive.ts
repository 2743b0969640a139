/**
 * Error-controlled integration of the isentropic melting path (the same implicit step in F as the
 * fixed-step path, isentropic-step.ts; physics in isentropic-column.ts and the project physics
 * reference), with a relative tolerance instead of a pressure step.
 *
 * Error estimate (predictor-corrector, Milne's device): every step is first predicted explicitly,
 * F and W (water carried by the melt per unit mass of source) from the Hermite cubic through the
 * last two points with their slopes dF/dP, dW/dP (local error O(h^4)); then solved implicitly (the
 * corrector). The corrector's only discretisation error is the trapezoid rule in the small mixture
 * term of the entropy balance, (alpha_f/rho_f - alpha_s/rho_s) int F dP: it is two orders smaller,
 * so |predicted - solved| is a safe over-estimate of the path error, and it measures how well a
 * cubic follows the path over the step, which is what the Hermite-corrected trapezoid quadrature of
 * int F dP and int W dP needs. It costs nothing: the prediction is the Newton start anyway. A step
 * is accepted when that gap is below tolerance x max(F, F floor) (and likewise for W); the next
 * step is h (tol / gap)^(1/(q+1)) (q the order of the predictor), within [0.2 h, 4 h] and at most
 * H_MAX_GPA. Right after the onset F = a Delta^beta1 + b Delta^(2 beta1 - 1) (Delta = P_onset - P)
 * is the predictor; right after a kink, the straight line with the one-sided slope.
 *
 * Kinks are located, not stepped over: where a step crosses one, the pressure of the kink is found
 * by root finding (Illinois regula falsi on an event function evaluated by trial steps from the
 * start of the step, bisection where the function is not smooth) to EVENT_TOL_GPA, the path steps
 * exactly onto its near side and then across it in a step of at most EVENT_TOL_GPA, so every
 * quadrature interval is smooth and carries its own one-sided slopes:
 * - melting stops: dF/dP changes sign (near the surface, where the water saturation
 *   X_sat = chi1 P^lambda + chi2 P falls faster than melting can follow); F is then held and the
 *   assemblage follows its own adiabat, exactly, until melting resumes (event: the entropy residual
 *   at the held F changes sign);
 * - water saturation of the melt starts or ends;
 * - clinopyroxene is exhausted (F crosses F_cpx_out(P));
 * - the lid: the last step lands on it.
 * While F is held in batch mode with a saturated melt, W = F X_sat(P) is integrated in closed form.
 */
import { adiabatTempK } from './adiabat.js';
import type { PathStart } from './capped-onset.js';
import { onsetIntervalIntegral, type IsentropicPath } from './isentropic-path.js';
import { IsentropicStepper } from './isentropic-step.js';
import { setMeltingCurves, waterSaturationLowerBound, waterSaturationSlope, waterSaturationWtPct } from './melting.js';
import type { MeltParams } from './params.js';
import type { WaterMode } from './types.js';
import { depthKmFromPGpa, KELVIN_OFFSET, PA_PER_GPA } from './units.js';

/** Default relative tolerance of the isentropic column. */
export const DEFAULT_TOLERANCE = 1e-4;
/** Allowed tolerances. */
export const TOLERANCE_MIN = 1e-6;
export const TOLERANCE_MAX = 1e-2;

/** Largest pressure step, GPa (also the spacing at which a held F is checked for melting again). */
export const H_MAX_GPA = 0.5;
/** Smallest step the controller may ask for, GPa; a step this small is accepted whatever its estimate. */
const H_MIN_GPA = 1e-7;
/** Width of the bracket (GPa) to which a kink is located. */
export const EVENT_TOL_GPA = 1e-9;
/** Floor of the melt-fraction scale of the relative error (absolute error allowed where F < floor). */
const F_FLOOR = 1e-3;
/** Floor of the water scale, as a fraction of the bulk water. */
const W_FLOOR = 1e-3;
/** Iteration cap of the event root finding. */
const EVENT_MAX_ITER = 100;

/** Cap on trial steps per column (a guard against a controller that cannot progress). */
const MAX_ATTEMPTS = 20000;

/** Kinds of kink. */
const EV_NONE = 0;
const EV_HOLD = 1; // melting stops
const EV_SAT = 2; // melt water reaches or leaves saturation
const EV_CPX = 3; // cpx exhausted
const EV_RESUME = 4; // held F starts melting again

/**
 * First step above the onset, GPa, for tolerance tol: the two-term power law is exact to the
 * third term, whose relative size grows like Delta^(beta1 - 1) (calibrated, see DEVELOPERS.md).
 */
function firstStepGpa(tol: number): number {
  return Math.min(0.05, 0.001 * Math.cbrt(tol / DEFAULT_TOLERANCE));
}

/** One error-controlled integration; one instance per column, not shared. */
class AdaptiveIntegrator {
  readonly s: IsentropicStepper;
  readonly fHi: number;
  readonly D: number;
  /** Newton correction at which the per-step solve stops: far below the error allowed per step */
  readonly tolDf: number;
  // state at the start of the next step
  p0: number;
  f0 = 0;
  t0K: number;
  logT0: number;
  xr0: number;
  xm0: number;
  w0 = 0;
  fp0: number;
  wp0: number;
  sat0: boolean;
  held = false;
  cpx0 = false; // F at or past cpx exhaustion
  fromOnset = true;
  /** whether the path starts at the onset (F = 0), not from a capped start */
  onsetStart = true;
  /** kind of the kink just crossed: not detected again in the next step (the path may ride along it) */
  skipKind = EV_NONE;
  // history for the cubic predictor (the point before p0, in the same smooth stretch)
  hist = false;
  pm = 0;
  fm = 0;
  fpm = 0;
  wm = 0;
  wpm = 0;
  // aggregates
  meltInt = 0;
  waterInt = 0;
  steps = 0;
  // result of the last attempt
  af1 = 0;
  at1K = 0;
  aOn = true;
  axm = 0;
  axr = 0;
  asat = false;
  aw1 = 0;
  afp1 = 0;
  awp1 = 0;
  aFCpx = 1;
  gF = Number.NaN;
  gW = Number.NaN;
  gq = 0;
  // profile
  prof: { p: number[]; t: number[]; f: number[]; x: number[] } | undefined;

  constructor(
    readonly tpC: number,
    readonly x0: number,
    readonly onsetPGpa: number,
    readonly topPGpa: number,
    readonly p: MeltParams,
    mode: WaterMode,
    readonly tol: number,
    withProfile: boolean,
    start: PathStart | undefined,
  ) {
    const s = new IsentropicStepper(p, mode, x0);
    this.s = s;
    this.fHi = s.fractional ? 1 - 1e-12 : 1;
    this.D = p.D_H2O;
    this.tolDf = 0.1 * tol * F_FLOOR;
    // start: F = 0 on the solid adiabat at the onset, or a state already melting (capped onset)
    const fStart = start?.f ?? 0;
    this.fromOnset = start === undefined;
    this.onsetStart = start === undefined;
    this.f0 = fStart;
    this.p0 = onsetPGpa;
    this.t0K = start?.tK ?? adiabatTempK(tpC, onsetPGpa, p);
    this.logT0 = Math.log(this.t0K);
    this.xr0 = start?.xResidueWtPct ?? x0;
    this.w0 = start?.waterExtractedWtPct ?? 0;
    const xs0 = waterSaturationWtPct(onsetPGpa, p);
    this.xm0 = start?.xMeltWtPct ?? (x0 > 0 ? Math.min(x0 / this.D, xs0) : 0);
    setMeltingCurves(s.curves, onsetPGpa, p);
    s.xs = xs0;
    s.xsPath = xs0;
    s.f0 = fStart;
    s.xr0 = this.xr0;
    s.dPPa = 0;
    s.logT0 = this.logT0;
    s.residual(fStart);
    this.fp0 = s.slopes(fStart, onsetPGpa);
    this.wp0 = s.wP;
    this.sat0 = x0 > 0 && s.sat;
    this.cpx0 = s.curves.fCpx <= 0 || fStart >= s.curves.fCpx;
    if (withProfile) this.prof = { p: [onsetPGpa], t: [this.t0K - KELVIN_OFFSET], f: [fStart], x: [this.xm0] };
  }

  /** Set the stepper's constants for a step from the state at p0 to p1. */
  setup(p1: number): void {
    const s = this.s;
    const p = this.p;
    setMeltingCurves(s.curves, p1, p);
    if (this.x0 > 0) {
      const xStart = s.fractional ? this.xr0 / this.D : this.x0 / (this.D + this.f0 * (1 - this.D));
      if (xStart <= waterSaturationLowerBound(p1, p)) {
        s.xs = Infinity;
        s.xsPath = Infinity;
      } else {
        s.xs = waterSaturationWtPct(p1, p);
        s.xsPath = s.fractional ? waterSaturationWtPct(0.5 * (this.p0 + p1), p) : s.xs;
      }
    }
    s.dPPa = (this.p0 - p1) * PA_PER_GPA;
    s.f0 = this.f0;
    s.t0K = this.t0K;
    s.logT0 = this.logT0;
    s.xr0 = this.xr0;
  }

  /** Predict F and W at p1 (gF, gW; NaN for none) and the predictor's order gq. */
  predict(p1: number): void {
    const dP = this.p0 - p1;
    const f0 = this.f0;
    const w0 = this.w0;
    if (this.held) {
      this.gF = Number.NaN;
      this.gW = Number.NaN;
      this.gq = 0;
      return;
    }
    if (this.hist) {
      // Hermite cubic through (pm, fm, fpm) and (p0, f0, fp0), in x = p0 - P
      const L = this.pm - this.p0;
      this.gF = cubicExtrapolate(f0, -this.fp0, f0 - this.fm, -this.fpm, L, dP);
      this.gW = cubicExtrapolate(w0, -this.wp0, w0 - this.wm, -this.wpm, L, dP);
      this.gq = 3;
      return;
    }
    if (this.steps === 1 && this.onsetStart && this.p.beta1 > 1) {
      // one step above the onset: y = a Delta^m + b Delta^n fitted to the value and slope at p0
      const d1 = this.onsetPGpa - this.p0;
      const d2 = this.onsetPGpa - p1;
      this.gF = powerLawExtrapolate(f0, -this.fp0, d1, d2, this.p.beta1);
      this.gW = powerLawExtrapolate(w0, -this.wp0, d1, d2, this.p.beta1);
      this.gq = 2;
      return;
    }
    this.gF = f0 - this.fp0 * dP;
    this.gW = w0 - this.wp0 * dP;
    this.gq = 1;
  }

  /** Trial step from the state to p1: sets af1, at1K, aOn, axm, axr, asat, aw1, afp1, awp1, aFCpx. */
  attempt(p1: number): void {
    const s = this.s;
    const p = this.p;
    this.setup(p1);
    this.predict(p1);
    const g = this.gF;
    s.solveStep(g > this.f0 && g < this.fHi ? g : Number.NaN, this.fHi, this.tolDf);
    const f1 = s.f1;
    // the solve's last evaluation was at F1 - d (Newton): if that lies on the other side of cpx
    // exhaustion or of saturation, evaluate at F1 itself so that T and the slopes belong to F1's branch
    if (s.onCurve) {
      const fc = s.curves.fCpx;
      // (also where the last Newton correction is not small against F itself: just above the onset)
      const otherBranch = s.fEval < fc !== f1 < fc || (this.x0 > 0 && s.satEval !== s.sat);
      if (otherBranch || Math.abs(f1 - s.fEval) > 1e-3 * this.tol * f1) s.residual(f1);
      // T from the discrete entropy balance at F1 (equal to T on the melting curve at F1 up to the
      // solver's tolerance, and exactly isentropic whichever branch the solver ended on)
      s.t1K = s.offCurveTempK(f1);
    }
    this.af1 = f1;
    this.at1K = s.t1K;
    this.aOn = s.onCurve;
    this.aFCpx = s.curves.fCpx;
    let w1 = 0;
    if (this.x0 > 0) {
      this.axm = s.xm;
      this.asat = s.sat;
      if (s.fractional) {
        w1 = this.w0 + s.extractedIncrement(f1);
        this.axr = s.xr;
      } else {
        w1 = f1 * s.xm;
        this.axr = this.xr0;
      }
    } else {
      this.axm = 0;
      this.axr = 0;
      this.asat = false;
    }
    this.aw1 = w1;
    let fp1 = 0;
    let wp1 = 0;
    if (s.onCurve) {
      fp1 = s.slopes(f1, p1);
      wp1 = s.wP;
    } else if (!s.fractional && s.sat && s.xm > 0) {
      wp1 = f1 * waterSaturationSlope(p1, p);
    }
    this.afp1 = fp1;
    this.awp1 = wp1;
  }

  /** Whether the last attempt left the physical domain (F outside [0, 1], T not finite or not positive). */
  attemptInvalid(): boolean {
    const f = this.af1;
    return !(f >= this.f0 && f <= 1 && this.at1K > 0 && Number.isFinite(this.at1K) && Number.isFinite(this.aw1));
  }

  /** The first kink (kind) between the state and the last attempt, EV_NONE if none. */
  detectEvent(): number {
    const k = this.detectEventKind();
    return k === this.skipKind ? EV_NONE : k;
  }

  private detectEventKind(): number {
    if (this.held) {
      if (this.aOn && this.af1 > this.f0) return EV_RESUME;
      if (this.x0 > 0 && this.asat !== this.sat0) return EV_SAT;
      return EV_NONE;
    }
    // melting stops inside the step (unless it had already stopped at its start: dF/dP > 0 there)
    if (!this.aOn) return this.af1 >= this.fHi || this.fp0 > 0 ? EV_NONE : EV_HOLD;
    if (this.afp1 > 0 && this.f0 > 0 && !(this.fp0 > 0)) return EV_HOLD;
    if (this.x0 > 0 && this.asat !== this.sat0) return EV_SAT;
    if (!this.cpx0 && this.af1 >= this.aFCpx) return EV_CPX;
    return EV_NONE;
  }

  /**
   * Event function of `kind` at pressure pGpa, oriented negative on the state's side; NaN where it
   * is not smooth (a held trial in a melting stretch: bisect). Leaves the attempt at pGpa set.
   */
  eventValue(kind: number, pGpa: number): number {
    if (kind === EV_RESUME) {
      this.setup(pGpa);
      // the entropy residual at the held F: >= 0 while held
      const r = -this.s.residual(this.f0);
      this.attempt(pGpa);
      return r;
    }
    this.attempt(pGpa);
    if (kind === EV_HOLD) return this.aOn ? this.afp1 : Number.NaN;
    if (kind === EV_CPX) return this.af1 - this.aFCpx;
    // saturation: unsaturated melt water minus the saturation at pGpa
    const xs = waterSaturationWtPct(pGpa, this.p);
    const xu = this.s.fractional ? this.axr / this.D : this.x0 / (this.D + this.af1 * (1 - this.D));
    return this.sat0 ? xs - xu : xu - xs;
  }

  /**
   * Locate the kink of `kind` in (pLo, p0), given that the attempt at pLo is past it (value gLo).
   * Returns the near-side pressure; `farP` holds the far side (within EVENT_TOL_GPA).
   */
  farP = 0;
  locate(kind: number, pLo0: number, gLo0: number): number {
    let lo = pLo0; // past the kink
    let gLo = gLo0;
    let hi = this.p0; // state side
    let gHi = Number.NaN;
    let side = 0;
    for (let it = 0; it < EVENT_MAX_ITER && hi - lo > EVENT_TOL_GPA; it++) {
      let x = Number.isFinite(gLo) && Number.isFinite(gHi) && gLo > 0 && gHi < 0 ? (lo * gHi - hi * gLo) / (gHi - gLo) : 0.5 * (lo + hi);
      // keep away from the ends so the bracket shrinks by a useful amount
      const w = hi - lo;
      if (!(x > lo + 0.01 * w && x < hi - 0.01 * w)) x = 0.5 * (lo + hi);
      const g = this.eventValue(kind, x);
      if (g <= 0) {
        hi = x;
        gHi = g;
        if (side === -1 && Number.isFinite(gLo)) gLo *= 0.5;
        side = -1;
      } else {
        // positive or NaN (past the kink)
        lo = x;
        gLo = g;
        if (side === 1 && Number.isFinite(gHi)) gHi *= 0.5;
        side = 1;
      }
    }
    this.farP = lo;
    return hi;
  }

  /** Accept the last attempt (made to p1) as a step: aggregates, state, profile. */
  commit(p1: number, kink: boolean): void {
    const dP = this.p0 - p1;
    const f1 = this.af1;
    const w1 = this.aw1;
    const fp1 = this.afp1;
    const wp1 = this.awp1;
    const beta1 = this.p.beta1;
    if (this.fromOnset && this.aOn && beta1 > 1 && Number.isFinite(fp1) && Number.isFinite(wp1)) {
      this.meltInt += onsetIntervalIntegral(f1, -fp1, dP, beta1);
      this.waterInt += onsetIntervalIntegral(w1, -wp1, dP, beta1);
    } else if (this.held && !this.aOn && !this.s.fractional && this.x0 > 0 && this.sat0 && this.asat) {
      // F held, melt saturated at both ends: W = F X_sat(P), integrated exactly
      this.meltInt += this.f0 * dP;
      this.waterInt += this.f0 * (saturationIntegral(this.p0, this.p) - saturationIntegral(p1, this.p));
    } else {
      this.meltInt += 0.5 * (this.f0 + f1) * dP;
      this.waterInt += 0.5 * (this.w0 + w1) * dP;
      const dP2 = (dP * dP) / 12;
      const cf = dP2 * (fp1 - this.fp0);
      if (Number.isFinite(cf)) this.meltInt += cf;
      const cw = dP2 * (wp1 - this.wp0);
      if (Number.isFinite(cw)) this.waterInt += cw;
    }
    // history for the cubic predictor: only within one smooth melting stretch
    const smooth = !kink && this.aOn && !this.held && !this.fromOnset;
    this.hist = smooth;
    if (smooth) {
      this.pm = this.p0;
      this.fm = this.f0;
      this.fpm = this.fp0;
      this.wm = this.w0;
      this.wpm = this.wp0;
    }
    this.fromOnset = false;
    this.p0 = p1;
    this.f0 = f1;
    if (this.at1K !== this.t0K) {
      this.t0K = this.at1K;
      this.logT0 = Math.log(this.at1K);
    }
    this.xr0 = this.axr;
    this.xm0 = this.axm;
    this.w0 = w1;
    this.fp0 = fp1;
    this.wp0 = wp1;
    this.sat0 = this.asat;
    this.held = !this.aOn;
    this.cpx0 = this.cpx0 || f1 >= this.aFCpx; // sticky: after exhaustion F may ride along F_cpx_out(P)
    this.steps++;
    const prof = this.prof;
    if (prof !== undefined) {
      prof.p.push(p1);
      prof.t.push(this.at1K - KELVIN_OFFSET);
      prof.f.push(f1);
      prof.x.push(this.axm);
    }
  }

  /**
   * Error estimate of the last attempt (made to p1) against the tolerance: predictor-corrector gap,
   * relative to the scale of F and W; <= 1 to accept. 0 where there is no prediction to compare.
   */
  errorRatio(p1: number): number {
    const tol = this.tol;
    const top = this.topPGpa;
    let e = 0;
    if (this.aOn && this.gq > 0 && !this.fromOnset) {
      // scale: the larger of F here and F extrapolated to the top with the local slope, since
      // the outputs are F at the top and integrals over the whole path (an error of tol x F_top
      // near the onset, where F is small, moves them by a fraction tol x (step / span) at most)
      const toTop = p1 - top;
      const fScale = Math.max(this.af1 - this.afp1 * toTop, F_FLOOR);
      const eF = Math.abs(this.gF - this.af1) / (tol * fScale);
      e = Number.isFinite(eF) ? eF : Infinity;
      if (this.x0 > 0) {
        const wScale = Math.max(this.aw1 + Math.abs(this.awp1) * toTop, W_FLOOR * this.x0);
        const eW = Math.abs(this.gW - this.aw1) / (tol * wScale);
        e = Math.max(e, Number.isFinite(eW) ? eW : Infinity);
      }
    }
    return e;
  }

  /** Locate the kink of `kind` seen by the attempt at p1, step onto it and across it. */
  crossKink(kind0: number, p1: number): number {
    let kind = kind0;
    let pLo = p1;
    let gLo = this.eventValueOfLastAttempt(kind, p1);
    for (let guard = 0; guard < 8; guard++) {
      const near = this.locate(kind, pLo, gLo);
      const far = this.farP;
      this.attempt(near);
      // an earlier kink of another kind between the state and `near`? locate that one first
      const other = this.detectEvent();
      if (other !== EV_NONE && near < this.p0 - EVENT_TOL_GPA) {
        kind = other;
        pLo = near;
        gLo = this.eventValueOfLastAttempt(kind, near);
        continue;
      }
      // the step onto the kink is under error control like any other: if it is too long, take a
      // shorter one and meet the kink again from closer (returns the step to try)
      const dNear = this.p0 - near;
      if (dNear > 4 * EVENT_TOL_GPA) {
        const e = this.errorRatio(near);
        if (e > 1) return dNear * Math.max(0.2, 0.9 * stepFactor(e, this.gq));
      }
      if (near < this.p0) this.commit(near, true);
      this.attempt(far);
      if (this.attemptInvalid()) throw new Error(`isentropic path: the step across a kink at ${far} GPa left the physical domain`);
      this.commit(far, true);
      if (kind === EV_CPX) this.cpx0 = true;
      if (kind === EV_HOLD) {
        // F is held from here on (melting stopped; the far side may still be on the curve, past its
        // peak): the path's slopes are those of the held assemblage, not of the curve
        this.fp0 = 0;
        this.wp0 = !this.s.fractional && this.x0 > 0 && this.sat0 ? this.f0 * waterSaturationSlope(far, this.p) : 0;
      }
      this.skipKind = kind;
      return 0;
    }
    throw new Error(`isentropic path: could not separate the kinks near ${p1} GPa`);
  }

  /** The event function of `kind` for the attempt already made at pGpa (positive: past the kink). */
  eventValueOfLastAttempt(kind: number, pGpa: number): number {
    if (kind === EV_HOLD) return this.aOn ? this.afp1 : Number.NaN;
    if (kind === EV_CPX) return this.af1 - this.aFCpx;
    if (kind === EV_RESUME) return 1;
    const xs = waterSaturationWtPct(pGpa, this.p);
    const xu = this.s.fractional ? this.axr / this.D : this.x0 / (this.D + this.af1 * (1 - this.D));
    return this.sat0 ? xs - xu : xu - xs;
  }

  run(): void {
    const top = this.topPGpa;
    const tol = this.tol;
    let h = Math.min(firstStepGpa(tol), this.onsetPGpa - top);
    for (let guard = 0; this.p0 > top; guard++) {
      if (guard > MAX_ATTEMPTS) throw new Error(`isentropic path: no progress at ${this.p0} GPa after ${MAX_ATTEMPTS} trial steps`);
      // land on the top; rather two equal steps than a sliver
      const rem = this.p0 - top;
      const p1 = rem <= h ? top : rem < 1.3 * h ? this.p0 - 0.5 * rem : this.p0 - h;
      this.attempt(p1);
      if (this.attemptInvalid()) {
        if (h <= 1.5 * H_MIN_GPA) throw new Error(`isentropic path: a step at ${this.p0} GPa leaves the physical domain (F ${this.af1}, T ${this.at1K} K)`);
        h = Math.max(0.25 * h, H_MIN_GPA);
        continue;
      }
      const e = this.errorRatio(p1);
      const kind = this.detectEvent();
      const dP = this.p0 - p1;
      if (e > 1 && dP > 1.5 * H_MIN_GPA && kind === EV_NONE) {
        h = Math.max(dP * Math.max(0.2, 0.9 * stepFactor(e, this.gq)), H_MIN_GPA);
        continue;
      }
      if (kind !== EV_NONE && dP > EVENT_TOL_GPA) {
        const retry = this.crossKink(kind, p1);
        // restart small after the kink: the next predictor is a straight line
        h = retry > 0 ? Math.max(retry, H_MIN_GPA) : Math.min(Math.max(dP * 0.1, 1e-4), 0.01);
        continue;
      }
      this.commit(p1, false);
      this.skipKind = EV_NONE;
      const grow = e > 0 ? Math.min(4, Math.max(0.2, 0.9 * stepFactor(e, this.gq))) : 4;
      h = Math.min(dP * grow, H_MAX_GPA);
    }
  }
}

/** e^(-1/(q+1)) for the predictor order q (the step-size rule), without Math.pow for the usual orders. */
function stepFactor(e: number, q: number): number {
  if (q === 3) return 1 / Math.sqrt(Math.sqrt(e));
  if (q === 1) return 1 / Math.sqrt(e);
  return Math.pow(e, -1 / (q + 1));
}

/** Extrapolate the Hermite cubic in x (value y0, slope s0 at x = 0; y0 - yPrev and slope sPrev at x = -L) to x = dx. */
function cubicExtrapolate(y0: number, s0: number, dy: number, sPrev: number, L: number, dx: number): number {
  const a = s0;
  const u = a * L - dy;
  const v = sPrev - a;
  const c = (v + (2 * u) / L) / (L * L);
  const b = u / (L * L) + c * L;
  const g = y0 + dx * (a + dx * (b + dx * c));
  return Number.isFinite(g) ? g : y0 + s0 * dx;
}

/** y(d2) for y = a d^m + b d^n (m = beta, n = 2 beta - 1) through y1 with slope s1 at d1. */
function powerLawExtrapolate(y1: number, s1: number, d1: number, d2: number, beta: number): number {
  const m = beta;
  const n = 2 * beta - 1;
  const bTerm = (s1 * d1 - m * y1) / (n - m);
  const aTerm = y1 - bTerm;
  const r = d2 / d1;
  const g = aTerm * Math.pow(r, m) + bTerm * Math.pow(r, n);
  return Number.isFinite(g) ? g : y1 + s1 * (d2 - d1);
}

/** int_0^P X_sat dP' = chi1 P^(lambda+1)/(lambda+1) + chi2 P^2/2, wt% GPa. */
function saturationIntegral(pGpa: number, p: MeltParams): number {
  if (pGpa <= 0) return 0;
  return (p.chi1 * Math.pow(pGpa, p.lambda + 1)) / (p.lambda + 1) + 0.5 * p.chi2 * pGpa * pGpa;
}

/**
 * Integrate the isentropic melting path from the onset pressure (F = 0, T on the solid adiabat) up
 * to topPGpa with a relative tolerance (see the module comment). Same contract as
 * integrateIsentropicPath; `steps` counts accepted steps, including the steps across kinks.
 *
 * @param tolerance relative tolerance, TOLERANCE_MIN..TOLERANCE_MAX (default DEFAULT_TOLERANCE)
 * @param start state at onsetPGpa when melting is already under way there (a capped onset,
 *   capped-onset.ts); absent: F = 0 on the solid adiabat
 */
export function integrateIsentropicPathAdaptive(
  tpC: number,
  bulkWaterWtPct: number,
  onsetPGpa: number,
  topPGpa: number,
  mode: WaterMode,
  p: MeltParams,
  tolerance: number = DEFAULT_TOLERANCE,
  withProfile = false,
  start?: PathStart,
): IsentropicPath {
  const span = onsetPGpa - topPGpa;
  if (!(span > 0)) throw new Error(`isentropic path: onset ${onsetPGpa} GPa is not below top ${topPGpa} GPa`);
  if (!(tolerance >= TOLERANCE_MIN && tolerance <= TOLERANCE_MAX)) {
    throw new Error(`isentropic path: tolerance ${tolerance} is outside ${TOLERANCE_MIN}-${TOLERANCE_MAX}`);
  }
  const it = new AdaptiveIntegrator(tpC, bulkWaterWtPct, onsetPGpa, topPGpa, p, mode, tolerance, withProfile, start);
  it.run();
  const x0 = bulkWaterWtPct;
  const f0 = it.f0;
  const residueWaterWtPct = x0 > 0 ? (it.s.fractional ? it.xr0 : f0 < 1 ? (x0 - f0 * it.xm0) / (1 - f0) : 0) : 0;
  const path: IsentropicPath = {
    steps: it.steps,
    fTop: f0,
    fMax: f0,
    tTopC: it.t0K - KELVIN_OFFSET,
    meltIntegralGpa: it.meltInt,
    waterIntegralWtPctGpa: it.waterInt,
    waterExtractedWtPct: it.w0,
    residueWaterWtPct,
  };
  const prof = it.prof;
  if (prof === undefined) return path;
  return {
    ...path,
    profile: {
      p_gpa: Float64Array.from(prof.p),
      depth_km: Float64Array.from(prof.p, (v) => depthKmFromPGpa(v, p.rho_s, p.g)),
      t_c: Float64Array.from(prof.t),
      f: Float64Array.from(prof.f),
      h2o_melt_wt_pct: Float64Array.from(prof.x),
    },
  };
}
