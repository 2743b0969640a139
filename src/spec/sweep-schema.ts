/**
 * The JSON Schema (draft 2020-12) of a sweep file, for editors (`meltsweep schema`,
 * sweeps/sweep.schema.json). Generated from the tables the validator reads, never written by
 * hand: top-level keys (SWEEP_KEYS), axis keys and limits (validate-axes.ts, limits.ts), design
 * kinds and their whole-number keys (DESIGN_NUMBER_KEYS), and for every registered process one
 * if/then branch with its inputs (names, ranges, which are required) and its model keys (the
 * JSON Schema its model validator carries, see json-schema.ts). A new process appears here by
 * being registered.
 *
 * The schema is a faithful subset of the validator: every file the validator accepts is valid
 * here, and the usual mistakes (unknown or misspelt keys, wrong types, values out of range,
 * unknown process or design, an input the process does not have) fail here too. Checks that need
 * arithmetic (a step that does not lead from `from` to `to`, point limits, ordered melting
 * curves) are the validator's alone.
 */
import { allProcesses, DEFAULT_PROCESS } from '../process/registry.js';
import type { AnyProcess, InputDef } from '../process/types.js';
import { formatRange } from '../physics/ranges.js';
import { MAX_AXIS_VALUES } from './limits.js';
import { numberRange, optionSchemasOf, paramsSchema, type JsonSchema } from './json-schema.js';
import { AXIS_KEYS } from './validate-axes.js';
import { DESIGN_KINDS, DESIGN_NUMBER_KEYS } from './validate-design.js';
import { MAX_NAME_LENGTH, SWEEP_KEYS } from './validate.js';

/** The `$id` written into the schema (a name, not a place to fetch it from). */
export const SWEEP_SCHEMA_ID = 'urn:meltsweep:sweep-file';

/** Sections the validator accepts as a mapping or as null (null = left out). */
const OBJECT_OR_NULL = ['object', 'null'];

/** The JSON Schema of a sweep file under the processes registered now. */
export function sweepJsonSchema(): JsonSchema {
  const processes = allProcesses();
  const properties: Record<(typeof SWEEP_KEYS)[number], JsonSchema> = {
    name: {
      type: ['string', 'null'],
      minLength: 1,
      maxLength: MAX_NAME_LENGTH,
      pattern: '\\S',
      description: `free text naming the sweep (at most ${MAX_NAME_LENGTH} characters); left out: the file's base name`,
    },
    axes: {
      type: ['object', 'null'],
      description: 'swept inputs, in this order (in a grid the last varies fastest): { values: [...] } or { from, to, step | count, scale }',
    },
    fixed: { type: ['object', 'null'], description: 'inputs held constant, e.g. { lid_km: 6 }; an input is swept or fixed, not both' },
    design: designSchema(),
    model: {
      type: ['object', 'null'],
      description: 'the process that computes the columns and its options',
      properties: {
        process: {
          enum: [...processes.map((p) => p.name), null],
          default: DEFAULT_PROCESS,
          description: `the melting process; left out: ${DEFAULT_PROCESS}. ${processes.map((p) => `${p.name}: ${p.title}`).join('; ')}`,
        },
      },
    },
  };
  return {
    $schema: 'https://json-schema.org/draft/2020-12/schema',
    $id: SWEEP_SCHEMA_ID,
    title: 'meltsweep sweep file',
    description: 'A scenario sweep: swept and fixed inputs, the sampling design and the melting process with its options.',
    type: 'object',
    properties,
    additionalProperties: false,
    allOf: [gridAxesRule(), ...processes.map(processBranch)],
  };
}

/** The schema text as `meltsweep schema` prints it (two-space indent, final newline). */
export function sweepJsonSchemaText(): string {
  return `${JSON.stringify(sweepJsonSchema(), null, 2)}\n`;
}

/** `design`: a kind name (short form, for kinds without required keys) or a mapping with kind-dependent keys. */
function designSchema(): JsonSchema {
  const branches = DESIGN_KINDS.map((kind): JsonSchema => {
    const keys = DESIGN_NUMBER_KEYS[kind];
    const properties: Record<string, JsonSchema> = { kind: { const: kind } };
    for (const [key, k] of Object.entries(keys)) {
      properties[key] = {
        type: 'integer',
        minimum: k.min,
        maximum: k.max,
        description: k.description,
        ...(k.fallback === undefined ? {} : { default: k.fallback }),
      };
    }
    const required = ['kind', ...Object.entries(keys).filter(([, k]) => k.required).map(([key]) => key)];
    return { if: { properties: { kind: { const: kind } } }, then: { properties, required, additionalProperties: false } };
  });
  const shortForms = DESIGN_KINDS.filter((kind) => Object.values(DESIGN_NUMBER_KEYS[kind]).every((k) => !k.required));
  return {
    description: `the sampling design; left out: grid. Kinds: ${DESIGN_KINDS.join(', ')}`,
    anyOf: [
      { type: 'null' },
      { enum: shortForms },
      { type: 'object', required: ['kind'], properties: { kind: { enum: DESIGN_KINDS } }, allOf: branches },
    ],
  };
}

