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
import { farFieldGrowthPerM, farFieldTempK } from './conductive-far-field.js';
import {
  CONDUCTIVE_MAX_RESOLUTION,
  CONDUCTIVE_TOLERANCE_MAX,
  CONDUCTIVE_TOLERANCE_MIN,
  conductiveDifference,
  DEFAULT_CONDUCTIVE_TOLERANCE,
} from './conductive-tolerance.js';
import { buildNodeMeltTable } from './conductive-melt.js';
import { type ConductiveSystem, solveConductiveSystem } from './conductive-solver.js';
import { batchMeltWaterWtPct, fCpxOut, wetSolidusC } from './melting.js';
import { checkColumnInputs } from './column-inputs.js';
import { beyondRangeReason, findMeltOnset } from './onset.js';
import type { MeltParams } from './params.js';
import { MODEL_MAX_P_GPA, type ColumnProfile, type ColumnResult, type ConductiveGeotherm, type ModelOptions, type Scenario } from './types.js';
import { depthKmFromPGpa, KELVIN_OFFSET, mPerSFromMmPerYr, PA_PER_GPA, wtPctFromPpm } from './units.js';

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
  /** grid refinement the column was solved on (1 = the default grid of conductive-grid.ts) */
  readonly resolution: number;
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
    const out = controlled(scenario, { ...model, withProfile: false }, domain);
    return out.kind === 'solved' ? { kind: 'solved', state: out.state } : out;
  } catch (err) {
    return { kind: 'failed', reason: `conductive column: ${err instanceof Error ? err.message : String(err)}` };
  }
}

/** Everything of one scenario that does not depend on the grid. */
interface ConductiveSetup {
  readonly tpC: number;
  readonly x0: number;
  readonly p: MeltParams;
  readonly wMPerS: number;
  readonly kappa: number;
  readonly lidM: number;
  readonly onsetM: number;
  readonly onsetPGpa: number | null;
  readonly capped: boolean;
  readonly bottomM: number;
  readonly maxIterations: number;
}

type SetupOutcome = { readonly kind: 'setup'; readonly setup: ConductiveSetup } | Exclude<ConductiveOutcome, { kind: 'solved' }>;

function prepare(scenario: Scenario, model: ModelOptions, domain: ConductiveDomainOptions): SetupOutcome {
  const p = model.params;
  const { tp_c: tpC, water_ppm: waterPpm, lid_km: lidKm, upwelling_mm_yr: wMmYr } = scenario;
  const fail = (reason: string): SetupOutcome => ({ kind: 'failed', reason });
  if (model.water === 'fractional') return fail(CONDUCTIVE_FRACTIONAL_REASON);
  if (model.water !== 'batch') return fail(`unknown water mode ${String(model.water)}`);
  const checked = checkColumnInputs(scenario, p);
  if (!checked.ok) return fail(checked.reason);
  if (!(Number.isFinite(wMmYr) && wMmYr > 0)) {
    return fail(`the conductive model needs a positive upwelling rate, got upwelling_mm_yr = ${String(wMmYr)}`);
  }
  const maxIterations = model.conductiveMaxIterations ?? DEFAULT_CONDUCTIVE_MAX_ITERATIONS;
  if (!(maxIterations >= 1)) return fail(`conductiveMaxIterations must be at least 1, got ${String(maxIterations)}`);

  const x0 = wtPctFromPpm(waterPpm);
  const onset = findMeltOnset(tpC, x0, checked.pLidGpa, p);
  if (onset.kind === 'beyond' && model.deepOnset !== 'cap') return { kind: 'onset_beyond_range', reason: beyondRangeReason(onset) };
  // a capped onset (deep_onset: cap): the grid has a node at the cap pressure, the deepest that may
  // melt; the superheated solid arriving there melts at once, its latent heat taken from the sensible
  // heat by the node's energy balance (the conductive form of capped-onset.ts)
  const capped = onset.kind === 'beyond';
  const onsetPGpa = onset.kind === 'onset' ? onset.pGpa : onset.kind === 'beyond' ? onset.pMaxGpa : null;
  const wMPerS = mPerSFromMmPerYr(wMmYr);
  const kappa = p.k / (p.rho_s * p.c_P);
  const lidM = lidKm * 1000;
  const onsetM = onsetPGpa === null ? Number.NaN : depthKmFromPGpa(onsetPGpa, p.rho_s, p.g) * 1000;
  const bottomM = Math.max(conductiveBottomM(lidM, onsetM, kappa / wMPerS), domain.minBottomM ?? 0);
  return { kind: 'setup', setup: { tpC, x0, p, wMPerS, kappa, lidM, onsetM, onsetPGpa, capped, bottomM, maxIterations } };
}

