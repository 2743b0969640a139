/**
 * Registry of every column meltsweep writes: name, unit, Arrow type, description.
 * The Arrow schema, CSV header, README table and --json keys all derive from it.
 */

export type FieldKind = 'float64' | 'int64' | 'uint8' | 'status' | 'utf8';

export interface FieldInfo {
  readonly name: string;
  readonly unit: string;
  readonly kind: FieldKind;
  readonly nullable: boolean;
  readonly description: string;
  /** display name for figures, legends and tables, e.g. "potential temperature" (every field has one) */
  readonly label: string;
  /** unit as printed in figures ("°C", "km", "wt%", "GPa", "ppm", "mm/yr"; "" for fractions and ids) */
  readonly displayUnit: string;
}

/** The four scenario inputs, in sweep-file order. */
export const INPUT_FIELDS = [
  { name: 'tp_c', unit: 'degC', kind: 'float64', nullable: false, description: 'mantle potential temperature', label: 'potential temperature', displayUnit: '°C' },
  { name: 'water_ppm', unit: 'ppm', kind: 'float64', nullable: false, description: 'bulk water of the source (ug/g)', label: 'source water', displayUnit: 'ppm' },
  { name: 'lid_km', unit: 'km', kind: 'float64', nullable: false, description: 'thickness of the conductive lid; melting stops at its base', label: 'lid thickness', displayUnit: 'km' },
  { name: 'upwelling_mm_yr', unit: 'mm/yr', kind: 'float64', nullable: true, description: 'solid upwelling rate (null when not given)', label: 'upwelling rate', displayUnit: 'mm/yr' },
] as const satisfies readonly FieldInfo[];

export type InputName = (typeof INPUT_FIELDS)[number]['name'];
export const INPUT_NAMES: readonly InputName[] = INPUT_FIELDS.map((f) => f.name);

/** Numeric result fields, in output order (status and reason are separate). */
export const RESULT_NUMERIC_FIELDS = [
  { name: 'onset_p_gpa', unit: 'GPa', kind: 'float64', nullable: true, description: 'pressure where melting starts', label: 'onset pressure', displayUnit: 'GPa' },
  { name: 'onset_depth_km', unit: 'km', kind: 'float64', nullable: true, description: 'depth where melting starts (z = P / (rho_s g))', label: 'onset depth', displayUnit: 'km' },
  { name: 'top_p_gpa', unit: 'GPa', kind: 'float64', nullable: true, description: 'pressure where melting stops: the shallowest point where F still increases (the lid base, or the surface, for isentropic columns; deeper where a conductive lid cools the column)', label: 'pressure at the top of melting', displayUnit: 'GPa' },
  { name: 'top_depth_km', unit: 'km', kind: 'float64', nullable: true, description: 'depth where melting stops (see top_p_gpa)', label: 'depth at the top of melting', displayUnit: 'km' },
  { name: 'f_max', unit: 'fraction', kind: 'float64', nullable: true, description: 'largest melt fraction in the column (mass fraction, 0-1)', label: 'largest melt fraction', displayUnit: '' },
  { name: 'f_mean', unit: 'fraction', kind: 'float64', nullable: true, description: 'mean melt fraction over the melting interval, integral F dP / (P_onset - P_top)', label: 'mean melt fraction', displayUnit: '' },
  { name: 'crust_km', unit: 'km', kind: 'float64', nullable: true, description: 'crust thickness of the passive melting regime, integral F dP / (rho_c g); 0 for no_melt, null for failed', label: 'crust thickness', displayUnit: 'km' },
  { name: 't_top_c', unit: 'degC', kind: 'float64', nullable: true, description: 'temperature where melting stops (at top_p_gpa)', label: 'temperature at the top of melting', displayUnit: '°C' },
  { name: 'h2o_melt_wt_pct', unit: 'wt%', kind: 'float64', nullable: true, description: 'water in the pooled melt', label: 'water in the pooled melt', displayUnit: 'wt%' },
  { name: 'productivity_pct_per_gpa', unit: '%/GPa', kind: 'float64', nullable: true, description: 'mean productivity -dF/dP x 100 over the melting interval, 100 F_top / (P_onset - P_top), for every thermal model', label: 'mean productivity', displayUnit: '%/GPa' },
  { name: 'melt_flux_kg_m2_yr', unit: 'kg/m2/yr', kind: 'float64', nullable: true, description: 'melt flux of an upwelling column, rho_s w F_max (null without an upwelling rate)', label: 'melt flux', displayUnit: 'kg/m²/yr' },
  { name: 'surface_heat_flow_mw_m2', unit: 'mW/m2', kind: 'float64', nullable: true, description: 'conductive heat flow through the lid (conductive runs only)', label: 'surface heat flow', displayUnit: 'mW/m²' },
] as const satisfies readonly FieldInfo[];

/**
 * Result fields of sweeps with `model.deep_onset: cap` only (after RESULT_NUMERIC_FIELDS), so tables
 * of every other sweep keep their columns.
 */
