/**
 * Steady conductive column: decompression melting of mantle rising at w below a conductive lid,
 * with heat conducted up into the lid (project physics reference, "Upwelling rate and conductive
 * loss (1D steady column)"; advection-diffusion as in Turcotte & Schubert, Geodynamics). Slow
 * upwelling lets the lid cool the top of the melting region, so melting starts as on the adiabat
 * at depth but is cut back near the top and the crust thins (Bown & White 1994, EPSL 121). Fast
 * upwelling gives back the isentropic column.
 *
 * Choices (see also conductive-solver.ts and conductive-grid.ts):
 * - Lid: inside the lid heat only conducts, linearly from T_surface at z = 0; the conductive flux
 *   is continuous at z_lid. With lid_km = 0 the top node is the surface itself, held at T_surface.
 * - Domain: from z_lid down to z_b = max(onset on the adiabat + 10 km, onset + 10 kappa/w,
 *   z_lid + 15 kappa/w) (conductive-grid.ts); there T = Tp[K] exp(m+ z_b), the sub-solidus steady
 *   solution (conductive-far-field.ts), so the column does not depend on z_b. z_b may lie deeper than
 *   the model range (0.1 mm/yr: kappa/w ~ 315 km): nodes deeper than MODEL_MAX_P_GPA never melt.
 * - Melt is extracted as it forms: F is the running maximum of the equilibrium F along the upward
 *   path (no refreezing); latent heat uses that F.
 * - Aggregates: the melting interval runs from the onset (deepest F > 0, interpolated between nodes
 *   on the excess over the wet solidus) up to where melting stops, the shallowest node where F still
 *   increases (meltStopIndex): top_p_gpa / top_depth_km / t_top_c are there, and f_mean and the
 *   productivity are taken over that interval. Above it the extracted F stays at its maximum, and the
 *   crust integral (1/(rho_c g)) int F dP runs up to the lid base: in the passive triangular regime the
 *   apex is where the flow turns (the lid base), and each column contributes the melt it extracted
 *   before turning.
 * - Water: batch mode only. In fractional mode the residue water depends on the whole path and the
 *   node equations lose their local (tridiagonal) structure; such rows fail with
 *   "fractional water is not available with the conductive model".
 * - surface_heat_flow_mw_m2 = k (T(z_lid) - T_s) / z_lid, the conductive flux through the lid
 *   (with no lid, k dT/dz at the surface from the discrete flux balance of the top node).
 */
import { failedResult, meltingResult, type MeltingSummary, noMeltResult, onsetBeyondRangeResult } from './column-result.js';
import { buildConductiveGrid, conductiveBottomM } from './conductive-grid.js';
import { farFieldTempK } from './conductive-far-field.js';
import { buildNodeMeltTable } from './conductive-melt.js';
import { type ConductiveSystem, solveConductiveSystem } from './conductive-solver.js';
import { batchMeltWaterWtPct, wetSolidusC } from './melting.js';
import { checkColumnInputs } from './column-inputs.js';
import { beyondRangeReason, findMeltOnset } from './onset.js';
import type { MeltParams } from './params.js';
import { MODEL_MAX_P_GPA, type ColumnProfile, type ColumnResult, type ModelOptions, type Scenario } from './types.js';
import { depthKmFromPGpa, KELVIN_OFFSET, mPerSFromMmPerYr, PA_PER_GPA, pGpaFromDepthKm, wtPctFromPpm } from './units.js';

/** Default cap on Newton steps per continuation stage. */
export const DEFAULT_CONDUCTIVE_MAX_ITERATIONS = 60;

/** Reason of the rows the conductive model does not compute in fractional water mode. */
export const CONDUCTIVE_FRACTIONAL_REASON = 'fractional water is not available with the conductive model';

/** The solved steady column on its grid, from the lid base (index 0) to the bottom of the domain. */
export interface ConductiveState {
  /** node depths, m */
  readonly zM: Float64Array;
  /** node pressures, GPa */
  readonly pGpa: Float64Array;
  /** temperature, degC */
  readonly tC: Float64Array;
  /** extracted melt fraction (running maximum of fEq from the bottom up) */
  readonly f: Float64Array;
  /** equilibrium melt fraction F(T, P, X_bulk) */
  readonly fEq: Float64Array;
  /** conductive heat flow through the lid, mW/m2 */
  readonly surfaceHeatFlowMwM2: number;
  /** upwelling rate, m/s */
  readonly wMPerS: number;
  /** thermal diffusivity k / (rho_s c_P), m2/s */
  readonly kappaM2S: number;
  /** lid thickness, m */
  readonly lidM: number;
  /** onset of melting on the solid adiabat, GPa (null when the adiabat does not melt below the lid) */
  readonly adiabaticOnsetPGpa: number | null;
  /** melting is under way at the deepest node allowed to melt, at MODEL_MAX_P_GPA (deep_onset: cap) */
  readonly onsetCapped: boolean;
  /** index of the deepest node with F > 0, or -1 */
  readonly onsetIndex: number;
  /** index of the shallowest node where F still increases (melting stops above it), or -1 */
  readonly meltStopIndex: number;
  /** Newton steps taken */
  readonly iterations: number;
}