/**
 * Solve the column of `c` on the grid of refinement `resolution`; `from` (the same column on another
 * grid) gives the Newton iteration its starting temperatures, interpolated linearly in depth.
 */
function solveOnGrid(c: ConductiveSetup, resolution: number, from?: ConductiveState): ConductiveOutcome {
  const { p, x0, wMPerS, kappa, lidM, capped } = c;
  const zM = buildConductiveGrid({ lidM, onsetM: c.onsetM, bottomM: c.bottomM, blThicknessM: kappa / wMPerS, resolution });
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
    tBottomK: farFieldTempK(c.tpC, zM[nodes - 1], wMPerS, kappa, p),
    kappaM2S: kappa,
    params: p,
  };
  const sol = solveConductiveSystem(sys, wMPerS, { maxIterations: c.maxIterations }, from === undefined ? undefined : temperaturesOn(from, zM));
  if (!sol.converged) return { kind: 'failed', reason: `conductive column: ${sol.reason ?? 'no convergence'}` };

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
      adiabaticOnsetPGpa: capped ? null : c.onsetPGpa,
      onsetCapped: capped,
      onsetIndex, meltStopIndex,
      resolution,
      iterations: sol.iterations,
    },
  };
}

/** Temperatures (K) of a solved column interpolated linearly in depth onto the nodes zM (same domain). */
function temperaturesOn(s: ConductiveState, zM: Float64Array): Float64Array {
  const out = new Float64Array(zM.length);
  const last = s.zM.length - 1;
  let j = 0;
  for (let i = 0; i < zM.length; i++) {
    const z = zM[i];
    while (j < last - 1 && s.zM[j + 1] < z) j++;
    out[i] = interpolate(s.tC[j], s.tC[j + 1], s.zM[j], s.zM[j + 1], z) + KELVIN_OFFSET;
  }
  out[zM.length - 1] = s.tC[last] + KELVIN_OFFSET;
  return out;
}

/** The row of a solved column: no_melt, or the aggregates of summarize. */
function rowOf(s: ConductiveState, scenario: Scenario, c: ConductiveSetup, withProfile: boolean): ColumnResult {
  if (s.onsetIndex < 0) return noMeltResult(scenario.upwelling_mm_yr, s.surfaceHeatFlowMwM2);
  return meltingResult(summarize(s, c.x0, c.p, withProfile), scenario, c.p);
}

/** A solved column on its accepted grid and its row, or why there is none. */
type Controlled =
  | { readonly kind: 'solved'; readonly state: ConductiveState; readonly row: ColumnResult }
  | Exclude<ConductiveOutcome, { kind: 'solved' }>;

/**
 * The grid-resolution control. With an explicit conductiveResolution: that grid, as before
 * tolerances existed. Otherwise the column is solved on grids of resolution r0, 2 r0, 4 r0, ... (every
 * spacing halved each time) until two successive grids agree: the finer grid is accepted when
 * CONTROL_SAFETY times their difference (the error estimate; see there why 2 and not Richardson's 1/3)
 * is below the tolerance for every output (relative, with the absolute floors of
 * CONDUCTIVE_ERROR_FLOORS). The first grid follows the tolerance, r0 = sqrt(1e-3 / tol) / 2 (at least
 * 1/4); past CONDUCTIVE_MAX_RESOLUTION the row fails with the estimate reached.
 */
