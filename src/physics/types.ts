/**
 * The contract between the physics and everything that calls it (planner, workers,
 * writers, CLI). Field names are the Arrow column names; units are in src/physics/fields.ts.
 */
import type { MeltParams } from './params.js';

/** One scenario: the four swept inputs, in these units. */
export interface Scenario {
  /** mantle potential temperature, degC */
  readonly tp_c: number;
  /** bulk water of the source, ppm by weight (default 0) */
  readonly water_ppm: number;
  /** thickness of the rigid conductive lid, km (default 0) */
  readonly lid_km: number;
  /** solid upwelling rate, mm/yr; NaN when not given */
  readonly upwelling_mm_yr: number;
}

export const COLUMN_STATUSES = ['ok', 'no_melt', 'onset_beyond_range', 'failed'] as const;
export type ColumnStatus = (typeof COLUMN_STATUSES)[number];

export type ThermalModel = 'isentropic' | 'conductive';
export type WaterMode = 'batch' | 'fractional';

/** How a column is computed. `thermal: 'auto'` means conductive with an upwelling rate, else isentropic. */
export interface ModelOptions {
  readonly thermal: ThermalModel | 'auto';
  readonly water: WaterMode;
  readonly params: MeltParams;
  /**
   * isentropic column: a fixed pressure step, GPa. When given it overrides `tolerance` and the
   * column is integrated exactly as before tolerances existed.
   */
  readonly stepGpa?: number;
  /** isentropic column without stepGpa: relative tolerance of the error control (default 1e-4) */
  readonly tolerance?: number;
  /** return the profile arrays along the column */
  readonly withProfile?: boolean;
  /**
   * conductive column: grid refinement factor (default 1; 2 halves every node spacing and the
   * spacing growth rate, roughly doubling the number of nodes)
   */
  readonly conductiveResolution?: number;
  /** conductive column: cap on Newton steps per continuation stage (default 60) */
  readonly conductiveMaxIterations?: number;
  /**
   * onsets deeper than MODEL_MAX_P_GPA: `drop` (default) gives onset_beyond_range rows; `cap`
   * computes the column from MODEL_MAX_P_GPA up, already melting there (capped-onset.ts), and every
   * computed row carries onset_capped and f_at_cap (isentropic columns only)
   */
  readonly deepOnset?: DeepOnset;
}

/** What a column does with an onset deeper than the model covers (model.deep_onset). */
export const DEEP_ONSET_MODES = ['drop', 'cap'] as const;
export type DeepOnset = (typeof DEEP_ONSET_MODES)[number];

/** Arrays along the column, from onset (deepest) to the top of melting. */
export interface ColumnProfile {
  readonly p_gpa: Float64Array;
  readonly depth_km: Float64Array;
  readonly t_c: Float64Array;
  readonly f: Float64Array;
  readonly h2o_melt_wt_pct: Float64Array;
}

/**
 * Result of one column. Numbers are null where they do not apply (no_melt rows have null
 * onset fields and crust_km = 0; melt_flux_kg_m2_yr is null without an upwelling rate;
 * surface_heat_flow_mw_m2 is null for isentropic runs).
 */
export interface ColumnResult {
  status: ColumnStatus;
  /** why the column failed or fell outside the range; null for ok and no_melt rows */
  reason: string | null;
  onset_p_gpa: number | null;
  onset_depth_km: number | null;
  top_p_gpa: number | null;
  top_depth_km: number | null;
  f_max: number | null;
  f_mean: number | null;
  crust_km: number | null;
  t_top_c: number | null;
  h2o_melt_wt_pct: number | null;
  productivity_pct_per_gpa: number | null;
  melt_flux_kg_m2_yr: number | null;
  surface_heat_flow_mw_m2: number | null;
  /**
   * only with deepOnset `cap`: 1 when the onset lies deeper than MODEL_MAX_P_GPA and the column
   * was computed from there up, 0 for the other computed rows, null for rows not computed
   */
  onset_capped?: number | null;
  /** only with deepOnset `cap`: melt fraction at the cap pressure of a capped row, else null */
  f_at_cap?: number | null;
  profile?: ColumnProfile;
  /**
   * only for conductive columns computed with withProfile: the whole steady geotherm on the
   * solver's nodes (lid included, surface down to the bottom of the domain), for ok and no_melt rows
   */
  geotherm?: ConductiveGeotherm;
}

/**
 * The temperature of a conductive column from the surface down: the solver's nodes (pressure
 * ascending, from 0 at the surface to the bottom of its domain) and, below the domain, the
 * sub-solidus steady far field T = Tp[K] exp(m+ z) the solver imposes there.
 */
export interface ConductiveGeotherm {
  /** node pressures, GPa, ascending from the surface */
  readonly p_gpa: Float64Array;
  /** node temperatures, degC */
  readonly t_c: Float64Array;
  /** m+ of the far field, 1/m (see conductive-far-field.ts) */
  readonly farFieldGrowthPerM: number;
}

/** Deepest pressure the model covers, GPa: onset deeper than this is `onset_beyond_range`. */
export const MODEL_MAX_P_GPA = 8;
