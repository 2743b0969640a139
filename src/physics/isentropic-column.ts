/**
 * Isentropic decompression melting column (Katz, Spiegelman & Langmuir 2003, G-cubed 4(9), 1073,
 * appendix; project physics reference). The solid rises on its adiabat to the onset of melting, then
 * melts along a path of constant entropy
 *
 *   (c_P / T) dT - (alpha/rho)_mix dP + dS dF = 0,   (alpha/rho)_mix = F alpha_f/rho_f + (1-F) alpha_s/rho_s
 *
 * (T in K, P in Pa) up to the base of the lid. Each pressure step is implicit and steps in F, not T
 * (isentropic-step.ts): at the new pressure the temperature on the melting curve is explicit in F,
 * so the discrete entropy balance
 *
 *   R(F1) = c_P ln(T(F1,P1)/T0) + (alpha/rho)_mix((F0+F1)/2) |P1-P0| + dS (F1 - F0) = 0
 *
 * is one scalar equation, solved by a bracketed (safeguarded) Newton iteration from a Taylor
 * predictor. The log form integrates c_P/T dT exactly and the mixture term is exact for F linear
 * across the step, so the scheme has no drift and is second order in the step.
 *
 * Melt is not refrozen: F never decreases along the path. Where the melting curve at the current F
 * rises faster on decompression than the assemblage cools (R(F0) >= 0, e.g. near the surface when
 * water leaves a saturated melt), F is held and the assemblage follows its own adiabat for that step.
 *
 * Water: `batch` keeps the source water in the system (X_melt = X_bulk / (D + F(1-D)), capped at
 * saturation); `fractional` removes water with every melt increment, with residue water X_res and
 * melt water X_melt = min(X_res / D, X_sat(P)) obeying (1-F) dX_res = (X_res - X_melt) dF. Within a
 * step X_res(F) is the exact solution of that equation from the start of the step with X_sat held at
 * its mid-step value (Rayleigh, X_res ~ (1-F)^(1/D-1), while unsaturated; a saturated stretch and the
 * switch between the two are solved analytically), and the melt at the new pressure is capped by
 * X_sat there, so T stays explicit in F. The water leaving with the melt is integrated from its own
 * closed form, so extracted + residue = initial is an independent check.
 *
 * Aggregates: int F dP and int W dP (W = water carried by the melt per unit mass of source) use the
 * trapezoid rule with cubic (Hermite) end corrections from dF/dP of the entropy relation at every
 * point; the first interval, where F ~ (P_onset - P)^beta1, uses a fit of that form. The profile
 * runs from the onset (F = 0, on the solid adiabat) to the top; the solid adiabat below the onset is
 * not included (it is adiabatTempC).
 */
import { adiabatTempK } from './adiabat.js';
import { IsentropicStepper } from './isentropic-step.js';
import { setMeltingCurves, waterSaturationLowerBound, waterSaturationSlope, waterSaturationWtPct } from './melting.js';
import { cappedStart, type PathStart } from './capped-onset.js';
import { checkColumnInputs } from './column-inputs.js';
import { beyondRangeReason, findMeltOnset } from './onset.js';
import { onsetIntervalIntegral, type IsentropicPath } from './isentropic-path.js';
import { DEFAULT_TOLERANCE, integrateIsentropicPathAdaptive, TOLERANCE_MAX, TOLERANCE_MIN } from './isentropic-adaptive.js';
import type { MeltParams } from './params.js';
import { failedResult, meltingResult, noMeltResult, onsetBeyondRangeResult } from './column-result.js';
import { MODEL_MAX_P_GPA, type ColumnProfile, type ColumnResult, type ModelOptions, type Scenario, type WaterMode } from './types.js';
import { depthKmFromPGpa, KELVIN_OFFSET, PA_PER_GPA, pGpaFromDepthKm, wtPctFromPpm } from './units.js';

export type { IsentropicPath } from './isentropic-path.js';

/** Default isentropic pressure step, GPa (used when a step is asked for without a value). */
export const DEFAULT_STEP_GPA = 0.05;

