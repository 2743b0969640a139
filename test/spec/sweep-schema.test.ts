/**
 * The sweep file's JSON Schema (`meltsweep schema`, sweeps/sweep.schema.json) checked with an
 * independent, well-kept JSON Schema validator (ajv, draft 2020-12, strict mode): every example
 * sweep file validates, every known-bad file fails both the schema and meltsweep's own
 * validator, and the committed schema is exactly what the command prints.
 */
import { Ajv2020, type ErrorObject, type ValidateFunction } from 'ajv/dist/2020.js';
import fs from 'node:fs';
import path from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { describe, expect, it } from 'vitest';
import { registerProcess } from '../../src/process/registry.js';
import type { ProcessDefinition } from '../../src/process/types.js';
import { parseSweepData, parseSweepText, sweepJsonSchema, sweepJsonSchemaText, validateSweep } from '../../src/spec/index.js';
import { ROOT, runCliSync } from '../helpers.js';
import { problemsOf } from './helpers.js';

const SWEEPS = path.join(ROOT, 'sweeps');
const BAD = fileURLToPath(new URL('../fixtures/bad-sweeps/', import.meta.url));
const SCHEMA_COMMENT = '# yaml-language-server: $schema=./sweep.schema.json';

function compile(schema: object): ValidateFunction {
  // strict mode (unknown keywords, formats, tuples are errors), except strictRequired and strictTypes:
  // the if/then branches name keys and use keywords whose type the enclosing schema states
  return new Ajv2020({ strict: true, strictRequired: false, strictTypes: false, allErrors: true }).compile(schema);
}
const where = (errors: ErrorObject[] | null | undefined) => (errors ?? []).map((e) => `${e.instancePath} ${e.message ?? ''}`).join('; ');

const exampleFiles = fs.readdirSync(SWEEPS).filter((f) => /\.(ya?ml|json)$/.test(f) && f !== 'sweep.schema.json');
const badFiles = fs.readdirSync(BAD).filter((f) => f.endsWith('.yaml'));