/** Overrides of the solver's domain (tests of the bottom boundary condition). */
export interface ConductiveDomainOptions {
  /** put the bottom of the domain at least this deep, m */
  readonly minBottomM?: number;
}

/** Outcome of solving the steady column for one scenario. */
export type ConductiveOutcome =
  | { readonly kind: 'solved'; readonly state: ConductiveState }
  | { readonly kind: 'failed'; readonly reason: string }
  | { readonly kind: 'onset_beyond_range'; readonly reason: string };

/**
 * Solve the steady advection-diffusion-melting column for one scenario and return the profile on
 * the solver grid (temperature, extracted and equilibrium melt fraction). Never throws.
 *
 * @param scenario tp_c (degC), water_ppm (ppm, batch water), lid_km (km), upwelling_mm_yr (mm/yr, > 0)
 * @param model params (k, T_surface and the melting law), water mode (batch only),
 *   conductiveResolution (grid refinement, default 1), conductiveMaxIterations (default 60)
 */
export function conductiveProfile(scenario: Scenario, model: ModelOptions, domain: ConductiveDomainOptions = {}): ConductiveOutcome {
  try {
    return solveUnchecked(scenario, model, domain);
  } catch (err) {
    return { kind: 'failed', reason: `conductive column: ${err instanceof Error ? err.message : String(err)}` };
  }
}

function solveUnchecked(scenario: Scenario, model: ModelOptions, domain: ConductiveDomainOptions): ConductiveOutcome {
  const p = model.params;
  const { tp_c: tpC, water_ppm: waterPpm, lid_km: lidKm, upwelling_mm_yr: wMmYr } = scenario;
  const fail = (reason: string): ConductiveOutcome => ({ kind: 'failed', reason });
  if (model.water === 'fractional') return fail(CONDUCTIVE_FRACTIONAL_REASON);
  if (model.water !== 'batch') return fail(`unknown water mode ${String(model.water)}`);
  const checked = checkColumnInputs(scenario, p);
  if (!checked.ok) return fail(checked.reason);
  if (!(Number.isFinite(wMmYr) && wMmYr > 0)) {
    return fail(`the conductive model needs a positive upwelling rate, got upwelling_mm_yr = ${String(wMmYr)}`);
  }
  const resolution = model.conductiveResolution ?? 1;
  if (!(Number.isFinite(resolution) && resolution > 0)) return fail(`conductiveResolution must be positive, got ${String(resolution)}`);
  const maxIterations = model.conductiveMaxIterations ?? DEFAULT_CONDUCTIVE_MAX_ITERATIONS;
  if (!(maxIterations >= 1)) return fail(`conductiveMaxIterations must be at least 1, got ${String(maxIterations)}`);

  const x0 = wtPctFromPpm(waterPpm);
  const pLidGpa = checked.pLidGpa;
  const onset = findMeltOnset(tpC, x0, pLidGpa, p);
  if (onset.kind === 'beyond' && model.deepOnset !== 'cap') return { kind: 'onset_beyond_range', reason: beyondRangeReason(onset) };
  // a capped onset (deep_onset: cap): the grid has a node at the cap pressure, the deepest that may
  // melt; the superheated solid arriving there melts at once, its latent heat taken from the sensible
  // heat by the node's energy balance (the conductive form of capped-onset.ts)
  const capped = onset.kind === 'beyond';
  const onsetPGpa = onset.kind === 'onset' ? onset.pGpa : onset.kind === 'beyond' ? onset.pMaxGpa : null;

  const wMPerS = mPerSFromMmPerYr(wMmYr);
  const kappa = p.k / (p.rho_s * p.c_P);
  const lidM = lidKm * 1000;
  const toM = (pGpa: number): number => depthKmFromPGpa(pGpa, p.rho_s, p.g) * 1000;
  const onsetM = onsetPGpa === null ? Number.NaN : toM(onsetPGpa);
  const bottomM = Math.max(conductiveBottomM(lidM, onsetM, kappa / wMPerS), domain.minBottomM ?? 0);
  const zM = buildConductiveGrid({ lidM, onsetM, bottomM, blThicknessM: kappa / wMPerS, resolution });
  const nodes = zM.length;
  const pPa = new Float64Array(nodes);
  const pGpa = new Float64Array(nodes);
  for (let i = 0; i < nodes; i++) {
    pPa[i] = p.rho_s * p.g * zM[i];
    pGpa[i] = pPa[i] / PA_PER_GPA;
  }
  const sys: ConductiveSystem = {
    zM,
    pPa,
    // capped: the node at the cap (its pressure rounded from depth) must melt
    melt: buildNodeMeltTable(pGpa, x0, p, capped ? MODEL_MAX_P_GPA * (1 + 1e-12) : MODEL_MAX_P_GPA),
    lidM,
    tSurfaceK: p.T_surface + KELVIN_OFFSET,
    tBottomK: farFieldTempK(tpC, zM[nodes - 1], wMPerS, kappa, p),
    kappaM2S: kappa,
    params: p,
  };
  const sol = solveConductiveSystem(sys, wMPerS, { maxIterations });
  if (!sol.converged) return fail(`conductive column: ${sol.reason ?? 'no convergence'}`);

  const tC = new Float64Array(nodes);
  for (let i = 0; i < nodes; i++) tC[i] = sol.tK[i] - KELVIN_OFFSET;
  let onsetIndex = -1;
  for (let i = nodes - 1; i >= 0; i--) {
    if (sol.f[i] > 0) {
      onsetIndex = i;
      break;
    }
  }
  let meltStopIndex = -1;
  for (let i = 0; i <= onsetIndex; i++) {
    if (i === nodes - 1 || sol.fEq[i] > sol.f[i + 1]) {
      meltStopIndex = i;
      break;
    }
  }
  return {
    kind: 'solved',
    state: {
      zM, pGpa, tC, f: sol.f, fEq: sol.fEq,
      surfaceHeatFlowMwM2: sol.surfaceHeatFlowWM2 * 1000,
      wMPerS, kappaM2S: kappa, lidM,
      adiabaticOnsetPGpa: capped ? null : onsetPGpa,
      onsetCapped: capped,
      onsetIndex, meltStopIndex,
      iterations: sol.iterations,
    },
  };
}

