/**
 * Pinned points of seeded designs: the same seed must give the same points on every machine and
 * in every version. A change here changes every seeded sweep already run; update only on purpose.
 */
import { describe, expect, it } from 'vitest';
import { fillRange, planSweep, specWith } from './helpers.js';

const AXES = { tp_c: { from: 1280, to: 1420 }, upwelling_mm_yr: { from: 2, to: 80, scale: 'log' } };

describe('seeded designs are pinned', () => {
  it('latin-hypercube, seed 42', () => {
    const b = fillRange(planSweep(specWith({ kind: 'latin-hypercube', samples: 1000, seed: 42 }, AXES)), 0, 3);
    expect(Array.from(b.inputs.tp_c)).toEqual([1309.1333719491051, 1383.4887719315388, 1370.2706177303296]);
    expect(Array.from(b.inputs.upwelling_mm_yr)).toEqual([5.091850552088783, 14.92526910507191, 4.7527400325175835]);
  });

  it('sobol with the digital shift of seed 42', () => {
    const b = fillRange(planSweep(specWith({ kind: 'sobol', samples: 8, seed: 42 }, AXES)), 0, 3);
    expect(Array.from(b.inputs.tp_c)).toEqual([1356.13922866527, 1286.13922866527, 1321.13922866527]);
    expect(Array.from(b.inputs.upwelling_mm_yr)).toEqual([38.59935672905878, 6.103094174058629, 15.34846927792897]);
  });
});