function controlled(scenario: Scenario, model: ModelOptions, domain: ConductiveDomainOptions): Controlled {
  const prep = prepare(scenario, model, domain);
  if (prep.kind !== 'setup') return prep;
  const c = prep.setup;
  const withProfile = model.withProfile === true;
  const fixed = model.conductiveResolution;
  if (fixed !== undefined) {
    if (!(Number.isFinite(fixed) && fixed > 0)) return { kind: 'failed', reason: `conductiveResolution must be positive, got ${String(fixed)}` };
    const out = solveOnGrid(c, fixed);
    return out.kind === 'solved' ? { kind: 'solved', state: out.state, row: rowOf(out.state, scenario, c, withProfile) } : out;
  }
  const tol = model.tolerance ?? DEFAULT_CONDUCTIVE_TOLERANCE;
  if (!(tol >= CONDUCTIVE_TOLERANCE_MIN && tol <= CONDUCTIVE_TOLERANCE_MAX)) {
    return { kind: 'failed', reason: `tolerance must be a number in ${CONDUCTIVE_TOLERANCE_MIN}-${CONDUCTIVE_TOLERANCE_MAX} for the conductive column, got ${String(tol)}` };
  }
  let r = firstResolution(tol);
  let prev = solveOnGrid(c, r);
  if (prev.kind !== 'solved') return prev;
  let prevRow = rowOf(prev.state, scenario, c, false);
  let estimate = Number.POSITIVE_INFINITY;
  while (2 * r <= CONDUCTIVE_MAX_RESOLUTION) {
    r *= 2;
    const next = solveOnGrid(c, r, prev.state);
    if (next.kind !== 'solved') return next;
    const row = rowOf(next.state, scenario, c, withProfile);
    estimate = CONTROL_SAFETY * conductiveDifference(prevRow, row);
    if (estimate <= tol) return { kind: 'solved', state: next.state, row };
    prev = next;
    prevRow = row;
  }
  return {
    kind: 'failed',
    reason: `conductive column: the grid reached resolution ${r} with an estimated error ${estimate.toExponential(2)} above the tolerance ${tol}`,
  };
}

/**
 * The control's error estimate is this multiple of the difference between two successive grids. The
 * scheme is second order where the column is smooth (the finer grid's error is then a third of the
 * difference) but only first order where the melting path has a corner (cpx exhaustion, the ends of
 * melting), and the ends of a barely melting column move irregularly with the grid: a factor of 2
 * keeps every output of the accuracy test below the tolerance.
 */
const CONTROL_SAFETY = 2;

/** First grid of the control: resolution r0 = sqrt(1e-3 / tol) / 2, at least 1/4, a power of 2. */
function firstResolution(tol: number): number {
  const want = Math.max(0.25, Math.sqrt(DEFAULT_CONDUCTIVE_TOLERANCE / tol) / 2);
  return Math.pow(2, Math.round(Math.log2(want)));
}

/**
 * One conductive column (the `conductive` entry of the thermal-model table): the steady column of
 * conductiveProfile reduced to the fields of the isentropic column by the shared helpers in
 * column-result.ts, plus surface_heat_flow_mw_m2. A failed iteration gives a `failed`
 * row with the reason.
 *
 * @param scenario tp_c (degC), water_ppm (ppm), lid_km (km), upwelling_mm_yr (mm/yr, required, > 0)
 * @param model water mode (batch), params, withProfile, conductiveResolution, conductiveMaxIterations
 */
export function conductiveColumn(scenario: Scenario, model: ModelOptions, domain: ConductiveDomainOptions = {}): ColumnResult {
  // no guard here: meltColumn is the physics' one never-throw guard
  const out = controlled(scenario, model, domain);
  if (out.kind === 'failed') return failedResult(out.reason);
  if (out.kind === 'onset_beyond_range') return onsetBeyondRangeResult(out.reason);
  if (model.withProfile !== true || (out.row.status !== 'ok' && out.row.status !== 'no_melt')) return out.row;
  return { ...out.row, geotherm: geothermOf(out.state, model.params) };
}

/**
 * The whole steady geotherm of a solved column: the surface (T_surface at P = 0) when there is a
 * lid, inside which T is linear in depth (physics reference, conductive column: top), then the
 * solver's nodes from the lid base down, and the far field's growth rate for below the domain.
 */
function geothermOf(st: ConductiveState, p: MeltParams): ConductiveGeotherm {
  const withSurface = st.pGpa[0] > 0;
  const n = st.pGpa.length + (withSurface ? 1 : 0);
  const pGpa = new Float64Array(n);
  const tC = new Float64Array(n);
  if (withSurface) tC[0] = p.T_surface;
  pGpa.set(st.pGpa, withSurface ? 1 : 0);
  tC.set(st.tC, withSurface ? 1 : 0);
  return { p_gpa: pGpa, t_c: tC, farFieldGrowthPerM: farFieldGrowthPerM(st.wMPerS, st.kappaM2S, p) };
}

