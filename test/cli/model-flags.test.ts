import { describe, expect, it } from 'vitest';
import { InputError } from '../../src/errors.js';
import { columnInputs } from '../../src/cli/commands/column.js';
import { plotColumnInputs } from '../../src/cli/commands/plot.js';
import { modelFromFlags } from '../../src/cli/model-flags.js';
import { meltColumn, defaultModel } from '../../src/physics/column.js';
import { processNamed } from '../../src/process/registry.js';

function problemsOf(fn: () => unknown): readonly string[] {
  try {
    fn();
  } catch (err) {
    expect(err).toBeInstanceOf(InputError);
    return (err as InputError).problems;
  }
  throw new Error('no error');
}

const PLOT = { tp: '1350', water: '0', lid: '0', thermal: 'auto', mode: 'batch', step: '0.05', output: 'x.svg' };

describe('one reader of the model flags for column and plot column', () => {
  it('reads the flags into a validated model section', () => {
    expect(modelFromFlags(processNamed('decompression'), { mode: 'fractional', thermal: 'isentropic', step: '0.01', deepOnset: 'cap' })).toEqual({
      model: { thermal: 'isentropic', water: 'fractional', params: {}, step_gpa: 0.01, deep_onset: 'cap' },
      problems: [],
    });
  });

  it('column and plot column word the same problems the same way', () => {
    const expected = [
      '--step: 9 is above the model\'s range 0.0001-0.5 GPa',
      '--thermal: "hot" is not a thermal model; allowed: isentropic, conductive, auto',
      '--mode: "wet" is not a water mode; allowed: batch, fractional',
      '--deep-onset: "clip" is not a deep-onset mode; did you mean cap? (allowed: drop, cap)',
    ];
    expect(problemsOf(() => columnInputs({ tp: '1350', thermal: 'hot', mode: 'wet', step: '9', deepOnset: 'clip' }))).toEqual(expected);
    expect(problemsOf(() => plotColumnInputs({ ...PLOT, thermal: 'hot', mode: 'wet', step: '9', deepOnset: 'clip' }))).toEqual(expected);
  });

  it('plot column draws capped onsets with --deep-onset cap', () => {
    const { model } = plotColumnInputs({ ...PLOT, deepOnset: 'cap' });
    expect(model.deepOnset).toBe('cap');
  });
});

describe('one check of the scenario for both thermal models', () => {
  it('a lid deeper than the model range fails with the same reason', () => {
    const s = { tp_c: 1350, water_ppm: 0, lid_km: 300, upwelling_mm_yr: 10 };
    // P = rho_s g z = 3300 x 9.81 x 300 km = 9.712 GPa (analytic)
    const reason = 'the lid base at 9.712 GPa is deeper than the model range (8 GPa)';
    expect(meltColumn(s, defaultModel({ thermal: 'isentropic' })).reason).toBe(reason);
    expect(meltColumn(s, defaultModel({ thermal: 'conductive' })).reason).toBe(reason);
    const bad = { ...s, lid_km: 10, water_ppm: -1 };
    expect(meltColumn(bad, defaultModel({ thermal: 'isentropic' })).reason).toBe('water_ppm must be a finite number >= 0, got -1');
    expect(meltColumn(bad, defaultModel({ thermal: 'conductive' })).reason).toBe('water_ppm must be a finite number >= 0, got -1');
  });
});
