/**
 * Entry point of the physics for one scenario: picks the thermal model from a lookup table and
 * guarantees a well-formed row (never throws, never a non-finite number in an ok row).
 */
import { failedResult, type ColumnFn } from './column-result.js';
import { conductiveColumn } from './conductive-column.js';
import { isentropicColumn } from './isentropic-column.js';
import { DEFAULT_PARAMS } from './params.js';
import type { ColumnResult, ModelOptions, Scenario, ThermalModel } from './types.js';

/** The thermal models by name. */
export const THERMAL_MODELS: Readonly<Record<ThermalModel, ColumnFn>> = Object.freeze({
  isentropic: isentropicColumn,
  conductive: conductiveColumn,
});

/**
 * The thermal model a scenario runs with: `auto` means conductive when the scenario has a finite
 * upwelling rate, isentropic otherwise.
 */
export function resolveThermalModel(scenario: Scenario, model: ModelOptions): ThermalModel {
  if (model.thermal === 'auto') return Number.isFinite(scenario.upwelling_mm_yr) ? 'conductive' : 'isentropic';
  return model.thermal;
}

/**
 * Compute one melting column. Pure and thread-safe; never throws: the thermal models turn an
 * exception or a non-finite number into status `failed` with a reason.
 *
 * @param scenario tp_c (degC), water_ppm (ppm), lid_km (km), upwelling_mm_yr (mm/yr, NaN when absent)
 * @param model thermal model (`auto`: conductive with an upwelling rate, else isentropic), water mode,
 *   parameters, accuracy (tolerance: default 1e-4 isentropic, 1e-3 conductive; or a fixed stepGpa /
 *   conductiveResolution) and whether to return the profile
 */
export function meltColumn(scenario: Scenario, model: ModelOptions): ColumnResult {
  // the physics' one never-throw guard: the thermal models may throw (ColumnFn contract) and check
  // their rows are finite; computeChunk guards the process boundary for any process, plug-ins included
  const name = resolveThermalModel(scenario, model);
  const fn = Object.prototype.hasOwnProperty.call(THERMAL_MODELS, name) ? THERMAL_MODELS[name] : undefined;
  if (fn === undefined) return withCapFields(failedResult(`unknown thermal model ${String(model.thermal)}`), model);
  let row: ColumnResult;
  try {
    row = fn(scenario, model);
  } catch (err) {
    row = failedResult(`${name} column: ${err instanceof Error ? err.message : String(err)}`);
  }
  return withCapFields(row, model);
}

/**
 * With deepOnset `cap` every row carries onset_capped (1 capped, 0 other computed rows, null when
 * not computed) and f_at_cap (null unless capped); without it the row has neither (old tables).
 */
function withCapFields(row: ColumnResult, model: ModelOptions): ColumnResult {
  if (model.deepOnset !== 'cap') return row;
  const computed = row.status === 'ok' || row.status === 'no_melt';
  row.onset_capped = computed ? (row.onset_capped ?? 0) : null;
  row.f_at_cap = computed ? (row.f_at_cap ?? null) : null;
  return row;
}

/**
 * ModelOptions with the defaults: thermal `auto`, water `batch`, DEFAULT_PARAMS (Katz et al. 2003
 * Table 2 and the project conventions), no tolerance (each column's default: 1e-4 for the
 * error-controlled isentropic steps, 1e-3 for the conductive grid control; give stepGpa for a fixed
 * isentropic step, or conductiveResolution for a fixed conductive grid), no profile; any field can
 * be overridden.
 */
export function defaultModel(overrides: Partial<ModelOptions> = {}): ModelOptions {
  return {
    thermal: 'auto',
    water: 'batch',
    params: DEFAULT_PARAMS,
    withProfile: false,
    ...overrides,
  };
}
