import { describe, expect, it } from 'vitest';
import { loadSweepFile } from '../../src/spec/index.js';
import { describePlan, planSweep } from '../../src/plan/index.js';

describe('describePlan', () => {
  it('summarises a grid', async () => {
    const spec = await loadSweepFile('sweeps/demo-ridge-r7.yaml');
    expect(describePlan(spec, planSweep(spec))).toEqual([
      'sweep: ridge-segment-R7',
      'points: 180',
      'design: grid, full factorial of 9 x 5 x 4, last axis varies fastest',
      'axes:',
      '  tp_c             9 values: 1280, 1300, 1320, ..., 1420, 1440 degC',
      '  water_ppm        5 values: 0, 50, 100, 200, 400 ppm',
      '  lid_km           4 values: 0, 10, 20, 30 km',
      'constant inputs:',
      '  upwelling_mm_yr  30 mm/yr',
      'model: thermal isentropic, water batch, tolerance 0.0001, published parameters',
    ]);
  });

  it('summarises a saltelli design', async () => {
    const spec = await loadSweepFile('sweeps/plume-p3-saltelli.yaml');
    expect(describePlan(spec, planSweep(spec))).toEqual([
      'sweep: plume-p3-saltelli',
      'points: 1280',
      'design: saltelli, base 256 x 5 blocks (A, B, AB[tp_c], AB[water_ppm], AB[upwelling_mm_yr]), Sobol sequence of 6 dimensions, skip 0, no shift',
      'axes:',
      '  tp_c             uniform on 1400 to 1600 degC',
      '  water_ppm        uniform on 50 to 500 ppm',
      '  upwelling_mm_yr  log-uniform on 20 to 200 mm/yr',
      'constant inputs:',
      '  lid_km           60 km',
      'model: thermal conductive, water batch, tolerance 0.001, parameters M_cpx = 0.15',
    ]);
  });

  it('summarises a latin hypercube', async () => {
    const spec = await loadSweepFile('sweeps/backarc-basin-b-lhs.yaml');
    const lines = describePlan(spec, planSweep(spec));
    expect(lines.slice(1, 3)).toEqual(['points: 2000', 'design: latin-hypercube, 2000 samples, seed 20240611']);
    expect(lines).not.toContain('constant inputs:');
  });
});
