import { readFile } from 'node:fs/promises';
import { describe, expect, it } from 'vitest';
import { INPUT_DEFAULTS, loadSweepFile, normalizeSweep, parseSweepText, sweepHash, canonicalJson, validateSweep } from '../../src/spec/index.js';
import type { SweepSpec } from '../../src/spec/index.js';

function isDeepFrozen(value: unknown): boolean {
  if (typeof value !== 'object' || value === null) return true;
  return Object.isFrozen(value) && Object.values(value).every(isDeepFrozen);
}

describe('normalized spec', () => {
  it('the demo sweep parses with its meaning unchanged', async () => {
    const spec = await loadSweepFile('sweeps/demo-ridge-r7.yaml');
    expect(spec.name).toBe('ridge-segment-R7');
    expect(spec.axes.map((a) => [a.name, a.values])).toEqual([
      ['tp_c', [1280, 1300, 1320, 1340, 1360, 1380, 1400, 1420, 1440]],
      ['water_ppm', [0, 50, 100, 200, 400]],
      ['lid_km', [0, 10, 20, 30]],
    ]);
    expect(spec.fixed).toEqual({ upwelling_mm_yr: 30 });
    expect(spec.design).toEqual({ kind: 'grid' });
    expect(spec.model).toEqual({ thermal: 'isentropic', water: 'batch', params: {}, tolerance: 1e-4 });
  });

  it('the example sweeps parse', async () => {
    const lhs = await loadSweepFile('sweeps/backarc-basin-b-lhs.yaml');
    expect(lhs.design).toEqual({ kind: 'latin-hypercube', samples: 2000, seed: 20240611 });
    expect(lhs.axes.map((a) => a.name)).toEqual(['tp_c', 'water_ppm', 'lid_km', 'upwelling_mm_yr']);
    const sal = await loadSweepFile('sweeps/plume-p3-saltelli.yaml');
    expect(sal.design).toEqual({ kind: 'saltelli', base: 256, skip: 0 });
    expect(sal.fixed).toEqual({ lid_km: 60 });
    expect(sal.model.params).toEqual({ M_cpx: 0.15 });
  });

  it('is deep-frozen and survives a JSON round trip unchanged', async () => {
    const spec = await loadSweepFile('sweeps/plume-p3-saltelli.yaml');
    expect(isDeepFrozen(spec)).toBe(true);
    const back = JSON.parse(JSON.stringify(spec)) as SweepSpec;
    expect(back).toEqual(spec);
    expect(normalizeSweep(back)).toEqual(spec);
  });

  it('writes the defaults of inputs neither swept nor fixed (upwelling absent)', () => {
    const spec = validateSweep({ axes: { tp_c: { values: [1300, 1350] } } });
    expect(spec.fixed).toEqual({ water_ppm: INPUT_DEFAULTS.water_ppm, lid_km: INPUT_DEFAULTS.lid_km });
    expect(spec.design).toEqual({ kind: 'grid' });
    expect(spec.model).toEqual({ thermal: 'auto', water: 'batch', params: {}, tolerance: 1e-4 });
    expect(spec.name).toBe('sweep');
  });

  it('takes the file name when the sweep has no name', () => {
    expect(parseSweepText('axes: { tp_c: { values: [1300] } }', 'dir/my-run.yaml').name).toBe('my-run');
  });

  it('design short form and defaults', () => {
    const spec = validateSweep({ axes: { tp_c: { from: 1300, to: 1400 } }, design: { kind: 'sobol', samples: 64 } });
    expect(spec.design).toEqual({ kind: 'sobol', samples: 64, skip: 0 });
    const lhs = validateSweep({ axes: { tp_c: { from: 1300, to: 1400 } }, design: { kind: 'latin-hypercube', samples: 8 } });
    expect(lhs.design).toEqual({ kind: 'latin-hypercube', samples: 8, seed: 0 });
    expect(validateSweep({ axes: { tp_c: { values: [1300] } }, design: 'grid' }).design).toEqual({ kind: 'grid' });
  });
});

