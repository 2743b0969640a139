/**
 * Small building blocks of the sweep file's JSON Schema (draft 2020-12). The schema is generated
 * (sweep-schema.ts) from the same tables the validator reads; this file holds only the plain
 * types and the pieces shared by several sections.
 */
import { PARAM_INFO, PARAM_NAMES } from '../physics/params.js';
import type { ModelSpec } from './types.js';
import type { ProblemList } from './problems.js';

/** A JSON Schema object (plain JSON data). */
export type JsonSchema = { readonly [keyword: string]: unknown };

/** A validator of a process's `model` section (ProcessModelOptions.validate). */
export type ModelSectionValidator = (raw: Readonly<Record<string, unknown>>, problems: ProblemList, context?: { readonly baseDir?: string }) => ModelSpec | undefined;

/**
 * A model-section validator that states, as JSON Schema, what each of its keys accepts: the
 * schema travels with the function that enforces it, so `meltsweep schema` describes exactly
 * the validator a process uses. Keys without an entry (or a validator without any) are only
 * constrained by name in the sweep-file schema.
 */
export type DescribedModelValidator = ModelSectionValidator & { readonly optionSchemas: Readonly<Record<string, JsonSchema>> };

/** Attach the JSON Schema of each model key to a model-section validator. */
export function describeModelValidator(validate: ModelSectionValidator, optionSchemas: Readonly<Record<string, JsonSchema>>): DescribedModelValidator {
  return Object.assign(validate, { optionSchemas: Object.freeze({ ...optionSchemas }) });
}

/** The option schemas a model-section validator carries, or undefined. */
export function optionSchemasOf(validate: ModelSectionValidator): Readonly<Record<string, JsonSchema>> | undefined {
  const carried = (validate as Partial<DescribedModelValidator>).optionSchemas;
  return carried === undefined ? undefined : carried;
}

/** `{ type: number, minimum, maximum }`, with exclusiveMinimum when min itself is not allowed. */
export function numberRange(min: number, max: number, minExclusive: boolean, description: string): JsonSchema {
  return minExclusive
    ? { type: 'number', exclusiveMinimum: min, maximum: max, description }
    : { type: 'number', minimum: min, maximum: max, description };
}

/**
 * `model.params`: overrides of the published parameter values, shared by every process (the
 * names, units and plausible ranges of src/physics/params.ts; the relations between
 * parameters, e.g. ordered melting curves, are checked by the validator only).
 */
export function paramsSchema(): JsonSchema {
  const properties: Record<string, JsonSchema> = {};
  for (const name of PARAM_NAMES) {
    const p = PARAM_INFO[name];
    properties[name] = { ...numberRange(p.min, p.max, false, `${p.description} (${p.unit}); published value ${p.value}`), default: p.value };
  }
  return {
    type: ['object', 'null'],
    description: 'overrides of the published parameter values (Katz et al. 2003 notation); left out: published values',
    properties,
    additionalProperties: false,
  };
}
