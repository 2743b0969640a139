/**
 * Building ColumnResult rows: the aggregate formulas shared by every thermal model (isentropic
 * and conductive), and the factories for rows that did not melt, fell outside the model range or
 * failed. Conventions are those of the project physics reference:
 *
 * - crust thickness of the passive (triangular) melting regime, h_c = (1/(rho_c g)) int F dP
 *   with P in Pa (Plank & Langmuir 1992; Langmuir, Klein & Plank 1992);
 * - the melting interval runs from the onset to P_top, where melting stops (the shallowest point where
 *   F still increases: the lid base of an isentropic column, deeper in a conductive one that the lid
 *   cools); interval fields (top, t_top_c, f_mean, productivity) describe it for every thermal model;
 * - mean extent of melting F_mean = int F dP / (P_onset - P_top) over the melting interval;
 * - water in the pooled melt = total water extracted / total melt extracted, both pooled over the
 *   melting regime with the same weighting as the crust: int W dP / int F dP, where W(P) is the
 *   water carried away by the melt per unit mass of source at P (batch: F X_melt; fractional: the
 *   water extracted with all melt increments so far);
 * - productivity = the mean of -dF/dP x 100 over the melting interval (any thermal model), which is exactly
 *   100 (F_top - F_onset) / (P_onset - P_top) (%/GPa), with F_onset = 0;
 * - melt flux of an actively upwelling column rho_s w F_max (w in m/yr), null without a rate.
 *
 * Which fields are null (decided here, once, for every thermal model):
 * - ok: every field set, except melt_flux_kg_m2_yr (null without an upwelling rate) and
 *   surface_heat_flow_mw_m2 (null for isentropic runs).
 * - no_melt: crust_km = 0 and f_max = 0 (amounts of melt, known to be zero); melt_flux_kg_m2_yr = 0
 *   with an upwelling rate, else null; the fields that describe a melting interval (onset, top,
 *   f_mean, t_top_c, h2o_melt_wt_pct, productivity) are null. surface_heat_flow_mw_m2 as given.
 * - onset_beyond_range and failed: every number null (the column was not computed), reason set.
 */
import type { MeltParams } from './params.js';
import type { ColumnProfile, ColumnResult, ModelOptions, Scenario } from './types.js';
import { RESULT_NUMERIC_NAMES } from './fields.js';
import { depthKmFromPGpa, PA_PER_GPA } from './units.js';

/**
 * A thermal model: computes one column. Expected failures are `failed` rows with a reason; an
 * unexpected exception may escape and is turned into a `failed` row by meltColumn, the one guard.
 */
export type ColumnFn = (scenario: Scenario, model: ModelOptions) => ColumnResult;

/** What a thermal model reports about a column that melted. Pressures in GPa. */
export interface MeltingSummary {
  /** pressure where melting starts, GPa */
  readonly onsetPGpa: number;
  /**
   * melt fraction at onsetPGpa: 0, except for a capped onset (melting under way at the deepest
   * pressure the model covers, capped-onset.ts); such a row is marked onset_capped = 1, f_at_cap = fOnset
   */
  readonly fOnset?: number;
  /** pressure where melting stops: the shallowest point where F still increases, GPa */
  readonly topPGpa: number;
  /** largest melt fraction along the column */
  readonly fMax: number;
  /** melt fraction at the top of the column */
  readonly fTop: number;
  /** temperature at the top of the column, degC */
  readonly tTopC: number;
  /**
   * int F dP over the column up to where the flow turns (the lid base), GPa: the crust. Where melting
   * stops below the lid (conductive columns) F keeps its maximum above topPGpa and counts too.
   */
  readonly meltIntegralGpa: number;
  /** int F dP over the melting interval [topPGpa, onsetPGpa], GPa (default meltIntegralGpa) */
  readonly meltingIntervalIntegralGpa?: number;
  /** int W dP over [topPGpa, onsetPGpa], wt% GPa (W: water carried by the melt per unit mass of source, wt%) */
  readonly waterIntegralWtPctGpa: number;
  /** conductive heat flow through the lid, mW/m2 (null or absent for isentropic runs) */
  readonly surfaceHeatFlowMwM2?: number | null;
  readonly profile?: ColumnProfile;
}

/** Crust thickness (km) from int F dP (GPa): h_c = int F dP [Pa] / (rho_c g). */
export function crustKmFromMeltIntegral(meltIntegralGpa: number, p: MeltParams): number {
  return (meltIntegralGpa * PA_PER_GPA) / (p.rho_c * p.g) / 1000;
}

/**
 * Melt flux (kg/m2/yr) of a column upwelling at upwellingMmYr: rho_s w F_max with w in m/yr.
 * Null when no upwelling rate is given (NaN or not finite).
 */