/**
 * Integrate the isentropic melting path from the onset pressure (F = 0, T on the solid adiabat) up
 * to topPGpa in steps of stepGpa, the final partial step landing exactly on topPGpa.
 *
 * @param tpC mantle potential temperature, degC
 * @param bulkWaterWtPct bulk water of the source, wt%
 * @param onsetPGpa pressure where melting starts, GPa (> topPGpa)
 * @param topPGpa pressure where melting stops (base of the lid), GPa
 * @param mode water mode: batch or fractional
 * @param p parameter set
 * @param stepGpa pressure step, GPa (default DEFAULT_STEP_GPA)
 * @param withProfile also return the arrays along the path (the only allocation proportional to steps)
 * @param start state at onsetPGpa when melting is already under way there (a capped onset,
 *   capped-onset.ts); absent: F = 0 on the solid adiabat
 */
export function integrateIsentropicPath(
  tpC: number,
  bulkWaterWtPct: number,
  onsetPGpa: number,
  topPGpa: number,
  mode: WaterMode,
  p: MeltParams,
  stepGpa: number = DEFAULT_STEP_GPA,
  withProfile = false,
  start?: PathStart,
): IsentropicPath {
  const span = onsetPGpa - topPGpa;
  if (!(span > 0)) throw new Error(`isentropic path: onset ${onsetPGpa} GPa is not below top ${topPGpa} GPa`);
  if (!(stepGpa > 0 && Number.isFinite(stepGpa))) throw new Error(`isentropic path: step ${stepGpa} GPa must be positive`);
  // full steps, then one partial step onto the top; a remainder below 1e-9 of a step is merged
  const nSteps = Math.max(1, Math.ceil(span / stepGpa - 1e-9));

  const s = new IsentropicStepper(p, mode, bulkWaterWtPct);
  const fHi = s.fractional ? 1 - 1e-12 : 1;
  const D = p.D_H2O;
  const x0 = bulkWaterWtPct;

  const fStart = start?.f ?? 0;
  let f0 = fStart;
  let t0K = start?.tK ?? adiabatTempK(tpC, onsetPGpa, p);
  let xr0 = start?.xResidueWtPct ?? x0;
  const xs0 = waterSaturationWtPct(onsetPGpa, p);
  let xm0 = start?.xMeltWtPct ?? (x0 > 0 ? Math.min(x0 / D, xs0) : 0);
  let w0 = start?.waterExtractedWtPct ?? 0; // water carried by the melt per unit mass of source
  let meltInt = 0;
  let waterInt = 0;
  let fMax = fStart;
  let lastDf = 0;
  let lastDp = 0;
  let fpPrev = Number.NaN;
  // dF/dP and dW/dP at the start of the step, for the cubic (Hermite) end corrections of the
  // trapezoid: int_a^b y dP = h (y_a + y_b)/2 + h^2 (y'_a - y'_b)/12 + O(h^5)
  setMeltingCurves(s.curves, onsetPGpa, p);
  s.xs = xs0;
  s.xsPath = xs0;
  s.f0 = fStart;
  s.xr0 = xr0;
  s.dPPa = 0;
  s.logT0 = Math.log(t0K);
  s.residual(fStart);
  let fp0 = s.slopes(fStart, onsetPGpa);
  let wp0 = s.wP;

  let prof: { p_gpa: Float64Array; depth_km: Float64Array; t_c: Float64Array; f: Float64Array; h2o_melt_wt_pct: Float64Array } | undefined;
  if (withProfile) {
    const n = nSteps + 1;
    prof = { p_gpa: new Float64Array(n), depth_km: new Float64Array(n), t_c: new Float64Array(n), f: new Float64Array(n), h2o_melt_wt_pct: new Float64Array(n) };
    prof.p_gpa[0] = onsetPGpa;
    prof.depth_km[0] = depthKmFromPGpa(onsetPGpa, p.rho_s, p.g);
    prof.t_c[0] = t0K - KELVIN_OFFSET;
    prof.f[0] = fStart;
    prof.h2o_melt_wt_pct[0] = xm0;
  }

  let pPrev = onsetPGpa;
  for (let k = 1; k <= nSteps; k++) {
    const p1 = k < nSteps ? onsetPGpa - k * stepGpa : topPGpa;
    const dP = pPrev - p1;
    setMeltingCurves(s.curves, p1, p);
    // X_melt only falls with F within a step, so if its start value is certainly below saturation
    // the cap cannot bite: skip the power function (Infinity = never saturated)
    if (x0 > 0) {
      const xStart = s.fractional ? xr0 / D : x0 / (D + f0 * (1 - D));
      if (xStart <= waterSaturationLowerBound(p1, p)) {
        s.xs = Infinity;
        s.xsPath = Infinity;
      } else {
        s.xs = waterSaturationWtPct(p1, p);
        s.xsPath = s.fractional ? waterSaturationWtPct(0.5 * (pPrev + p1), p) : s.xs;
      }
    }
    s.dPPa = dP * PA_PER_GPA;
    s.f0 = f0;
    s.t0K = t0K;
    s.logT0 = Math.log(t0K);
    s.xr0 = xr0;

    // predictor: the cubic through the last two points with their slopes dF/dP, extrapolated by dP
    // (error O(dP^4)); in x = P0 - P it is F0 + a x + b x^2 + c x^3 with the previous point at -lastDp
    let guess = Number.NaN;
    if (f0 > 0) {
      const a = -fp0;
      const u = a * lastDp - lastDf; // F_prev - F0 + a lastDp, F_prev = F0 - lastDf
      const v = -fpPrev - a;
      const c = (v + (2 * u) / lastDp) / (lastDp * lastDp);
      const b = u / (lastDp * lastDp) + c * lastDp;
      guess = f0 + dP * (a + dP * (b + dP * c));
      if (!Number.isFinite(guess)) guess = f0 - fp0 * dP;
      if (!Number.isFinite(guess)) guess = f0 + (lastDf * dP) / lastDp;
    }
    s.solveStep(guess, fHi);
    const f1 = s.f1;
    const t1K = s.t1K;
    const onCurve = s.onCurve;

    // water at the end of the step (s.xm, s.xr hold the values of the last evaluation, at f1)
    let w1: number;
    let xm1: number;
    if (x0 > 0) {
      xm1 = s.xm;
      if (s.fractional) {
        w1 = w0 + s.extractedIncrement(f1);
        xr0 = s.xr;
      } else {
        w1 = f1 * xm1;
      }
    } else {
      xm1 = 0;
      w1 = 0;
    }

    // slopes at the new point: on the melting curve from the entropy relation; off it F is constant
    let fp1 = 0;
    let wp1 = 0;
    if (onCurve) {
      fp1 = s.slopes(f1, p1);
      wp1 = s.wP;
    } else if (!s.fractional && s.sat && s.xm > 0) {
      wp1 = f1 * waterSaturationSlope(p1, p); // batch with F held: W = F X_sat(P)
    }
    if (k === 1 && fStart === 0 && onCurve && p.beta1 > 1 && Number.isFinite(fp1) && Number.isFinite(wp1)) {
      // onset interval: F (and W) start as a Delta^beta1 + b Delta^(2 beta1 - 1), Delta = P_onset - P
      // (T - T_solidus ~ F^(1/beta1) + F); fit both terms to the value and slope at the step end
      meltInt += onsetIntervalIntegral(f1, -fp1, dP, p.beta1);
      waterInt += onsetIntervalIntegral(w1, -wp1, dP, p.beta1);
    } else {
      meltInt += 0.5 * (f0 + f1) * dP;
      waterInt += 0.5 * (w0 + w1) * dP;
      // end corrections only where both slopes are usable (not across a singular point)
      const dP2 = (dP * dP) / 12;
      const cf = dP2 * (fp1 - fp0);
      if (Number.isFinite(cf)) meltInt += cf;
      const cw = dP2 * (wp1 - wp0);
      if (Number.isFinite(cw)) waterInt += cw;
    }
    fpPrev = onCurve && f0 > 0 ? fp0 : Number.NaN;
    fp0 = fp1;
    wp0 = wp1;
    if (f1 > fMax) fMax = f1;
    lastDf = f1 - f0;
    lastDp = dP;
    f0 = f1;
    t0K = t1K;
    w0 = w1;
    xm0 = xm1;
    pPrev = p1;
    if (prof !== undefined) {
      prof.p_gpa[k] = p1;
      prof.depth_km[k] = depthKmFromPGpa(p1, p.rho_s, p.g);
      prof.t_c[k] = t1K - KELVIN_OFFSET;
      prof.f[k] = f1;
      prof.h2o_melt_wt_pct[k] = xm1;
    }
  }

  const residueWaterWtPct = x0 > 0 ? (s.fractional ? xr0 : f0 < 1 ? (x0 - f0 * xm0) / (1 - f0) : 0) : 0;
  const path: IsentropicPath = {
    steps: nSteps,
    fTop: f0,
    fMax,
    tTopC: t0K - KELVIN_OFFSET,
    meltIntegralGpa: meltInt,
    waterIntegralWtPctGpa: waterInt,
    waterExtractedWtPct: w0,
    residueWaterWtPct,
  };
  return prof === undefined ? path : { ...path, profile: prof };
}