/** In a grid (the default design) a range axis needs step or count. */
function gridAxesRule(): JsonSchema {
  const isGrid: JsonSchema = {
    anyOf: [
      { not: { required: ['design'] } },
      { properties: { design: { anyOf: [{ type: 'null' }, { const: 'grid' }, { type: 'object', required: ['kind'], properties: { kind: { const: 'grid' } } }] } } },
    ],
  };
  const rangeNeedsStep: JsonSchema = {
    if: { type: 'object', required: ['from'] },
    then: { anyOf: [{ required: ['step'] }, { required: ['count'] }] },
  };
  return { if: isGrid, then: { properties: { axes: { type: OBJECT_OR_NULL, additionalProperties: rangeNeedsStep } } } };
}

/** The branch of one process: applies when model.process names it (or, for the default, names none). */
function processBranch(process: AnyProcess): JsonSchema {
  const when: JsonSchema =
    process.name === DEFAULT_PROCESS
      ? { properties: { model: { properties: { process: { enum: [process.name, null] } } } } }
      : { required: ['model'], properties: { model: { type: 'object', required: ['process'], properties: { process: { const: process.name } } } } };
  const inputs = process.inputsFor({ ...process.model.defaults, params: {} });
  // inputs (allowed and required) of the default options; model options that change the inputs
  // (ProcessModelOptions.inputCases) select their own inputs by an if/then/else chain
  let inputsRule: JsonSchema = inputsSchema(inputs);
  for (const c of [...(process.model.inputCases ?? [])].reverse()) {
    inputsRule = { if: { required: ['model'], properties: { model: c.when } }, then: inputsSchema(process.inputsFor(c.model)), else: inputsRule };
  }
  const then: JsonSchema = {
    properties: {
      model: { type: OBJECT_OR_NULL, properties: { process: true, ...modelOptionSchemas(process) }, additionalProperties: false },
    },
    allOf: [inputsRule],
  };
  return { if: when, then };
}

/** The axes and fixed inputs a set of inputs allows, and the ones it requires (no default: swept or fixed). */
function inputsSchema(inputs: readonly InputDef[]): JsonSchema {
  const axes: Record<string, JsonSchema> = {};
  const fixed: Record<string, JsonSchema> = {};
  for (const input of inputs) {
    axes[input.name] = axisSchema(input);
    fixed[input.name] = inputNumber(input);
  }
  const required = inputs.filter((i) => i.default === null).map((i) => ({
    anyOf: [
      { required: ['axes'], properties: { axes: { type: 'object', required: [i.name] } } },
      { required: ['fixed'], properties: { fixed: { type: 'object', required: [i.name] } } },
    ],
  }));
  return {
    properties: {
      axes: { type: OBJECT_OR_NULL, properties: axes, additionalProperties: false },
      fixed: { type: OBJECT_OR_NULL, properties: fixed, additionalProperties: false },
    },
    ...(required.length > 0 ? { allOf: required } : {}),
  };
}

/** The model keys of a process: the schemas its validator carries; `params` is shared; any other key is named only. */
function modelOptionSchemas(process: AnyProcess): Record<string, JsonSchema | true> {
  const carried = optionSchemasOf(process.model.validate) ?? {};
  const out: Record<string, JsonSchema | true> = {};
  for (const key of process.model.keys) out[key] = carried[key] ?? (key === 'params' ? paramsSchema() : true);
  return out;
}

function inputText(input: InputDef): string {
  const dflt = input.default === null ? 'required: sweep it or fix it' : Number.isNaN(input.default) ? 'left out: not given' : `left out: ${input.default}`;
  return `${input.description}; ${input.unit}, allowed ${formatRange(input)}; ${dflt}`;
}

function inputNumber(input: InputDef): JsonSchema {
  return numberRange(input.min, input.max, input.minExclusive, inputText(input));
}

/** One swept input: values, or from/to with step or count; scale log needs values above 0. */
function axisSchema(input: InputDef): JsonSchema {
  const value = inputNumber(input);
  const positive: JsonSchema = { exclusiveMinimum: 0 };
  const rangeKeys = AXIS_KEYS.filter((k) => k !== 'values' && k !== 'scale');
  const properties: Record<(typeof AXIS_KEYS)[number], JsonSchema> = {
    values: { type: 'array', items: value, minItems: 1, maxItems: MAX_AXIS_VALUES, uniqueItems: true, description: 'the values of the axis, in order' },
    from: value,
    to: value,
    step: { type: 'number', not: { const: 0 }, description: 'spacing from `from` towards `to` (to included when a step lands on it)' },
    count: { type: 'integer', minimum: 1, maximum: MAX_AXIS_VALUES, description: 'number of evenly spaced values, both ends included' },
    scale: { enum: ['linear', 'log'], default: 'linear', description: 'log: geometric grid values and log-uniform sampling (values above 0)' },
  };
  return {
    type: 'object',
    description: inputText(input),
    properties,
    additionalProperties: false,
    oneOf: [
      { required: ['values'], not: { anyOf: rangeKeys.map((k) => ({ required: [k] })) } },
      { required: ['from', 'to'], not: { required: ['values'] } },
    ],
    allOf: [
      { not: { required: ['step', 'count'] } },
      {
        if: { required: ['scale'], properties: { scale: { const: 'log' } } },
        then: { properties: { values: { items: positive }, from: positive, to: positive }, not: { required: ['step'] } },
      },
    ],
  };
}
