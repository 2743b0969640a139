import { describe, expect, it } from 'vitest';
import { InputError } from '../../src/errors.js';
import { PLANNERS, planSweep } from '../../src/plan/index.js';
import type { SweepSpec } from '../../src/spec/index.js';

describe('planSweep', () => {
  it('has one planner per design kind', () => {
    expect(Object.keys(PLANNERS).sort()).toEqual(['grid', 'latin-hypercube', 'saltelli', 'sobol']);
  });

  it('planSweep refuses an empty or oversized plan built by hand', () => {
    const base: SweepSpec = {
      name: 'hand',
      axes: [{ name: 'tp_c', values: [], min: 1300, max: 1300, scale: 'linear' }],
      fixed: {},
      design: { kind: 'grid' },
      model: { thermal: 'auto', water: 'batch', params: {}, step_gpa: 0.05 },
    };
    expect(() => planSweep(base)).toThrow(InputError);
    expect(() => planSweep(base)).toThrow('grid: the sweep "hand" has no points to plan (count 0)');
    const huge: SweepSpec = { ...base, axes: [{ name: 'tp_c', values: [1300, 1400], min: 1300, max: 1400, scale: 'linear' }], design: { kind: 'latin-hypercube', samples: 2 ** 41, seed: 0 } };
    expect(() => planSweep(huge)).toThrow('latin-hypercube: the sweep "hand" has 2199023255552 points, above the limit of 1099511627776 (2^40)');
    const none: SweepSpec = { ...huge, design: { kind: 'latin-hypercube', samples: 0, seed: 0 } };
    expect(() => planSweep(none)).toThrow('latin-hypercube: the sweep "hand" has no points to plan (count 0)');
  });
});