export function meltFluxKgM2Yr(upwellingMmYr: number, fMax: number, p: MeltParams): number | null {
  return Number.isFinite(upwellingMmYr) ? p.rho_s * (upwellingMmYr / 1000) * fMax : null;
}

/** Mean productivity (%/GPa) over a melting interval: 100 (F_top - F_onset) / (P_onset - P_top). */
export function productivityPctPerGpa(fOnset: number, fTop: number, onsetPGpa: number, topPGpa: number): number {
  return (100 * (fTop - fOnset)) / (onsetPGpa - topPGpa);
}

function nullRow(status: ColumnResult['status'], reason: string | null): ColumnResult {
  return {
    status,
    reason,
    onset_p_gpa: null,
    onset_depth_km: null,
    top_p_gpa: null,
    top_depth_km: null,
    f_max: null,
    f_mean: null,
    crust_km: null,
    t_top_c: null,
    h2o_melt_wt_pct: null,
    productivity_pct_per_gpa: null,
    melt_flux_kg_m2_yr: null,
    surface_heat_flow_mw_m2: null,
  };
}

/** A `failed` row: every number null, the reason given. */
export function failedResult(reason: string): ColumnResult {
  return nullRow('failed', reason);
}

/** An `onset_beyond_range` row: every number null, the reason given. */
export function onsetBeyondRangeResult(reason: string): ColumnResult {
  return nullRow('onset_beyond_range', reason);
}

/**
 * A `no_melt` row: crust_km = 0, f_max = 0, melt flux 0 with an upwelling rate (null without),
 * interval fields null (see the module comment).
 * @param upwellingMmYr upwelling rate, mm/yr (NaN when absent)
 * @param surfaceHeatFlowMwM2 conductive heat flow through the lid, mW/m2 (null for isentropic)
 */
export function noMeltResult(upwellingMmYr: number = Number.NaN, surfaceHeatFlowMwM2: number | null = null): ColumnResult {
  const row = nullRow('no_melt', null);
  row.crust_km = 0;
  row.f_max = 0;
  row.melt_flux_kg_m2_yr = Number.isFinite(upwellingMmYr) ? 0 : null;
  row.surface_heat_flow_mw_m2 = surfaceHeatFlowMwM2;
  return checkFinite(row);
}

/**
 * An `ok` row from a melting summary, with every aggregate derived by the shared formulas above.
 * Returns a `failed` row instead if the interval is empty or any number is not finite.
 */
export function meltingResult(s: MeltingSummary, scenario: Scenario, p: MeltParams): ColumnResult {
  const span = s.onsetPGpa - s.topPGpa;
  if (!(span > 0)) return failedResult(`melting interval is empty (onset ${s.onsetPGpa} GPa, top ${s.topPGpa} GPa)`);
  const row: ColumnResult = {
    status: 'ok',
    reason: null,
    onset_p_gpa: s.onsetPGpa,
    onset_depth_km: depthKmFromPGpa(s.onsetPGpa, p.rho_s, p.g),
    top_p_gpa: s.topPGpa,
    top_depth_km: depthKmFromPGpa(s.topPGpa, p.rho_s, p.g),
    f_max: s.fMax,
    f_mean: (s.meltingIntervalIntegralGpa ?? s.meltIntegralGpa) / span,
    crust_km: crustKmFromMeltIntegral(s.meltIntegralGpa, p),
    t_top_c: s.tTopC,
    h2o_melt_wt_pct: s.meltIntegralGpa > 0 ? s.waterIntegralWtPctGpa / s.meltIntegralGpa : 0,
    productivity_pct_per_gpa: productivityPctPerGpa(s.fOnset ?? 0, s.fTop, s.onsetPGpa, s.topPGpa),
    melt_flux_kg_m2_yr: meltFluxKgM2Yr(scenario.upwelling_mm_yr, s.fMax, p),
    surface_heat_flow_mw_m2: s.surfaceHeatFlowMwM2 ?? null,
  };
  if (s.fOnset !== undefined) {
    row.onset_capped = 1;
    row.f_at_cap = s.fOnset;
  }
  if (s.profile !== undefined) row.profile = s.profile;
  return checkFinite(row);
}

/**
 * Guard for every row leaving a thermal model: a NaN or infinite number turns the row into
 * `failed` naming the field, so no ok row ever carries a non-finite value.
 */
export function checkFinite(row: ColumnResult): ColumnResult {
  for (const name of RESULT_NUMERIC_NAMES) {
    const v = row[name];
    if (v !== null && !Number.isFinite(v)) return failedResult(`${name} is not finite (${String(v)})`);
  }
  return row;
}
