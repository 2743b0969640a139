/**
 * Validation of the `model` section. Parameter overrides are checked by the physics' own
 * `resolveParams` (ranges and relations live there, once); this file only adds the path
 * prefix and "did you mean" for unknown parameter names.
 */
import { DEEP_ONSET_MODES, type DeepOnset } from '../physics/types.js';
import { PARAM_NAMES, ParamError, resolveParams, type ParamName, type ParamOverrides } from '../physics/params.js';
import { STEP_GPA_DEFAULT, STEP_GPA_MAX, STEP_GPA_MIN } from './limits.js';
import { describeModelValidator, paramsSchema } from './json-schema.js';
import { checkKeys, describeFound, isMapping, readChoice, readNumber, unknownKeyText, type ProblemList } from './problems.js';
import type { ModelSpec } from './types.js';

/** The `model` section of a decompression sweep (normalized: these keys in this order). */
export interface DecompressionModelSpec extends ModelSpec {
  /** 'auto': conductive with an upwelling rate, isentropic without (default 'auto') */
  readonly thermal: 'isentropic' | 'conductive' | 'auto';
  /** default 'batch' */
  readonly water: 'batch' | 'fractional';
  /** isentropic pressure step, GPa (default 0.05, allowed 0.001-0.5) */
  readonly step_gpa: number;
  /**
   * onsets deeper than the model range: 'drop' (default, not written when normalized, so older
   * sweeps keep their JSON, hash and table columns) or 'cap' (computed from 8 GPa up, marked)
   */
  readonly deep_onset?: DeepOnset;
}

/** Keys of the `model` section. */
export const MODEL_KEYS = ['thermal', 'water', 'params', 'step_gpa', 'deep_onset'] as const;
/** Allowed `model.thermal` values. */
export const THERMAL_MODES: readonly DecompressionModelSpec['thermal'][] = ['isentropic', 'conductive', 'auto'];
/** Allowed `model.water` values. */
export const WATER_MODES: readonly DecompressionModelSpec['water'][] = ['batch', 'fractional'];

/**
 * Validate `model`; absent means thermal auto, water batch, no overrides, step 0.05 GPa.
 * Carries the JSON Schema of its keys (built from the same constants) for `meltsweep schema`.
 */
export const validateModel = describeModelValidator(validateDecompressionModel, {
  thermal: {
    enum: THERMAL_MODES,
    default: 'auto',
    description: 'temperature path: isentropic, conductive (needs an upwelling rate), or auto (conductive when an upwelling rate is given)',
  },
  water: { enum: WATER_MODES, default: 'batch', description: 'water partitioning between residue and melt: batch, or fractional (isentropic column only)' },
  params: paramsSchema(),
  step_gpa: {
    type: 'number',
    minimum: STEP_GPA_MIN,
    maximum: STEP_GPA_MAX,
    default: STEP_GPA_DEFAULT,
    description: `pressure step of the isentropic column, GPa (${STEP_GPA_MIN}-${STEP_GPA_MAX})`,
  },
  deep_onset: {
    enum: DEEP_ONSET_MODES,
    default: 'drop',
    description: 'onsets deeper than 8 GPa: drop (onset_beyond_range rows) or cap (computed from 8 GPa up, marked onset_capped)',
  },
});

function validateDecompressionModel(raw: unknown, problems: ProblemList): DecompressionModelSpec | undefined {
  if (raw !== undefined && raw !== null && !isMapping(raw)) {
    problems.add('model', `${describeFound(raw)} is not a mapping; write { thermal: ..., water: ..., params: { ... } }`);
    return undefined;
  }
  const body: Record<string, unknown> = isMapping(raw) ? raw : {};
  const before = problems.count;
  checkKeys(body, MODEL_KEYS, 'model', problems);
  const thermal = body.thermal === undefined ? 'auto' : readChoice(body.thermal, THERMAL_MODES, 'model.thermal', problems, 'a thermal model');
  const water = body.water === undefined ? 'batch' : readChoice(body.water, WATER_MODES, 'model.water', problems, 'a water mode');
  const step = body.step_gpa === undefined ? STEP_GPA_DEFAULT : readStep(body.step_gpa, problems);
  const params = body.params === undefined || body.params === null ? {} : validateParams(body.params, problems);
  const deep = body.deep_onset === undefined ? 'drop' : readChoice(body.deep_onset, DEEP_ONSET_MODES, 'model.deep_onset', problems, 'a deep-onset mode');
  if (problems.count !== before || thermal === undefined || water === undefined || step === undefined || params === undefined || deep === undefined) {
    return undefined;
  }
  return deep === 'drop' ? { thermal, water, params, step_gpa: step } : { thermal, water, params, step_gpa: step, deep_onset: deep };
}

function readStep(raw: unknown, problems: ProblemList): number | undefined {
  const v = readNumber(raw, 'model.step_gpa', problems);
  if (v === undefined) return undefined;
  if (v < STEP_GPA_MIN || v > STEP_GPA_MAX) {
    problems.add('model.step_gpa', `${v} is ${v < STEP_GPA_MIN ? 'below' : 'above'} the allowed range ${STEP_GPA_MIN}-${STEP_GPA_MAX} GPa`);
    return undefined;
  }
  return v;
}

/** Validate `model.params` (shared by every process): known names, ranges and relations (resolveParams). */
export function validateParams(raw: unknown, problems: ProblemList): ParamOverrides | undefined {
  if (!isMapping(raw)) {
    problems.add('model.params', `${describeFound(raw)} is not a mapping of parameter names to values, e.g. { M_cpx: 0.15 }`);
    return undefined;
  }
  const known: Record<string, unknown> = {};
  let ok = true;
  for (const [key, value] of Object.entries(raw)) {
    if ((PARAM_NAMES as readonly string[]).includes(key)) {
      known[key] = value;
    } else {
      problems.add(`model.params.${key}`, unknownKeyText(key, PARAM_NAMES, 'parameter'));
      ok = false;
    }
  }
  try {
    // resolveParams checks types, ranges and the relations between parameters
    resolveParams(known as ParamOverrides);
  } catch (err) {
    if (!(err instanceof ParamError)) throw err;
    for (const p of err.problems) problems.addRaw(p.startsWith('params') ? `model.${p}` : `model.params: ${p}`);
    return undefined;
  }
  if (!ok) return undefined;
  const out: Partial<Record<ParamName, number>> = {};
  for (const name of PARAM_NAMES) if (typeof known[name] === 'number') out[name] = known[name];
  return out;
}

/**
 * The canonical form of a valid decompression model section: thermal, water, params (in the
 * registry's order), step_gpa; no `process` key (the default process is not written, so specs
 * stored before processes existed keep their JSON and hash).
 */
export function normalizeDecompressionModel(model: DecompressionModelSpec): DecompressionModelSpec {
  const params: Partial<Record<ParamName, number>> = {};
  for (const name of PARAM_NAMES) {
    const v = model.params[name];
    if (v !== undefined) params[name] = v;
  }
  const base = { thermal: model.thermal, water: model.water, params, step_gpa: model.step_gpa };
  return model.deep_onset === undefined || model.deep_onset === 'drop' ? base : { ...base, deep_onset: model.deep_onset };
}