/**
 * One conductive column (the `conductive` entry of the thermal-model table): the steady column of
 * conductiveProfile reduced to the fields of the isentropic column by the shared helpers in
 * column-result.ts, plus surface_heat_flow_mw_m2. Never throws; a failed iteration gives a `failed`
 * row with the reason.
 *
 * @param scenario tp_c (degC), water_ppm (ppm), lid_km (km), upwelling_mm_yr (mm/yr, required, > 0)
 * @param model water mode (batch), params, withProfile, conductiveResolution, conductiveMaxIterations
 */
export function conductiveColumn(scenario: Scenario, model: ModelOptions, domain: ConductiveDomainOptions = {}): ColumnResult {
  // the one never-throw guard of this entry point covers the solve and the aggregates
  try {
    const out = solveUnchecked(scenario, model, domain);
    if (out.kind === 'failed') return failedResult(out.reason);
    if (out.kind === 'onset_beyond_range') return onsetBeyondRangeResult(out.reason);
    const s = out.state;
    if (s.onsetIndex < 0) return noMeltResult(scenario.upwelling_mm_yr, s.surfaceHeatFlowMwM2);
    return meltingResult(summarize(s, wtPctFromPpm(scenario.water_ppm), model.params, model.withProfile === true), scenario, model.params);
  } catch (err) {
    return failedResult(`conductive column: ${err instanceof Error ? err.message : String(err)}`);
  }
}

/**
 * Aggregates of a solved column over [lid base, onset]: int F dP and int W dP by the trapezoid rule on
 * the nodes, the onset interpolated between the deepest melting node and the one below it on the
 * excess of T over the wet solidus (F rises from 0 there). W, the water carried by the melt per unit
 * mass of source, is F X_melt (batch) with X_melt taken where that F was reached: melt extracted
 * deeper keeps the water it left with.
 */