/**
 * Aggregates of a solved column over [lid base, onset]. The onset is interpolated between the deepest
 * melting node and the one below it on the excess of T over the wet solidus (F rises from 0 there);
 * the top of melting, where the path's F reaches its maximum, between the nodes around the
 * shallowest node where F still increases (meltTop: a parabola through F there, whose vertex is
 * the top; not snapped to a node). int F dP and int W dP: trapezoids on the nodes below the top,
 * Simpson on the parabola from the top down, F and W held at their top values above it. W, the water
 * carried by the melt per unit mass of source, is F X_melt (batch) with X_melt taken where that F
 * was reached: melt extracted deeper keeps the water it left with.
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
  const onsetTC = io + 1 < tC.length && !s.onsetCapped ? interpolate(tC[io], tC[io + 1], pGpa[io], pGpa[io + 1], onsetPGpa) : tC[io];
  // water carried by the melt per unit mass of source: F X_melt at the node where that F was reached
  const water = new Float64Array(io + 1);
  let argMax = io;
  for (let i = io; i >= 0; i--) {
    if (i === io || s.fEq[i] > f[i + 1]) argMax = i;
    water[i] = x0 > 0 ? f[i] * batchMeltWaterWtPct(f[i], pGpa[argMax], x0, p) : 0;
  }
  const stop = Math.max(0, Math.min(s.meltStopIndex, io));
  const top = meltTop(s, stop, onsetPGpa, onsetTC, water, x0, p);
  // below the top: trapezoids from node top.below down to node io, and the onset cell
  const fOnset = s.onsetCapped ? f[io] : 0;
  const wOnset = s.onsetCapped ? water[io] : 0;
  let intervalInt = top.fInt;
  let waterInt = top.wInt;
  if (top.below >= 0) {
    for (let i = top.below; i < io; i++) {
      const dp = pGpa[i + 1] - pGpa[i];
      intervalInt += 0.5 * (f[i] + f[i + 1]) * dp;
      waterInt += 0.5 * (water[i] + water[i + 1]) * dp;
    }
    intervalInt += 0.5 * (f[io] + fOnset) * (onsetPGpa - pGpa[io]);
    waterInt += 0.5 * (water[io] + wOnset) * (onsetPGpa - pGpa[io]);
  }
  // above the top the extracted F (and its water) stay at their top values up to the lid base
  const held = top.pGpa - pGpa[0];
  const meltInt = intervalInt + top.f * held;
  waterInt += top.w * held;
  let profile: ColumnProfile | undefined;
  if (withProfile) {
    // onset (for a capped onset: node io), the nodes below the top, the top, the nodes above it
    const pts: { p: number; z: number; t: number; f: number; x: number }[] = [];
    const xOf = (fi: number, wi: number, pHere: number): number => (x0 > 0 ? (fi > 0 ? wi / fi : batchMeltWaterWtPct(0, pHere, x0, p)) : 0);
    const onsetZ = s.onsetCapped ? s.zM[io] / 1000 : depthKmFromPGpa(onsetPGpa, p.rho_s, p.g);
    pts.push({ p: onsetPGpa, z: onsetZ, t: onsetTC, f: fOnset, x: xOf(fOnset, wOnset, onsetPGpa) });
    for (let i = s.onsetCapped ? io - 1 : io; i >= 0; i--) {
      if (pGpa[i] > top.pGpa) pts.push({ p: pGpa[i], z: s.zM[i] / 1000, t: tC[i], f: f[i], x: xOf(f[i], water[i], pGpa[i]) });
    }
    if (top.pGpa < onsetPGpa) pts.push({ p: top.pGpa, z: depthKmFromPGpa(top.pGpa, p.rho_s, p.g), t: top.tC, f: top.f, x: xOf(top.f, top.w, top.pGpa) });
    for (let i = io; i >= 0; i--) {
      if (pGpa[i] < top.pGpa) pts.push({ p: pGpa[i], z: s.zM[i] / 1000, t: tC[i], f: top.f, x: xOf(top.f, top.w, pGpa[i]) });
    }
    const n = pts.length;
    const pr = {
      p_gpa: new Float64Array(n), depth_km: new Float64Array(n), t_c: new Float64Array(n),
      f: new Float64Array(n), h2o_melt_wt_pct: new Float64Array(n),
    };
    for (let k = 0; k < n; k++) {
      pr.p_gpa[k] = pts[k].p;
      pr.depth_km[k] = pts[k].z;
      pr.t_c[k] = pts[k].t;
      pr.f[k] = pts[k].f;
      pr.h2o_melt_wt_pct[k] = pts[k].x;
    }
    profile = pr;
  }
  return {
    onsetPGpa,
    ...(s.onsetCapped ? { fOnset: f[io] } : {}),
    topPGpa: top.pGpa,
    fMax: top.f,
    fTop: top.f,
    tTopC: top.tC,
    meltIntegralGpa: meltInt,
    meltingIntervalIntegralGpa: intervalInt,
    waterIntegralWtPctGpa: waterInt,
    surfaceHeatFlowMwM2: s.surfaceHeatFlowMwM2,
    profile,
  };
}

/** The top of melting: where the path's F reaches its maximum, and the integrals from there down. */
interface MeltTop {
  /** pressure of the top, GPa */
  readonly pGpa: number;
  /** melt fraction there (the largest along the path) */
  readonly f: number;
  /** water carried by the melt per unit mass of source there, wt% */
  readonly w: number;
  /** temperature there, degC */
  readonly tC: number;
  /** int F dP and int W dP from the top down to node `below` (or to the onset when below = -1), GPa and wt% GPa */
  readonly fInt: number;
  readonly wInt: number;
  /** node where the trapezoids take over, or -1 when the stretch from the top reaches the onset */
  readonly below: number;
}