/**
 * One isentropic column: solid adiabat from Tp, onset of melting (findMeltOnset), isentropic
 * ascent to the base of the lid (integrateIsentropicPath), aggregates by meltingResult.
 * Expected problems give a `failed` row with a reason; an unexpected exception escapes to meltColumn,
 * the physics' one never-throw guard.
 *
 * @param scenario tp_c (degC), water_ppm (ppm), lid_km (km), upwelling_mm_yr (mm/yr or NaN;
 *   used only for melt_flux_kg_m2_yr)
 * @param model water mode, parameters, stepGpa (fixed step, GPa) or else tolerance (relative, default
 *   1e-4, error-controlled: isentropic-adaptive.ts), withProfile
 */
export function isentropicColumn(scenario: Scenario, model: ModelOptions): ColumnResult {
  const p = model.params;
  const { tp_c: tpC, water_ppm: waterPpm } = scenario;
  const checked = checkColumnInputs(scenario, p);
  if (!checked.ok) return failedResult(checked.reason);
  if (model.water !== 'batch' && model.water !== 'fractional') return failedResult(`unknown water mode ${String(model.water)}`);
  // an explicit step is the fixed-step path (as before tolerances existed); else error control
  const stepGpa = model.stepGpa;
  if (stepGpa !== undefined && !(Number.isFinite(stepGpa) && stepGpa > 0)) return failedResult(`step must be a positive number of GPa, got ${String(stepGpa)}`);
  const tolerance = model.tolerance ?? DEFAULT_TOLERANCE;
  if (stepGpa === undefined && !(tolerance >= TOLERANCE_MIN && tolerance <= TOLERANCE_MAX)) {
    return failedResult(`tolerance must be a number in ${TOLERANCE_MIN}-${TOLERANCE_MAX}, got ${String(tolerance)}`);
  }

  const x0 = wtPctFromPpm(waterPpm);
  const pTop = checked.pLidGpa;
  const onset = findMeltOnset(tpC, x0, pTop, p);
  if (onset.kind === 'none') return noMeltResult(scenario.upwelling_mm_yr);
  if (onset.kind === 'beyond' && model.deepOnset !== 'cap') return onsetBeyondRangeResult(beyondRangeReason(onset));
  // a capped onset starts melted at the deepest covered pressure (capped-onset.ts)
  const start = onset.kind === 'beyond' ? cappedStart(tpC, x0, onset.pMaxGpa, model.water, p) : undefined;
  const onsetPGpa = onset.kind === 'beyond' ? onset.pMaxGpa : onset.pGpa;
  const path =
    stepGpa !== undefined
      ? integrateIsentropicPath(tpC, x0, onsetPGpa, pTop, model.water, p, stepGpa, model.withProfile === true, start)
      : integrateIsentropicPathAdaptive(tpC, x0, onsetPGpa, pTop, model.water, p, tolerance, model.withProfile === true, start);
  return meltingResult(
    {
      onsetPGpa,
      ...(start === undefined ? {} : { fOnset: start.f }),
      topPGpa: pTop,
      fMax: path.fMax,
      fTop: path.fTop,
      tTopC: path.tTopC,
      meltIntegralGpa: path.meltIntegralGpa,
      waterIntegralWtPctGpa: path.waterIntegralWtPctGpa,
      surfaceHeatFlowMwM2: null,
      profile: path.profile,
    },
    scenario,
    p,
  );
}
