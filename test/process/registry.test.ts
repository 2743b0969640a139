import { describe, expect, it } from 'vitest';
import * as arrow from 'apache-arrow';
import { InputError } from '../../src/errors.js';
import { readResultsMeta, resultsSchema, tableFieldsOf, META } from '../../src/io/arrow-schema.js';
import { DEFAULT_PARAMS } from '../../src/physics/params.js';
import { COLUMN_STATUSES } from '../../src/physics/types.js';
import { DEFAULT_PROCESS, PROCESSES, processNamed, processNames } from '../../src/process/registry.js';
import { sweepHash, validateSweep } from '../../src/spec/index.js';

const problemsOf = (raw: unknown): readonly string[] => {
  try {
    validateSweep(raw);
  } catch (err) {
    if (err instanceof InputError) return err.problems;
    throw err;
  }
  return [];
};

describe('process registry: every process is consistent', () => {
  it('has the default process and unique process names', () => {
    expect(processNames()).toContain(DEFAULT_PROCESS);
    expect(new Set(processNames()).size).toBe(processNames().length);
  });
  for (const p of PROCESSES) {
    const model = { ...p.model.defaults, params: {} };
    const inputs = p.inputsFor(model);
    describe(p.name, () => {
      it('inputs and results have unique names, units, labels and display units', () => {
        const names = [...inputs.map((i) => i.name), ...p.results.map((r) => r.name), 'scenario_id', 'block', 'status', 'reason'];
        expect(new Set(names).size).toBe(names.length);
        expect(new Set(inputs.map((i) => i.cliFlag)).size).toBe(inputs.length);
        for (const f of [...inputs, ...p.results, ...(p.profile ?? [])]) {
          expect(f.name, f.name).toMatch(/^[a-z][a-z0-9_]*$/);
          expect(typeof f.unit, f.name).toBe('string');
          expect(f.label.length, f.name).toBeGreaterThan(0);
          expect(typeof f.displayUnit, f.name).toBe('string');
          expect(f.description.length, f.name).toBeGreaterThan(0);
        }
        for (const r of p.results) expect(r.kind, r.name).toBe('float64');
      });
      it('ranges are ordered and defaults lie inside them (or are null / NaN = not given on a nullable input)', () => {
        for (const i of inputs) {
          expect(i.min, i.name).toBeLessThan(i.max);
          if (i.default === null) continue;
          if (Number.isNaN(i.default)) {
            expect(i.nullable, `${i.name}: NaN default needs a nullable field`).toBe(true);
            continue;
          }
          expect(i.default, i.name).toBeGreaterThanOrEqual(i.min);
          expect(i.default, i.name).toBeLessThanOrEqual(i.max);
          if (i.minExclusive) expect(i.default, i.name).toBeGreaterThan(i.min);
        }
      });
      it('the default outputs of a report are result fields of the process, each once', () => {
        const names = [...p.results, ...(p.optionalResults ?? [])].map((r) => r.name);
        const chosen = p.reportOutputs ?? [];
        for (const n of chosen) expect(names, n).toContain(n);
        expect(new Set(chosen).size).toBe(chosen.length);
      });

      it('statuses are a subset of the common status dictionary', () => {
        for (const s of p.statuses) expect(COLUMN_STATUSES).toContain(s);
      });
      it('the default model section validates and normalizes to itself', () => {
        const spec = validateSweep({
          axes: Object.fromEntries(inputs.filter((i) => i.default === null).map((i) => [i.name, { values: [i.min, i.max] }])),
          model: p.name === DEFAULT_PROCESS ? {} : { process: p.name },
        });
        expect(p.model.normalize(spec.model)).toEqual(spec.model);
      });
    });
  }
});

describe('process of a sweep', () => {
  it('an unknown process is an error listing the known ones', () => {
    expect(problemsOf({ axes: { tp_c: { values: [1300] } }, model: { process: 'nonesuch' } })).toEqual([
      `model.process: "nonesuch" is not a known process; allowed: ${processNames().join(', ')}`,
    ]);
    expect(() => processNamed('nonesuch', '--process')).toThrow(/--process: unknown process "nonesuch"; known processes: decompression/);
  });
  it('an input the process does not use is an error naming the input and the process (axes and fixed)', () => {
    expect(problemsOf({ axes: { tp_c: { values: [1300] }, slab_depth_km: { values: [100] } } })).toEqual([
      'axes.slab_depth_km: slab_depth_km is not an input of process decompression; its inputs: tp_c, water_ppm, lid_km, upwelling_mm_yr',
    ]);
    expect(problemsOf({ axes: { tp_c: { values: [1300] } }, fixed: { slab_depth_km: 100 } })).toEqual([
      'fixed.slab_depth_km: slab_depth_km is not an input of process decompression; its inputs: tp_c, water_ppm, lid_km, upwelling_mm_yr',
    ]);
  });
  it('model.process: decompression is the default and is left out of the normalized spec (old hashes stay)', () => {
    const plain = validateSweep({ axes: { tp_c: { values: [1300] } } });
    const named = validateSweep({ axes: { tp_c: { values: [1300] } }, model: { process: 'decompression' } });
    expect(named).toEqual(plain);
    expect('process' in plain.model).toBe(false);
  });
  it('the schema metadata carries the process and reading it back gives its inputs and results', () => {
    const spec = validateSweep({ axes: { tp_c: { values: [1300] } } });
    const fields = tableFieldsOf(spec);
    const schema = resultsSchema({
      ...fields, sweepJson: JSON.stringify(spec), sweepHash: sweepHash(spec), toolVersion: 't', params: DEFAULT_PARAMS,
      pointCount: 1, rowStart: 0, rowEnd: 1, shard: '1/1', blockLabels: null,
    });
    expect(schema.metadata.get(META.process)).toBe('decompression');
    expect(schema.fields.map((f) => f.name).slice(1, 5)).toEqual(['tp_c', 'water_ppm', 'lid_km', 'upwelling_mm_yr']);
    const back = readResultsMeta(schema);
    expect(back.process).toBe('decompression');
    expect(back.results.map((r) => r.name)).toEqual(PROCESSES[0].results.map((r) => r.name));
    // a table written before processes existed has no process key: it is decompression
    const old = new arrow.Schema(schema.fields, new Map([...schema.metadata].filter(([k]) => k !== META.process)));
    expect(readResultsMeta(old).process).toBe('decompression');
  });
});
