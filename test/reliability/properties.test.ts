import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { meltFraction } from '../../src/physics/melting.js';
import { DEFAULT_PARAMS } from '../../src/physics/params.js';
import { meltColumn } from '../../src/physics/column.js';
import { COLUMN_STATUSES, type ModelOptions } from '../../src/physics/types.js';
import { RESULT_NUMERIC_NAMES } from '../../src/physics/fields.js';
import { INPUT_RANGES } from '../../src/physics/ranges.js';
import { parseSweepText } from '../../src/spec/index.js';
import { InputError } from '../../src/errors.js';

const params = DEFAULT_PARAMS;

describe('melting function properties', () => {
  it('F stays in [0, 1] and never decreases with T, at any P and water content', () => {
    fc.assert(
      fc.property(
        fc.double({ min: 0, max: 8, noNaN: true }),
        fc.double({ min: 0, max: 5, noNaN: true }),
        fc.double({ min: 600, max: 2200, noNaN: true }),
        fc.double({ min: 0, max: 300, noNaN: true }),
        (pGpa, waterWtPct, tC, dT) => {
          const f1 = meltFraction(tC, pGpa, waterWtPct, params);
          const f2 = meltFraction(tC + dT, pGpa, waterWtPct, params);
          expect(f1).toBeGreaterThanOrEqual(0);
          expect(f2).toBeLessThanOrEqual(1);
          expect(f2).toBeGreaterThanOrEqual(f1 - 1e-12);
        },
      ),
      { numRuns: 2000, seed: 42 },
    );
  });
});

function scenarioArb(withUpwelling: boolean) {
  const r = INPUT_RANGES;
  return fc.record({
    tp_c: fc.double({ min: r.tp_c.min, max: r.tp_c.max, noNaN: true }),
    water_ppm: fc.oneof(fc.constant(0), fc.double({ min: r.water_ppm.min, max: r.water_ppm.max, noNaN: true })),
    lid_km: fc.oneof(fc.constant(0), fc.double({ min: r.lid_km.min, max: r.lid_km.max, noNaN: true })),
    upwelling_mm_yr: withUpwelling
      ? fc.double({ min: Math.max(r.upwelling_mm_yr.min, 0.1), max: r.upwelling_mm_yr.max, noNaN: true })
      : fc.constant(NaN),
  });
}

function checkRow(scenario: { tp_c: number; water_ppm: number; lid_km: number; upwelling_mm_yr: number }, model: ModelOptions): void {
  const r = meltColumn(scenario, model);
  expect(COLUMN_STATUSES).toContain(r.status);
  if (r.status === 'ok') {
    for (const name of RESULT_NUMERIC_NAMES) {
      const v = r[name];
      if (v !== null) expect(Number.isFinite(v), `${name} = ${v} for ${JSON.stringify(scenario)}`).toBe(true);
    }
    expect(r.f_max!).toBeGreaterThan(0);
    expect(r.f_max!).toBeLessThanOrEqual(1);
    expect(r.crust_km!).toBeGreaterThanOrEqual(0);
  } else if (r.status === 'no_melt') {
    expect(r.crust_km).toBe(0);
    expect(r.onset_p_gpa).toBeNull();
  } else {
    expect(typeof r.reason).toBe('string');
  }
}

describe('every valid scenario gives a well-formed row', () => {
  it('isentropic, batch and fractional water', () => {
    for (const water of ['batch', 'fractional'] as const) {
      const model: ModelOptions = { thermal: 'isentropic', water, params };
      fc.assert(fc.property(scenarioArb(false), (s) => checkRow(s, model)), { numRuns: 400, seed: 7 });
    }
  });

  it('conductive, across the whole upwelling range', () => {
    const model: ModelOptions = { thermal: 'conductive', water: 'batch', params };
    fc.assert(fc.property(scenarioArb(true), (s) => checkRow(s, model)), { numRuns: 60, seed: 11 });
  });
});

describe('junk sweep files never crash the parser', () => {
  const expectCleanOutcome = (text: string, name: string): void => {
    try {
      parseSweepText(text, name);
    } catch (err) {
      expect(err).toBeInstanceOf(InputError);
      const problems = (err as InputError).problems;
      expect(problems.length).toBeGreaterThan(0);
      for (const p of problems) expect(p.length).toBeGreaterThan(5);
    }
  };

  it('random text as YAML and as JSON', () => {
    fc.assert(
      fc.property(fc.string({ maxLength: 300 }), (text) => {
        expectCleanOutcome(text, 'junk.yaml');
        expectCleanOutcome(text, 'junk.json');
      }),
      { numRuns: 1500, seed: 3 },
    );
  });

  it('random JSON values and near-miss sweep structures', () => {
    const key = fc.constantFrom('name', 'axes', 'fixed', 'design', 'model', 'tp_c', 'water_ppm', 'lid_km', 'from', 'to', 'step', 'count', 'values', 'scale', 'kind', 'samples', 'seed', 'base', 'thermal', 'water', 'params', 'desing', 'tp');
    const leaf = fc.oneof(fc.double(), fc.integer(), fc.string({ maxLength: 8 }), fc.boolean(), fc.constant(null), fc.constantFrom('grid', 'sobol', 'log', 'batch'));
    const tree = fc.letrec((tie) => ({
      node: fc.oneof({ depthSize: 'small' }, leaf, fc.array(tie('node'), { maxLength: 4 }), fc.dictionary(key, tie('node'), { maxKeys: 5 })),
    })).node;
    fc.assert(
      fc.property(tree, (value) => {
        expectCleanOutcome(JSON.stringify(value) ?? 'null', 'junk.json');
      }),
      { numRuns: 1500, seed: 5 },
    );
  });
});
