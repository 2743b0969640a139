/** Sweep files -> validated, normalized, frozen SweepSpec. */
export type { AxisScale, AxisSpec, DesignKind, DesignSpec, ModelSpec, SweepSpec } from './types.js';
export { parseSweepText, parseSweepData, loadSweepFile, detectSweepFormat, type SweepFormat } from './parse.js';
export { validateSweep, SWEEP_KEYS, type ValidateOptions } from './validate.js';
export { normalizeSweep, deepFreeze } from './normalize.js';
export { sweepHash, canonicalJson } from './hash.js';
export { countPoints } from './count.js';
export { INPUT_DEFAULTS } from './input-defaults.js';
export { MAX_POINTS, MAX_AXIS_VALUES, MAX_SEED, MAX_SOBOL_INDEX, STEP_GPA_DEFAULT, STEP_GPA_MIN, STEP_GPA_MAX, TOLERANCE_DEFAULT, TOLERANCE_MIN, TOLERANCE_MAX } from './limits.js';
export { DESIGN_KINDS } from './validate-design.js';
export { sweepJsonSchema, sweepJsonSchemaText, SWEEP_SCHEMA_ID } from './sweep-schema.js';
export { describeModelValidator, type DescribedModelValidator, type JsonSchema, type ModelSectionValidator } from './json-schema.js';
export { suggestName, editDistance } from './suggest.js';
