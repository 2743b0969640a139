/**
 * The process `decompression` (the default): melting of an upwelling mantle column, isentropic or
 * conductive, dry or wet (src/physics/column.ts). Its inputs, results and profile fields are the
 * field registry of src/physics/fields.ts; ranges are those of src/physics/ranges.ts.
 */
import { meltColumn, resolveThermalModel } from '../physics/column.js';
import { CAPPED_ONSET_FIELDS, INPUT_FIELDS, PROFILE_FIELDS, RESULT_NUMERIC_FIELDS } from '../physics/fields.js';
import { resolveParams } from '../physics/params.js';
import { INPUT_RANGES } from '../physics/ranges.js';
import { COLUMN_STATUSES, type ColumnResult, type ModelOptions, type Scenario } from '../physics/types.js';
import { sampleColumnProfile } from '../run/profile-sampling.js';
import { MODEL_KEYS, normalizeDecompressionModel, validateModel, type DecompressionModelSpec } from '../spec/validate-model.js';
import { INPUT_DEFAULTS } from '../spec/input-defaults.js';
import { CONDUCTIVE_TOLERANCE_MIN, TOLERANCE_MAX } from '../spec/limits.js';
import type { ModelSpec } from '../spec/types.js';
import type { InputDef, ProcessDefinition, ProcessResult, ResultDef } from './types.js';

/** The --flag of each input of `column` and `plot column` (kept as they always were). */
const CLI_FLAGS: Readonly<Record<string, string>> = { tp_c: 'tp', water_ppm: 'water', lid_km: 'lid', upwelling_mm_yr: 'upwelling' };
/** Defaults: tp_c must be given; no upwelling rate means "not given" (NaN). */
const DEFAULTS: Readonly<Record<string, number | null>> = { tp_c: null, ...INPUT_DEFAULTS };

/** The four inputs in table order, with their ranges (src/physics/ranges.ts). */
export const DECOMPRESSION_INPUTS: readonly InputDef[] = Object.freeze(
  INPUT_FIELDS.map((f) => {
    const r = INPUT_RANGES[f.name];
    return Object.freeze({ ...f, cliFlag: CLI_FLAGS[f.name], min: r.min, max: r.max, minExclusive: r.minExclusive, default: DEFAULTS[f.name] });
  }),
);

/** The result fields in table order. */
export const DECOMPRESSION_RESULTS: readonly ResultDef[] = RESULT_NUMERIC_FIELDS;
/** The result fields of a sweep with deep_onset: cap (the capped-onset marks at the end). */
const CAPPED_RESULTS: readonly ResultDef[] = Object.freeze([...RESULT_NUMERIC_FIELDS, ...CAPPED_ONSET_FIELDS]);

/**
 * The row of one column. The ColumnResult itself is handed over as `values` (it holds every
 * result field under its name), so a row costs no copy: this runs once per scenario.
 */
function computeDecompression(inputs: Readonly<Record<string, number>>, model: ModelOptions): ProcessResult {
  const r = meltColumn(inputs as unknown as Scenario, model);
  const values = r as unknown as Readonly<Record<string, number | null>>;
  return r.profile === undefined
    ? { status: r.status, reason: r.reason, values }
    : { status: r.status, reason: r.reason, values, profile: r.profile as unknown as Readonly<Record<string, Float64Array>> };
}

/** The process `decompression`. */
export const decompression: ProcessDefinition<ModelOptions> = {
  name: 'decompression',
  title: 'decompression melting of an upwelling column',
  description:
    'melting of mantle rising beneath a ridge or plume: isentropic (or conductive with an upwelling rate), dry or wet, stopped at the base of a lid',
  inputsFor: () => DECOMPRESSION_INPUTS,
  results: DECOMPRESSION_RESULTS,
  optionalResults: CAPPED_ONSET_FIELDS,
  resultsFor: (m) => ((m as DecompressionModelSpec).deep_onset === 'cap' ? CAPPED_RESULTS : DECOMPRESSION_RESULTS),
  reportOutputs: ['crust_km', 'f_max', 'onset_depth_km', 'h2o_melt_wt_pct', 'melt_flux_kg_m2_yr'],
  statuses: COLUMN_STATUSES,
  model: {
    keys: MODEL_KEYS,
    defaults: Object.freeze({ thermal: 'auto', water: 'batch', params: {} }),
    validate: validateModel,
    normalize: (m: ModelSpec, given?: ReadonlySet<string>) => normalizeDecompressionModel(m as DecompressionModelSpec, given),
    summary(m) {
      const model = m as DecompressionModelSpec;
      const accuracy =
        model.step_gpa !== undefined ? `step ${model.step_gpa} GPa` : model.tolerance !== undefined ? `tolerance ${model.tolerance}` : 'default tolerance';
      const deep = model.deep_onset === 'cap' ? ', onsets deeper than 8 GPa capped' : '';
      return `thermal ${model.thermal}, water ${model.water}, ${accuracy}${deep}`;
    },
    checkInputs(model, given, problems) {
      const m = model as DecompressionModelSpec;
      const conductive = m.thermal === 'conductive' || (m.thermal === 'auto' && given.has('upwelling_mm_yr'));
      if (m.water === 'fractional' && conductive) {
        const why = m.thermal === 'auto' ? ' (thermal auto picks the conductive column because an upwelling rate is given)' : '';
        problems.add(
          'model.water',
          `"fractional" cannot run with a conductive column${why}: the conductive model computes batch water only; use water: batch, or thermal: isentropic`,
        );
      }
      if (conductive && m.tolerance !== undefined && m.tolerance < CONDUCTIVE_TOLERANCE_MIN) {
        problems.add(
          'model.tolerance',
          `${m.tolerance} is below the conductive column's allowed range ${CONDUCTIVE_TOLERANCE_MIN}-${TOLERANCE_MAX} (relative); its grid control stops at 64 times the default resolution`,
        );
      }
      if (m.thermal !== 'conductive' || given.has('upwelling_mm_yr')) return;
      problems.add('model.thermal', '"conductive" needs an upwelling rate; sweep upwelling_mm_yr under axes or set it under fixed');
    },
  },
  resolveModel(m, options) {
    const model = m as DecompressionModelSpec;
    return {
      thermal: model.thermal,
      water: model.water,
      params: resolveParams(model.params),
      // without a tolerance (a section not normalized, e.g. from `column` flags) each column uses its own default
      ...(model.step_gpa !== undefined ? { stepGpa: model.step_gpa } : model.tolerance !== undefined ? { tolerance: model.tolerance } : {}),
      withProfile: options.withProfile,
      deepOnset: model.deep_onset ?? 'drop',
    };
  },
  compute: computeDecompression,
  describeColumn(inputs, model) {
    const thermal = resolveThermalModel(inputs as unknown as Scenario, model);
    const how = model.thermal === 'auto' ? ` (auto: ${Number.isFinite(inputs.upwelling_mm_yr) ? 'an upwelling rate is given' : 'no upwelling rate'})` : '';
    return `model: ${thermal}${how}, water ${model.water}`;
  },
  profile: PROFILE_FIELDS,
  profileTable: {
    sample(result, inputs, model, pressuresGpa, out, row) {
      const scenario = inputs as unknown as Scenario;
      const thermal = resolveThermalModel(scenario, model);
      sampleColumnProfile(result.values as unknown as ColumnResult, scenario.tp_c, scenario.lid_km, thermal, model.params, pressuresGpa, out, row);
    },
  },
};