/**
 * Locate the top of melting between the nodes. Node `stop` is the shallowest where the equilibrium F
 * still exceeds everything below; the maximum of the smooth path lies between its neighbours, so a
 * parabola through F_eq at (stop - 1, stop, the next point below: node stop + 1 or the interpolated
 * onset where F = 0) has its vertex there. Its F at the vertex is the largest melt fraction, T and W
 * are interpolated with parabolas through the same points, and int F dP, int W dP from the vertex down
 * to the lowest point are exact for the parabolas (Simpson). The middle point is the largest of the
 * three, so the parabola is concave with its vertex inside the three points. At the lid base (stop = 0)
 * or with a capped onset right below, the top is the node itself (trapezoids).
 */
function meltTop(s: ConductiveState, stop: number, onsetPGpa: number, onsetTC: number, water: Float64Array, x0: number, p: MeltParams): MeltTop {
  const { pGpa, tC, fEq } = s;
  const io = s.onsetIndex;
  const atNode = (): MeltTop => {
    let fInt = 0;
    let wInt = 0;
    if (stop < io) return { pGpa: pGpa[stop], f: s.f[stop], w: water[stop], tC: tC[stop], fInt, wInt, below: stop };
    // stop = io: a single melting node above the onset
    fInt = 0.5 * (s.f[io] + (s.onsetCapped ? s.f[io] : 0)) * (onsetPGpa - pGpa[io]);
    wInt = 0.5 * (water[io] + (s.onsetCapped ? water[io] : 0)) * (onsetPGpa - pGpa[io]);
    return { pGpa: pGpa[stop], f: s.f[stop], w: water[stop], tC: tC[stop], fInt, wInt, below: -1 };
  };
  if (stop === 0 || (stop === io && (s.onsetCapped || !(onsetPGpa > pGpa[io])))) return atNode();
  const corner = cpxCornerTop(s, stop, water, x0, p);
  if (corner !== null) return corner;
  const below = stop + 1 <= io ? stop + 1 : -1;
  const x = [pGpa[stop - 1], pGpa[stop], below >= 0 ? pGpa[below] : onsetPGpa];
  const xm = (i: number, fi: number): number => (x0 > 0 ? fi * batchMeltWaterWtPct(fi, pGpa[i], x0, p) : 0);
  const gF = [fEq[stop - 1], fEq[stop], below >= 0 ? fEq[below] : 0];
  const gW = [xm(stop - 1, fEq[stop - 1]), xm(stop, fEq[stop]), below >= 0 ? xm(below, fEq[below]) : 0];
  const gT = [tC[stop - 1], tC[stop], below >= 0 ? tC[below] : onsetTC];
  // parabola q(P) = g1 + b (P - x1) + a (P - x1)^2 through the three points
  const h0 = x[0] - x[1];
  const h2 = x[2] - x[1];
  const d0 = (gF[0] - gF[1]) / h0;
  const d2 = (gF[2] - gF[1]) / h2;
  const a = (d2 - d0) / (h2 - h0);
  const b = d0 - a * h0;
  if (!(a < 0)) return atNode();
  const v = Math.min(x[2], Math.max(x[0], x[1] - b / (2 * a)));
  const quad = (g: readonly number[], at: number): number => {
    // Lagrange form through (x, g)
    const l0 = ((at - x[1]) * (at - x[2])) / ((x[0] - x[1]) * (x[0] - x[2]));
    const l1 = ((at - x[0]) * (at - x[2])) / ((x[1] - x[0]) * (x[1] - x[2]));
    const l2 = ((at - x[0]) * (at - x[1])) / ((x[2] - x[0]) * (x[2] - x[1]));
    return g[0] * l0 + g[1] * l1 + g[2] * l2;
  };
  const simpson = (g: readonly number[]): number => ((x[2] - v) / 6) * (quad(g, v) + 4 * quad(g, 0.5 * (v + x[2])) + g[2]);
  const fTop = Math.max(quad(gF, v), fEq[stop]);
  return { pGpa: v, f: fTop, w: quad(gW, v), tC: quad(gT, v), fInt: simpson(gF), wInt: simpson(gW), below };
}