describe('sweepHash', () => {
  const a = 'name: h\naxes:\n  tp_c: { from: 1300, to: 1400, step: 50 }\nfixed: { lid_km: 0 }\ndesign: { kind: grid }\n';
  it('is a sha256 hex digest', () => {
    expect(sweepHash(parseSweepText(a, 'h.yaml'))).toMatch(/^[0-9a-f]{64}$/);
  });
  it('is the same for files that make the same points (key order, defaults, values written out)', () => {
    const b = '{"design": {"kind": "grid"}, "axes": {"tp_c": {"values": [1300, 1350, 1400]}}, "name": "h"}';
    expect(sweepHash(parseSweepText(b, 'h.json'))).toBe(sweepHash(parseSweepText(a, 'h.yaml')));
  });
  it('changes when the points change', () => {
    const c = a.replace('step: 50', 'step: 25');
    expect(sweepHash(parseSweepText(c, 'h.yaml'))).not.toBe(sweepHash(parseSweepText(a, 'h.yaml')));
  });
  it('canonical JSON sorts keys at every level', () => {
    expect(canonicalJson({ b: 1, a: { d: [3, { f: 1, e: 2 }], c: 2 } })).toBe('{"a":{"c":2,"d":[3,{"e":2,"f":1}]},"b":1}');
  });
  it('is stable across versions for a fixed spec (update only on purpose)', async () => {
    // changed on purpose when sweeps without step_gpa moved to error-controlled steps (tolerance 1e-4)
    const text = await readFile('sweeps/demo-ridge-r7.yaml', 'utf8');
    expect(sweepHash(parseSweepText(text, 'demo-ridge-r7.yaml'))).toBe('55f2cea0981608120766837b0f2f9e7497e1479f01e8d1022c554c79642d789c');
  });
  it('a sweep that gives step_gpa keeps the hash it had before tolerances existed', async () => {
    // c2dc8f25...: the hash of the demo sweep (which then ran at the 0.05 GPa default step) before
    // tolerances existed; the same sweep with step_gpa 0.05 written out must keep it
    const text = (await readFile('sweeps/demo-ridge-r7.yaml', 'utf8')).replace('model: { thermal: isentropic, water: batch }', 'model: { thermal: isentropic, water: batch, step_gpa: 0.05 }');
    expect(text).toContain('step_gpa: 0.05');
    const spec = parseSweepText(text, 'demo-ridge-r7.yaml');
    expect(spec.model).toEqual({ thermal: 'isentropic', water: 'batch', params: {}, step_gpa: 0.05 });
    expect(sweepHash(spec)).toBe('c2dc8f25c444939f38b362079de67865ac304771536a312c24d3157f6d601a92');
  });
  it('step_gpa and tolerance together are refused, naming both', () => {
    expect(() => validateSweep({ axes: { tp_c: { values: [1300] } }, model: { step_gpa: 0.05, tolerance: 1e-4 } })).toThrow(/model\.tolerance: 0\.0001 given together with step_gpa 0\.05/);
    expect(() => validateSweep({ axes: { tp_c: { values: [1300] } }, model: { tolerance: 0.5 } })).toThrow(/model\.tolerance: 0\.5 is above the allowed range 0\.000001-0\.01/);
    expect(validateSweep({ axes: { tp_c: { values: [1300] } }, model: { tolerance: 1e-3 } }).model).toEqual({ thermal: 'auto', water: 'batch', params: {}, tolerance: 1e-3 });
  });

  it('a tolerance not given is the default of the column the sweep runs: 1e-3 conductive, 1e-4 isentropic', () => {
    const model = (m: Record<string, unknown>, extra: Record<string, unknown> = {}): unknown => validateSweep({ axes: { tp_c: { values: [1300] } }, ...extra, model: m }).model;
    expect(model({})).toEqual({ thermal: 'auto', water: 'batch', params: {}, tolerance: 1e-4 });
    // auto with an upwelling rate (fixed or swept) runs the conductive column
    expect(model({}, { fixed: { upwelling_mm_yr: 10 } })).toEqual({ thermal: 'auto', water: 'batch', params: {}, tolerance: 1e-3 });
    expect(validateSweep({ axes: { tp_c: { values: [1300] }, upwelling_mm_yr: { values: [3, 30] } } }).model).toMatchObject({ tolerance: 1e-3 });
    expect(model({ thermal: 'conductive' }, { fixed: { upwelling_mm_yr: 10 } })).toMatchObject({ tolerance: 1e-3 });
    expect(model({ thermal: 'isentropic' }, { fixed: { upwelling_mm_yr: 10 } })).toMatchObject({ tolerance: 1e-4 });
    // a given tolerance is kept for either column
    expect(model({ tolerance: 2e-4 }, { fixed: { upwelling_mm_yr: 10 } })).toMatchObject({ tolerance: 2e-4 });
  });

  it('a conductive sweep refuses a tolerance below the conductive range, naming field, value and range', () => {
    expect(() => validateSweep({ axes: { tp_c: { values: [1300] } }, fixed: { upwelling_mm_yr: 10 }, model: { tolerance: 1e-5 } })).toThrow(
      /model\.tolerance: 0\.00001 is below the conductive column's allowed range 0\.0001-0\.01 \(relative\)/,
    );
    // the same value is fine for an isentropic sweep
    expect(validateSweep({ axes: { tp_c: { values: [1300] } }, model: { tolerance: 1e-5 } }).model).toMatchObject({ tolerance: 1e-5 });
  });
});
