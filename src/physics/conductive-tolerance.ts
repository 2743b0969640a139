/**
 * The accuracy statement of the conductive column: its tolerance range and default, and how far
 * apart two solutions of one scenario are, output by output (the measure the grid-resolution control
 * of conductive-column.ts and the accuracy test use).
 */
import type { ColumnResult } from './types.js';

/** Default relative tolerance of the conductive column (model.tolerance when not given). */
export const DEFAULT_CONDUCTIVE_TOLERANCE = 1e-3;
/**
 * Smallest relative tolerance the conductive column accepts: finer needs grids past the cap on some
 * columns (a wet column at 1e6 mm/yr reached an estimate of 1.4e-5 at resolution 64).
 */
export const CONDUCTIVE_TOLERANCE_MIN = 1e-4;
/** Largest relative tolerance the conductive column accepts. */
export const CONDUCTIVE_TOLERANCE_MAX = 1e-2;
/** Finest grid the control tries (resolution: every spacing of the default grid divided by this). */
export const CONDUCTIVE_MAX_RESOLUTION = 64;

/** Outputs of a conductive row that the tolerance covers. */
export type ConductiveOutput =
  | 'onset_p_gpa'
  | 'top_p_gpa'
  | 'f_max'
  | 'f_mean'
  | 'crust_km'
  | 't_top_c'
  | 'h2o_melt_wt_pct'
  | 'productivity_pct_per_gpa'
  | 'surface_heat_flow_mw_m2';

/**
 * Absolute floors: an output's error is |a - b| / max(scale, floor) with the scale |b| (the interval's
 * length for its ends, scaleOf), so values near zero are held to the floor instead (the isentropic column's floors, README "Accuracy", plus pressures and heat flow).
 * onset_depth_km, top_depth_km are the pressures in other units, melt_flux_kg_m2_yr is f_max times a
 * constant of the scenario: they share those errors.
 */
export const CONDUCTIVE_ERROR_FLOORS: Readonly<Record<ConductiveOutput, number>> = Object.freeze({
  /** the ends of the melting interval, relative to its length (scaleOf), at least 0.1 GPa (about 3 km) */
  onset_p_gpa: 0.1,
  top_p_gpa: 0.1,
  f_max: 1e-3,
  f_mean: 1e-3,
  /** F = 1e-3 over 1 GPa */
  crust_km: 0.035,
  /** degC */
  t_top_c: 1,
  h2o_melt_wt_pct: 1e-3,
  /** F = 1e-3 per GPa */
  productivity_pct_per_gpa: 0.1,
  /** mW/m2 */
  surface_heat_flow_mw_m2: 1,
});

/** The covered outputs, in table order. */
export const CONDUCTIVE_OUTPUTS = Object.freeze(Object.keys(CONDUCTIVE_ERROR_FLOORS) as ConductiveOutput[]);

/** Error of one output of `a` against the reference `b`: relative, with the output's floor. */
export function conductiveOutputError(name: ConductiveOutput, a: ColumnResult, b: ColumnResult): number {
  const va = a[name];
  const vb = b[name];
  if (va === null && vb === null) return 0;
  if (va === null || vb === null) return Number.POSITIVE_INFINITY;
  return Math.abs(va - vb) / Math.max(scaleOf(name, b), CONDUCTIVE_ERROR_FLOORS[name]);
}

/**
 * What an output's error is relative to: its value, except for the ends of the melting interval
 * (onset_p_gpa, top_p_gpa), which are located relative to the interval's length P_onset - P_top. A
 * pressure's own value is no scale for a location (a top near the surface would be held to metres),
 * and the interval's length is what f_mean and the productivity divide by.
 */
function scaleOf(name: ConductiveOutput, b: ColumnResult): number {
  if ((name === 'onset_p_gpa' || name === 'top_p_gpa') && b.onset_p_gpa !== null && b.top_p_gpa !== null) return b.onset_p_gpa - b.top_p_gpa;
  return Math.abs(b[name] ?? 0);
}

/**
 * Largest error over the covered outputs of `a` against `b`; infinite when the statuses differ
 * (one grid melts, the other not), so a row near the solidus is refined until they agree.
 */
export function conductiveDifference(a: ColumnResult, b: ColumnResult): number {
  if (a.status !== b.status) return Number.POSITIVE_INFINITY;
  let worst = 0;
  for (const name of CONDUCTIVE_OUTPUTS) {
    const e = conductiveOutputError(name, a, b);
    if (e > worst) worst = e;
  }
  return worst;
}