function summarize(s: ConductiveState, x0: number, p: MeltParams, withProfile: boolean): MeltingSummary {
  const { pGpa, tC, f } = s;
  const io = s.onsetIndex;
  // onset between node io (F > 0) and io + 1 (F = 0), where the wet-solidus excess changes sign;
  // a capped onset is the cap node itself, where F jumps from 0 to f[io]
  let onsetPGpa = pGpa[io];
  if (io + 1 < pGpa.length && !s.onsetCapped) {
    const exHere = s.fEq[io] > 0 ? excessC(tC[io], pGpa[io], x0, p) : 0;
    const exBelow = excessC(tC[io + 1], pGpa[io + 1], x0, p);
    const frac = exHere > 0 && exBelow < exHere ? exHere / (exHere - exBelow) : 0;
    onsetPGpa = pGpa[io] + Math.min(1, Math.max(0, frac)) * (pGpa[io + 1] - pGpa[io]);
  }
  // water carried by the melt per unit mass of source: F X_melt at the node where that F was reached
  const water = new Float64Array(io + 1);
  let argMax = io;
  for (let i = io; i >= 0; i--) {
    if (i === io || s.fEq[i] > f[i + 1]) argMax = i;
    water[i] = x0 > 0 ? f[i] * batchMeltWaterWtPct(f[i], pGpa[argMax], x0, p) : 0;
  }
  const stop = Math.max(0, Math.min(s.meltStopIndex, io));
  let meltInt = 0.5 * f[io] * (onsetPGpa - pGpa[io]);
  let waterInt = 0.5 * water[io] * (onsetPGpa - pGpa[io]);
  let intervalInt = meltInt;
  for (let i = 0; i < io; i++) {
    const dp = pGpa[i + 1] - pGpa[i];
    const cell = 0.5 * (f[i] + f[i + 1]) * dp;
    meltInt += cell;
    if (i >= stop) intervalInt += cell;
    waterInt += 0.5 * (water[i] + water[i + 1]) * dp;
  }
  let profile: ColumnProfile | undefined;
  if (withProfile && s.onsetCapped) {
    // the capped onset is node io itself: the profile is the nodes from there up
    const n = io + 1;
    const pr = {
      p_gpa: new Float64Array(n), depth_km: new Float64Array(n), t_c: new Float64Array(n),
      f: new Float64Array(n), h2o_melt_wt_pct: new Float64Array(n),
    };
    for (let k = 0; k < n; k++) {
      const i = io - k;
      pr.p_gpa[k] = pGpa[i];
      pr.depth_km[k] = s.zM[i] / 1000;
      pr.t_c[k] = tC[i];
      pr.f[k] = f[i];
      pr.h2o_melt_wt_pct[k] = x0 > 0 ? water[i] / f[i] : 0;
    }
    profile = pr;
  } else if (withProfile) {
    const n = io + 2;
    const pr = {
      p_gpa: new Float64Array(n), depth_km: new Float64Array(n), t_c: new Float64Array(n),
      f: new Float64Array(n), h2o_melt_wt_pct: new Float64Array(n),
    };
    pr.p_gpa[0] = onsetPGpa;
    pr.depth_km[0] = depthKmFromPGpa(onsetPGpa, p.rho_s, p.g);
    pr.t_c[0] = interpolate(tC[io], io + 1 < tC.length ? tC[io + 1] : tC[io], pGpa[io], io + 1 < pGpa.length ? pGpa[io + 1] : pGpa[io], onsetPGpa);
    pr.f[0] = 0;
    pr.h2o_melt_wt_pct[0] = x0 > 0 ? batchMeltWaterWtPct(0, onsetPGpa, x0, p) : 0;
    for (let k = 1; k < n; k++) {
      const i = io + 1 - k;
      pr.p_gpa[k] = pGpa[i];
      pr.depth_km[k] = s.zM[i] / 1000;
      pr.t_c[k] = tC[i];
      pr.f[k] = f[i];
      pr.h2o_melt_wt_pct[k] = f[i] > 0 ? water[i] / f[i] : pr.h2o_melt_wt_pct[0];
    }
    profile = pr;
  }
  // a stop at the onset node itself (a single melting node) leaves the interval to the interpolated onset
  const topPGpa = stop === io && onsetPGpa <= pGpa[io] ? pGpa[Math.max(0, io - 1)] : pGpa[stop];
  return {
    onsetPGpa,
    ...(s.onsetCapped ? { fOnset: f[io] } : {}),
    topPGpa,
    fMax: f[0],
    fTop: f[0],
    tTopC: stop === io && onsetPGpa <= pGpa[io] ? tC[Math.max(0, io - 1)] : tC[stop],
    meltIntegralGpa: meltInt,
    meltingIntervalIntegralGpa: intervalInt,
    waterIntegralWtPctGpa: waterInt,
    surfaceHeatFlowMwM2: s.surfaceHeatFlowMwM2,
    profile,
  };
}

/** Excess of the temperature over the wet solidus (F -> 0), degC. */
function excessC(tCelsius: number, pGpaHere: number, x0: number, p: MeltParams): number {
  return tCelsius - wetSolidusC(pGpaHere, x0, p);
}

function interpolate(y0: number, y1: number, x0: number, x1: number, x: number): number {
  return x1 === x0 ? y0 : y0 + ((y1 - y0) * (x - x0)) / (x1 - x0);
}
