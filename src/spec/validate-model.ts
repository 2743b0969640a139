/**
 * Validation of the `model` section. Parameter overrides are checked by the physics' own
 * `resolveParams` (ranges and relations live there, once); this file only adds the path
 * prefix and "did you mean" for unknown parameter names.
 */
import { DEEP_ONSET_MODES, type DeepOnset } from '../physics/types.js';
import { PARAM_NAMES, ParamError, resolveParams, type ParamName, type ParamOverrides } from '../physics/params.js';
import { CONDUCTIVE_TOLERANCE_DEFAULT, CONDUCTIVE_TOLERANCE_MIN, STEP_GPA_MAX, STEP_GPA_MIN, TOLERANCE_DEFAULT, TOLERANCE_MAX, TOLERANCE_MIN } from './limits.js';
import { describeModelValidator, paramsSchema } from './json-schema.js';
import { checkKeys, describeFound, isMapping, readChoice, readNumber, unknownKeyText, type ProblemList } from './problems.js';
import type { ModelSpec } from './types.js';

/** The `model` section of a decompression sweep (normalized: these keys in this order). */
export interface DecompressionModelSpec extends ModelSpec {
  /** 'auto': conductive with an upwelling rate, isentropic without (default 'auto') */
  readonly thermal: 'isentropic' | 'conductive' | 'auto';
  /** default 'batch' */
  readonly water: 'batch' | 'fractional';
  /**
   * isentropic column: a fixed pressure step, GPa (allowed 0.001-0.5). Present only when the sweep
   * file gives it; then `tolerance` is absent and the tables are those of the fixed-step integration.
   */
  readonly step_gpa?: number;
  /**
   * relative tolerance of every output of the column that computes a row (allowed 1e-6-1e-2; the
   * conductive column 1e-4-1e-2): the isentropic column's error-controlled steps, the conductive
   * column's grid control. Not given: 1e-4 for isentropic columns, 1e-3 for conductive ones; the
   * normalized form writes the default of the column the sweep runs (normalizeDecompressionModel).
   * Absent when step_gpa is given (then conductive rows use their default).
   */
  readonly tolerance?: number;
  /**
   * onsets deeper than the model range: 'drop' (default, not written when normalized, so older
   * sweeps keep their JSON, hash and table columns) or 'cap' (computed from 8 GPa up, marked)
   */
  readonly deep_onset?: DeepOnset;
}

/** Keys of the `model` section. */
export const MODEL_KEYS = ['thermal', 'water', 'params', 'step_gpa', 'tolerance', 'deep_onset'] as const;
/** Allowed `model.thermal` values. */
const THERMAL_MODES: readonly DecompressionModelSpec['thermal'][] = ['isentropic', 'conductive', 'auto'];
/** Allowed `model.water` values. */
const WATER_MODES: readonly DecompressionModelSpec['water'][] = ['batch', 'fractional'];

/**
 * Validate `model`; absent means thermal auto, water batch, no overrides, the column's default
 * tolerance (filled in by normalizeDecompressionModel, which knows the inputs). A sweep
 * gives step_gpa (fixed step) or tolerance (error control), not both.
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
    description: `a fixed pressure step of the isentropic column, GPa (${STEP_GPA_MIN}-${STEP_GPA_MAX}), instead of tolerance (not both); sweeps that give it keep the tables of the fixed-step integration`,
  },
  tolerance: {
    type: 'number',
    minimum: TOLERANCE_MIN,
    maximum: TOLERANCE_MAX,
    description: `relative tolerance of every output of the column (${TOLERANCE_MIN}-${TOLERANCE_MAX}; conductive columns ${CONDUCTIVE_TOLERANCE_MIN}-${TOLERANCE_MAX}); default ${TOLERANCE_DEFAULT} for isentropic columns, ${CONDUCTIVE_TOLERANCE_DEFAULT} for conductive ones; not together with step_gpa`,
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
  const step = body.step_gpa === undefined ? undefined : readStep(body.step_gpa, problems);
  const tolerance = body.tolerance === undefined ? undefined : readTolerance(body.tolerance, problems);
  if (body.step_gpa !== undefined && body.tolerance !== undefined) {
    problems.add(
      'model.tolerance',
      `${String(body.tolerance)} given together with step_gpa ${String(body.step_gpa)}; give one: step_gpa for a fixed pressure step, or tolerance for error-controlled steps`,
    );
  }
  const params = body.params === undefined || body.params === null ? {} : validateParams(body.params, problems);
  const deep = body.deep_onset === undefined ? 'drop' : readChoice(body.deep_onset, DEEP_ONSET_MODES, 'model.deep_onset', problems, 'a deep-onset mode');
  if (problems.count !== before || thermal === undefined || water === undefined || params === undefined || deep === undefined) {
    return undefined;
  }
  const accuracy = step !== undefined ? { step_gpa: step } : tolerance !== undefined ? { tolerance } : {};
  return deep === 'drop' ? { thermal, water, params, ...accuracy } : { thermal, water, params, ...accuracy, deep_onset: deep };
}

function readTolerance(raw: unknown, problems: ProblemList): number | undefined {
  const v = readNumber(raw, 'model.tolerance', problems);
  if (v === undefined) return undefined;
  if (!(v >= TOLERANCE_MIN && v <= TOLERANCE_MAX)) {
    problems.add('model.tolerance', `${v} is ${v < TOLERANCE_MIN ? 'below' : 'above'} the allowed range ${TOLERANCE_MIN}-${TOLERANCE_MAX} (relative)`);
    return undefined;
  }
  return v;
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
 * registry's order), then step_gpa or tolerance (whichever applies), then deep_onset unless 'drop';
 * no `process` key (the default process is not written). A sweep with step_gpa keeps the JSON and
 * hash it had before tolerances existed (and its tables); one without step_gpa now runs with error
 * control and records the tolerance, so its hash differs from a run made before, and --resume of
 * such a run refuses. A tolerance not given is written as the default of the column the sweep runs:
 * 1e-3 when it is conductive (thermal conductive, or auto with an upwelling rate among `given`, the
 * sweep's swept and fixed inputs), else 1e-4 (the form sweeps had before the conductive control).
 */
export function normalizeDecompressionModel(model: DecompressionModelSpec, given: ReadonlySet<string> = new Set()): DecompressionModelSpec {
  const params: Partial<Record<ParamName, number>> = {};
  for (const name of PARAM_NAMES) {
    const v = model.params[name];
    if (v !== undefined) params[name] = v;
  }
  const accuracy = model.step_gpa !== undefined ? { step_gpa: model.step_gpa } : { tolerance: model.tolerance ?? defaultToleranceOf(model.thermal, given) };
  const base = { thermal: model.thermal, water: model.water, params, ...accuracy };
  return model.deep_onset === undefined || model.deep_onset === 'drop' ? base : { ...base, deep_onset: model.deep_onset };
}

/** The default tolerance of the column a sweep runs: conductive (1e-3) or isentropic (1e-4). */
export function defaultToleranceOf(thermal: DecompressionModelSpec['thermal'], given: ReadonlySet<string>): number {
  const conductive = thermal === 'conductive' || (thermal === 'auto' && given.has('upwelling_mm_yr'));
  return conductive ? CONDUCTIVE_TOLERANCE_DEFAULT : TOLERANCE_DEFAULT;
}
