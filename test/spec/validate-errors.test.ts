/**
 * Every invalid sweep file gets one clear message per problem: path, value found, what is
 * allowed. These tests pin the exact wording.
 */
import { describe, expect, it } from 'vitest';
import { InputError } from '../../src/errors.js';
import { parseSweepText, validateSweep } from '../../src/spec/index.js';
import { BASE_YAML, problemsOf } from './helpers.js';

const yaml = (text: string) => problemsOf(() => parseSweepText(text, 'bad.yaml'));
const json = (text: string) => problemsOf(() => parseSweepText(text, 'bad.json'));

describe('exact messages for bad sweep files', () => {
  it('unknown top-level key, with the nearest key suggested', () => {
    expect(yaml(BASE_YAML.replace('design:', 'desing:'))).toEqual(['desing: unknown key; did you mean design?']);
  });

  it('unknown input under axes, with a suggestion (and no second "tp_c missing" message)', () => {
    expect(yaml(BASE_YAML.replace('tp_c:', 'tp:'))).toEqual(['axes.tp: unknown input; did you mean tp_c?']);
  });

  it('unknown key without a close match lists what is allowed', () => {
    expect(yaml(`${BASE_YAML}colour: blue\n`)).toEqual(['colour: unknown key; allowed: name, axes, fixed, design, model']);
  });

  it('value out of the model range', () => {
    expect(yaml(BASE_YAML.replace('to: 1420', 'to: 2400'))).toEqual([
      "axes.tp_c.to: 2400 is above the model's range 1100-1800 degC",
    ]);
  });

  it('YAML syntax error with line and column', () => {
    expect(yaml('name: t\naxes:\n  tp_c: { from: 1280, to: 1420\ndesign: { kind: grid }\n')).toEqual([
      'bad.yaml:4:1: YAML syntax error: Flow map in block collection must be sufficiently indented and end with a }',
    ]);
    expect(yaml('name: a\nname: b\n')).toEqual(['bad.yaml:2:1: YAML syntax error: Map keys must be unique']);
  });

  it('JSON syntax error with line and column', () => {
    const text = '{\n  "name": "x",\n  "axes": {\n    "tp_c": { "values": [1300 1400] }\n  }\n}\n';
    expect(json(text)).toEqual(["bad.json:4:31: JSON syntax error: expected ',' or ']' after a list item, found '1'"]);
    expect(json('{\n  "name": "x",\n  "axes": {},\n}\n')).toEqual(["bad.json:3:13: JSON syntax error: trailing comma before '}'"]);
  });

  it('input both swept and fixed', () => {
    expect(yaml(`${BASE_YAML}fixed: { water_ppm: 5 }\n`)).toEqual([
      'fixed.water_ppm: 5 conflicts with axes.water_ppm; an input is either swept or fixed, not both',
    ]);
  });

  it('log scale with 0', () => {
    expect(yaml('axes:\n  tp_c: { values: [1300] }\n  lid_km: { from: 0, to: 40, count: 5, scale: log }\n')).toEqual([
      'axes.lid_km.from: 0 is not allowed with scale: log; a log axis needs values above 0',
    ]);
  });

  it('missing tp_c', () => {
    expect(yaml('axes:\n  lid_km: { from: 0, to: 40, count: 5 }\n')).toEqual([
      'axes.tp_c: missing; tp_c (mantle potential temperature, 1100-1800 degC) must be swept under axes or set under fixed',
    ]);
  });

  it('step with the wrong sign', () => {
    expect(yaml(`${BASE_YAML.replace('design: { kind: grid }\n', '')}  lid_km: { from: 0, to: 40, step: -10 }\n`)).toEqual([
      'axes.lid_km.step: -10 does not lead from 0 to 40; the step must be positive',
    ]);
    expect(yaml(`${BASE_YAML.replace('design: { kind: grid }\n', '')}  lid_km: { from: 40, to: 0, step: 10 }\n`)).toEqual([
      'axes.lid_km.step: 10 does not lead from 40 to 0; the step must be negative',
    ]);
  });

  it('count 0', () => {
    expect(yaml(BASE_YAML.replace('step: 20', 'count: 0'))).toEqual([
      'axes.tp_c.count: 0 is not allowed; count must be a whole number from 1 to 100000',
    ]);
  });

  it('bad design kind, with a suggestion when close', () => {
    expect(yaml(BASE_YAML.replace('kind: grid', 'kind: random'))).toEqual([
      'design.kind: "random" is not a design kind; allowed: grid, latin-hypercube, sobol, saltelli',
    ]);
    expect(yaml(BASE_YAML.replace('kind: grid', 'kind: sobel, samples: 64'))).toEqual([
      'design.kind: "sobel" is not a design kind; did you mean sobol? (allowed: grid, latin-hypercube, sobol, saltelli)',
    ]);
  });

  it('design size missing, misspelt, or not used by the kind', () => {
    expect(yaml(BASE_YAML.replace('kind: grid', 'kind: latin-hypercube'))).toEqual([
      'design.samples: missing; a latin-hypercube design needs samples (a whole number from 1 to 1099511627776)',
    ]);
    expect(yaml(BASE_YAML.replace('kind: grid', 'kind: latin-hypercube, sampels: 100'))).toEqual([
      'design.sampels: unknown key; did you mean samples?',
    ]);
    expect(yaml(BASE_YAML.replace('kind: grid', 'kind: grid, seed: 4'))).toEqual([
      'design.seed: not used by a grid design (a grid has no randomness); allowed keys: kind',
    ]);
  });

  it('unknown axis key, with a suggestion and nothing repeated', () => {
    expect(yaml(BASE_YAML.replace('step: 20', 'stpe: 20'))).toEqual(['axes.tp_c.stpe: unknown key; did you mean step?']);
  });

  it('a bare number as an axis', () => {
    expect(yaml(BASE_YAML.replace('{ from: 1280, to: 1420, step: 20 }', '1350'))).toEqual([
      'axes.tp_c: 1350 is not an axis; write { values: [...] } or { from: ..., to: ..., step: ... } (or count: ...), or put a constant under fixed',
    ]);
  });

  it('values: repeated and non-numeric entries', () => {
    expect(yaml(BASE_YAML.replace('[0, 50, 100, 200]', '[0, 50, 50, "x"]'))).toEqual([
      'axes.water_ppm.values[2]: 50 repeats values[1]; give each value once',
      'axes.water_ppm.values[3]: "x" is not a number; allowed 0-50000 ppm',
    ]);
  });

  it('NaN, infinities and text as input values show the value, the field and the allowed range (YAML and JSON)', () => {
    expect(yaml('name: n N-1\naxes:\n  tp_c: { from: 1300, to: .nan, count: 3 }\n  water_ppm: { values: [0, .inf, -.inf, "lots"] }\nfixed: { lid_km: .NaN, upwelling_mm_yr: twenty }\n')).toEqual([
      'axes.tp_c.to: NaN is not a finite number; allowed 1100-1800 degC',
      'axes.water_ppm.values[1]: Infinity is not a finite number; allowed 0-50000 ppm',
      'axes.water_ppm.values[2]: -Infinity is not a finite number; allowed 0-50000 ppm',
      'axes.water_ppm.values[3]: "lots" is not a number; allowed 0-50000 ppm',
      'fixed.lid_km: NaN is not a finite number; allowed 0-200 km',
      'fixed.upwelling_mm_yr: "twenty" is not a number; allowed 0-10000 mm/yr (0 excluded)',
    ]);
    // JSON has no NaN literal: the text "NaN" and a number written as a string are shown as text
    expect(json('{"name": "n N-2", "axes": {"tp_c": {"values": [1300, "hot"]}}, "fixed": {"water_ppm": "NaN", "lid_km": "12"}}')).toEqual([
      'axes.tp_c.values[1]: "hot" is not a number; allowed 1100-1800 degC',
      'fixed.water_ppm: "NaN" is not a number; allowed 0-50000 ppm',
      'fixed.lid_km: "12" is not a number; allowed 0-200 km',
    ]);
  });

  it('fixed: unknown input and an excluded minimum', () => {
    expect(yaml(`${BASE_YAML}fixed: { upwelling_mm_yr: 0, lid: 3 }\n`)).toEqual([
      'fixed.lid: unknown input; did you mean lid_km?',
      "fixed.upwelling_mm_yr: 0 is outside the model's range 0-10000 mm/yr (0 excluded)",
    ]);
  });

  it('model: choices, step and parameter overrides (checked by the physics registry)', () => {
    expect(yaml(`${BASE_YAML}model: { thermal: adiabatic, step_gpa: 2, params: { Mcpx: 0.1, A1: 5 } }\n`)).toEqual([
      'model.thermal: "adiabatic" is not a thermal model; allowed: isentropic, conductive, auto',
      'model.step_gpa: 2 is above the allowed range 0.001-0.5 GPa',
      'model.params.Mcpx: unknown parameter; did you mean M_cpx?',
      'model.params.A1: 5 degC is outside the plausible range 800 to 1400 degC (anhydrous solidus: constant term)',
    ]);
  });

  it('conductive thermal model without an upwelling rate', () => {
    expect(yaml(`${BASE_YAML}model: { thermal: conductive }\n`)).toEqual([
      'model.thermal: "conductive" needs an upwelling rate; sweep upwelling_mm_yr under axes or set it under fixed',
    ]);
  });

  it('random designs need a range on every axis', () => {
    const text = 'axes:\n  tp_c: { from: 1300, to: 1400 }\n  lid_km: { values: [10] }\ndesign: { kind: latin-hypercube, samples: 10 }\n';
    expect(yaml(text)).toEqual([
      'axes.lid_km: a latin-hypercube design samples a range, but this axis has the single value 10; give a wider range or put it under fixed',
    ]);
  });

  it('grid axes need step or count', () => {
    expect(yaml('axes:\n  tp_c: { from: 1300, to: 1400 }\n')).toEqual(['axes.tp_c: a grid axis needs step or count (or values)']);
  });

  it('refuses a grid above 2^40 points', () => {
    const text =
      'axes:\n  tp_c: { from: 1100, to: 1800, count: 100000 }\n  water_ppm: { from: 0, to: 50000, count: 100000 }\n' +
      '  lid_km: { from: 0, to: 200, count: 1000 }\n';
    expect(yaml(text)).toEqual(['axes: the grid has 100000 x 100000 x 1000 = 10000000000000 points, above the limit of 1099511627776 (2^40)']);
  });

  it('empty and non-mapping files', () => {
    expect(yaml('')).toEqual(['(top level): the sweep is empty; expected a mapping with keys name, axes, fixed, design, model']);
    expect(yaml('- 1\n- 2\n')).toEqual(['(top level): a list is not a sweep; expected a mapping with keys name, axes, fixed, design, model']);
  });

  it('collects every problem of a file in one InputError', () => {
    const text = 'nmae: x\naxes:\n  tp_c: { from: 900, to: 1420, step: 20 }\ndesign: { kind: sobol, samples: 0 }\n';
    let caught: unknown;
    try {
      parseSweepText(text, 'many.yaml');
    } catch (err) {
      caught = err;
    }
    expect(caught).toBeInstanceOf(InputError);
    expect((caught as InputError).problems).toEqual([
      'nmae: unknown key; did you mean name?',
      "axes.tp_c.from: 900 is below the model's range 1100-1800 degC",
      'design.samples: 0 is not allowed; samples must be a whole number from 1 to 4294967296',
    ]);
    expect((caught as InputError).message).toBe((caught as InputError).problems.join('\n'));
  });

  it('validateSweep checks objects built in code the same way', () => {
    expect(problemsOf(() => validateSweep({ axes: { tp_c: { values: [1300] } }, fixed: { lid_km: '6' } }))).toEqual([
      'fixed.lid_km: "6" is not a number; allowed 0-200 km',
    ]);
    expect(problemsOf(() => validateSweep([1, 2]))).toHaveLength(1);
  });
});