describe('meltsweep schema', () => {
  it('the committed sweeps/sweep.schema.json is exactly what `meltsweep schema` prints', () => {
    const out = runCliSync(['schema']);
    expect(out.status, out.stderr).toBe(0);
    expect(out.stdout).toBe(sweepJsonSchemaText());
    const committed = fs.readFileSync(path.join(SWEEPS, 'sweep.schema.json'), 'utf8');
    // on a mismatch: node dist/src/cli/main.js schema > sweeps/sweep.schema.json (after npm run build)
    expect(committed, 'sweeps/sweep.schema.json is stale: regenerate it with `meltsweep schema > sweeps/sweep.schema.json`').toBe(out.stdout);
  });

  it('is a valid draft 2020-12 schema under ajv strict mode', () => {
    const schema = sweepJsonSchema();
    expect(schema.$schema).toBe('https://json-schema.org/draft/2020-12/schema');
    expect(() => compile(schema)).not.toThrow();
  });

  it(`every example sweep file (${exampleFiles.length}) names the schema and validates against it and the validator`, () => {
    expect(exampleFiles.length).toBeGreaterThanOrEqual(3);
    const validate = compile(sweepJsonSchema());
    for (const f of exampleFiles) {
      const text = fs.readFileSync(path.join(SWEEPS, f), 'utf8');
      if (!f.endsWith('.json')) expect(text.split('\n')[0], f).toBe(SCHEMA_COMMENT);
      expect(validate(parseSweepData(text, f)), `${f}: ${where(validate.errors)}`).toBe(true);
      expect(() => parseSweepText(text, f), f).not.toThrow();
    }
  });

  it(`every known-bad file (${badFiles.length}) fails both the schema and the validator`, () => {
    expect(badFiles.length).toBeGreaterThanOrEqual(20);
    const validate = compile(sweepJsonSchema());
    for (const f of badFiles) {
      const text = fs.readFileSync(path.join(BAD, f), 'utf8');
      expect(validate(parseSweepData(text, f)), `${f} passed the schema`).toBe(false);
      expect(problemsOf(() => parseSweepText(text, f)).length, f).toBeGreaterThan(0);
    }
  });

  it('points at the offending key: unknown key, wrong type, out-of-range value, input not of the process', () => {
    const validate = compile(sweepJsonSchema());
    const errorsOf = (file: string) => {
      validate(parseSweepData(fs.readFileSync(path.join(BAD, file), 'utf8'), file));
      return validate.errors ?? [];
    };
    expect(errorsOf('unknown-top-key.yaml').some((e) => e.keyword === 'additionalProperties' && e.params.additionalProperty === 'desing')).toBe(true);
    expect(errorsOf('wrong-type-values.yaml').some((e) => e.instancePath === '/axes/tp_c/values/1' && e.keyword === 'type')).toBe(true);
    // 2400 degC is above the allowed 1800 of tp_c (src/physics/ranges.ts)
    expect(errorsOf('out-of-range-axis.yaml').some((e) => e.instancePath === '/axes/tp_c/to' && e.keyword === 'maximum' && e.params.limit === 1800)).toBe(true);
    expect(errorsOf('input-not-of-process.yaml').some((e) => e.instancePath === '/axes' && e.params.additionalProperty === 'slab_depth_km')).toBe(true);
    expect(errorsOf('unknown-process.yaml').some((e) => e.instancePath === '/model/process' && e.keyword === 'enum')).toBe(true);
  });

  it('ranges and choices come from the validator tables (inputs, design keys, model options, params)', () => {
    const text = JSON.stringify(sweepJsonSchema());
    type Inputs = { properties: { axes: { properties: Record<string, { description: string }> }; fixed: { properties: Record<string, unknown> } } };
    const schema = JSON.parse(text) as { allOf: { then: { allOf: Inputs[]; properties: { model: { properties: Record<string, unknown> } } } }[] };
    // decompression's branch: its inputs (no option changes them) and its model keys
    const branch = { ...schema.allOf[1]!.then.allOf[0]!.properties, model: schema.allOf[1]!.then.properties.model };
    expect(Object.keys(branch.axes.properties)).toEqual(['tp_c', 'water_ppm', 'lid_km', 'upwelling_mm_yr']);
    expect(branch.fixed.properties.upwelling_mm_yr).toMatchObject({ exclusiveMinimum: 0, maximum: 10000 });
    expect(branch.fixed.properties.tp_c).toMatchObject({ minimum: 1100, maximum: 1800 });
    expect(branch.model.properties.thermal).toMatchObject({ enum: ['isentropic', 'conductive', 'auto'], default: 'auto' });
    expect(branch.model.properties.step_gpa).toMatchObject({ minimum: 0.001, maximum: 0.5 });
    expect(branch.model.properties.params).toMatchObject({ properties: { M_cpx: { minimum: 0, maximum: 0.5, default: 0.17 } } });
  });

  it('follows a process option that changes its inputs (flux with a geotherm table: tp_c and lid_km are not inputs)', () => {
    const validate = compile(sweepJsonSchema());
    const flux = (model: object, fixed: object) => ({ name: 'wedge', axes: { water_ppm: { from: 10, to: 1000, scale: 'log', count: 5 } }, fixed, model: { process: 'flux', ...model } });
    const table = { geotherm: { file: 'wedge.csv' } };
    expect(validate(flux(table, { slab_depth_km: 100 })), where(validate.errors)).toBe(true);
    expect(validate(flux(table, { slab_depth_km: 100, tp_c: 1350 }))).toBe(false);
    expect(where(validate.errors)).toMatch(/fixed must NOT have additional properties/);
    // with the default geotherm (plate + adiabat) tp_c and lid_km are inputs again, and required
    expect(validate(flux({}, { slab_depth_km: 100, tp_c: 1350, lid_km: 60 })), where(validate.errors)).toBe(true);
    expect(validate(flux({}, { slab_depth_km: 100 }))).toBe(false);
  });

  it('agrees with the validator on edge values (the schema never rejects what the validator accepts)', () => {
    const validate = compile(sweepJsonSchema());
    const cases: { sweep: unknown; ok: boolean }[] = [
      { sweep: { axes: { tp_c: { values: [1100, 1800] } } }, ok: true },
      { sweep: { axes: { tp_c: { values: [1099.9] } } }, ok: false },
      { sweep: { axes: { tp_c: { from: 1300, to: 1400, count: 1e5 } } }, ok: true },
      { sweep: { axes: { tp_c: { from: 1300, to: 1400, count: 100001 } } }, ok: false },
      { sweep: { fixed: { tp_c: 1300, upwelling_mm_yr: 1e-9 } }, ok: true },
      { sweep: { name: null, axes: null, fixed: { tp_c: 1300 }, design: null, model: null }, ok: true },
      { sweep: { name: '   ', fixed: { tp_c: 1300 } }, ok: false },
      { sweep: { fixed: { tp_c: 1300 }, model: { process: null, params: null } }, ok: true },
      { sweep: { fixed: { tp_c: 1300 }, model: { process: 'decompression', thermal: 'conductive', water: 'batch' }, axes: { upwelling_mm_yr: { from: 2, to: 80, count: 4, scale: 'log' } } }, ok: true },
      { sweep: { fixed: { tp_c: 1300 }, axes: { water_ppm: { from: 10, to: 100, step: 10, scale: 'log' } } }, ok: false },
      { sweep: { axes: { tp_c: { from: 1300, to: 1400 } }, design: { kind: 'sobol', samples: 64, skip: 0, seed: 3 } }, ok: true },
      { sweep: { axes: { tp_c: { from: 1300, to: 1400 } }, design: { kind: 'saltelli', base: 0 } }, ok: false },
      { sweep: { axes: { tp_c: { from: 1300, to: 1400, count: 3 } }, design: 'grid' }, ok: true },
      { sweep: { axes: { tp_c: { from: 1300, to: 1400, count: 3 } }, design: 'sobol' }, ok: false },
      { sweep: { axes: { tp_c: { from: 1300, to: 1400, step: 0 } } }, ok: false },
    ];
    for (const c of cases) {
      const schemaOk = validate(c.sweep);
      const validatorOk = problemsOfSafe(() => validateSweep(c.sweep)).length === 0;
      expect({ sweep: c.sweep, schema: schemaOk, validator: validatorOk }).toEqual({ sweep: c.sweep, schema: c.ok, validator: c.ok });
    }
  });

  it('a registered process gets its own branch: its inputs are allowed, another process\'s are not', async () => {
    const href = pathToFileURL(fileURLToPath(new URL('../fixtures/fake-process.mjs', import.meta.url))).href;
    const mod = (await import(href)) as { default: ProcessDefinition<{ scale: number }> };
    registerProcess(mod.default);
    const validate = compile(sweepJsonSchema());
    const fake = (axes: object, model: object = {}) => ({ axes, model: { process: 'fake', ...model } });
    const cases: { sweep: unknown; ok: boolean }[] = [
      { sweep: fake({ a_frac: { values: [0.2, 0.8] } }), ok: true },
      { sweep: fake({ a_frac: { values: [0.2, 0.8] } }, { scale: 2 }), ok: true },
      { sweep: fake({ a_frac: { values: [0.2, 1.5] } }), ok: false },
      { sweep: fake({ a_frac: { values: [0.2] }, tp_c: { values: [1300] } }), ok: false },
      { sweep: fake({ b_frac: { values: [0.2] } }), ok: false },
      { sweep: fake({ a_frac: { values: [0.2] } }, { thermal: 'isentropic' }), ok: false },
      { sweep: { axes: { a_frac: { values: [0.2] } } }, ok: false },
    ];
    for (const c of cases) {
      const validatorOk = problemsOfSafe(() => validateSweep(c.sweep)).length === 0;
      expect({ sweep: c.sweep, schema: validate(c.sweep), validator: validatorOk }).toEqual({ sweep: c.sweep, schema: c.ok, validator: c.ok });
    }
  });
});

function problemsOfSafe(fn: () => unknown): readonly string[] {
  try {
    fn();
    return [];
  } catch {
    return problemsOf(fn);
  }
}