/**
 * The top of melting at the cpx-exhaustion corner. A hot column that melts past clinopyroxene
 * exhaustion rides along F_cpx_out(P) (F_eq just above it, where F hardly changes with T); where the
 * lid's cooling takes it back below, F_eq leaves that curve with a jump in its slope, and the maximum
 * of F is that corner, not a smooth vertex. Detected when F_eq - F_cpx_out(P) changes sign next to the
 * stop node with two riding nodes below the corner and two nodes above it; the corner is where the
 * lines through those two pairs cross (second order on both sides, unlike a parabola across the
 * corner). T at the corner is interpolated linearly, W = F X_melt(F, P) there; int F dP and int W dP
 * from the corner down to the riding node below it are trapezoids. Null when the pattern is not there.
 */
function cpxCornerTop(s: ConductiveState, stop: number, water: Float64Array, x0: number, p: MeltParams): MeltTop | null {
  const { pGpa, fEq, tC } = s;
  const io = s.onsetIndex;
  const riding = (i: number): boolean => fEq[i] >= fCpxOut(pGpa[i], p);
  // b: the shallowest riding node (the corner lies between b - 1 and b)
  const b = riding(stop) ? stop : stop + 1 <= io && riding(stop + 1) ? stop + 1 : -1;
  if (b < 2 || b + 1 > io || !riding(b + 1) || riding(b - 1) || riding(b - 2)) return null;
  // lines F = F_b + m_lo (P - P_b) (riding side) and F = F_{b-1} + m_hi (P - P_{b-1}) (above)
  const mLo = (fEq[b + 1] - fEq[b]) / (pGpa[b + 1] - pGpa[b]);
  const mHi = (fEq[b - 1] - fEq[b - 2]) / (pGpa[b - 1] - pGpa[b - 2]);
  if (!(mLo < mHi)) return null;
  const pc = (fEq[b - 1] - fEq[b] + mLo * pGpa[b] - mHi * pGpa[b - 1]) / (mLo - mHi);
  if (!(pc >= pGpa[b - 1] && pc <= pGpa[b])) return null;
  const fTop = Math.max(fEq[b] + mLo * (pc - pGpa[b]), fEq[stop]);
  const tTop = interpolate(tC[b - 1], tC[b], pGpa[b - 1], pGpa[b], pc);
  const wTop = x0 > 0 ? fTop * batchMeltWaterWtPct(fTop, pc, x0, p) : 0;
  const dp = pGpa[b] - pc;
  return { pGpa: pc, f: fTop, w: wTop, tC: tTop, fInt: 0.5 * (fTop + s.f[b]) * dp, wInt: 0.5 * (wTop + water[b]) * dp, below: b };
}

/** Excess of the temperature over the wet solidus (F -> 0), degC. */
function excessC(tCelsius: number, pGpaHere: number, x0: number, p: MeltParams): number {
  return tCelsius - wetSolidusC(pGpaHere, x0, p);
}

function interpolate(y0: number, y1: number, x0: number, x1: number, x: number): number {
  return x1 === x0 ? y0 : y0 + ((y1 - y0) * (x - x0)) / (x1 - x0);
}