export const CAPPED_ONSET_FIELDS = [
  { name: 'onset_capped', unit: 'flag', kind: 'float64', nullable: true, description: 'deep_onset: cap only. 1 when the onset lies deeper than the model range (8 GPa) and the column was computed from 8 GPa up, melting already under way there (onset_p_gpa is then 8, a lower bound; crust_km, f_mean and f_max are lower bounds); 0 for other computed rows; null when not computed', label: 'onset capped', displayUnit: '' },
  { name: 'f_at_cap', unit: 'fraction', kind: 'float64', nullable: true, description: 'deep_onset: cap only. melt fraction at 8 GPa where a capped column starts (isentropic melting at 8 GPa from the solid adiabat); null for rows not capped', label: 'melt fraction at the cap', displayUnit: '' },
] as const satisfies readonly FieldInfo[];

export type ResultNumericName = (typeof RESULT_NUMERIC_FIELDS)[number]['name'];
export const RESULT_NUMERIC_NAMES: readonly ResultNumericName[] = RESULT_NUMERIC_FIELDS.map((f) => f.name);

export const STATUS_FIELD = {
  name: 'status', unit: '', kind: 'status', nullable: false,
  description: 'ok | no_melt | onset_beyond_range | failed',
  label: 'status', displayUnit: '',
} as const satisfies FieldInfo;

export const REASON_FIELD = {
  name: 'reason', unit: '', kind: 'utf8', nullable: true,
  description: 'why a scenario failed or fell outside the model range (null otherwise)',
  label: 'reason', displayUnit: '',
} as const satisfies FieldInfo;

/**
 * Columns of a column profile (ColumnProfile), in order: arrays along the melting path from the
 * onset (deepest) to the top. Written as CSV by `meltsweep column --profile`.
 */
export const PROFILE_FIELDS = [
  { name: 'p_gpa', unit: 'GPa', kind: 'float64', nullable: false, description: 'pressure', label: 'pressure', displayUnit: 'GPa' },
  { name: 'depth_km', unit: 'km', kind: 'float64', nullable: false, description: 'depth, z = P / (rho_s g)', label: 'depth', displayUnit: 'km' },
  { name: 't_c', unit: 'degC', kind: 'float64', nullable: false, description: 'temperature', label: 'temperature', displayUnit: '°C' },
  { name: 'f', unit: 'fraction', kind: 'float64', nullable: false, description: 'melt fraction (mass fraction, 0-1)', label: 'melt fraction', displayUnit: '' },
  { name: 'h2o_melt_wt_pct', unit: 'wt%', kind: 'float64', nullable: false, description: 'water in the melt in equilibrium with the residue at that point', label: 'water in the melt', displayUnit: 'wt%' },
] as const satisfies readonly FieldInfo[];

export type ProfileFieldName = (typeof PROFILE_FIELDS)[number]['name'];

/**
 * Columns of the profile table (`run --profiles`): every scenario sampled on one fixed pressure
 * grid, in long format after `scenario_id`. Units are those of PROFILE_FIELDS and of the results'
 * productivity. Which rows hold values is decided in src/run/profile-sampling.ts: above the top of
 * an isentropic column (inside the lid) every value is null; between the onset and the top the
 * computed path is interpolated linearly in pressure; below the onset F = 0, productivity = 0, melt
 * water null and T on the solid adiabat (isentropic columns) or on the steady geotherm (conductive
 * columns, whose T is given at every grid pressure, lid included). Rows of scenarios that were not computed (onset_beyond_range, failed) are null apart from
 * p_gpa and depth_km. The first five columns are those of PROFILE_FIELDS (name, unit, label) with
 * their own description.
 */
export const PROFILE_TABLE_FIELDS = [
  { ...PROFILE_FIELDS[0], nullable: false, description: 'pressure of the grid point' },
  { ...PROFILE_FIELDS[1], nullable: false, description: 'depth of the grid point, z = P / (rho_s g)' },
  { ...PROFILE_FIELDS[2], nullable: true, description: 'temperature (isentropic columns: the path, the solid adiabat below the onset, null above the top of the column; conductive columns: the steady geotherm at every pressure, lid included)' },
  { ...PROFILE_FIELDS[3], nullable: true, description: 'melt fraction (mass fraction, 0-1; 0 below the onset)' },
  { ...PROFILE_FIELDS[4], nullable: true, description: 'water in the melt at that point (null where there is no melt)' },
  { name: 'productivity_pct_per_gpa', unit: '%/GPa', kind: 'float64', nullable: true, description: 'local productivity -dF/dP x 100: slope of the interpolated path at that point (0 below the onset)', label: 'productivity', displayUnit: '%/GPa' },
] as const satisfies readonly FieldInfo[];

export type ProfileTableFieldName = (typeof PROFILE_TABLE_FIELDS)[number]['name'];
