/** Observations from options and files: parsed, and every mistake named with what is allowed. */
import { describe, expect, it } from 'vitest';
import { checkObservations, observationsFromData, parseDiscrepancyOption, parseObserveOption } from '../../src/fit/index.js';
import { problemsOf } from '../helpers.js';

const problems = (fn: () => unknown): readonly string[] => problemsOf(fn, true);

const cols = { outputs: { crust_km: 'km', f_max: 'fraction', onset_depth_km: 'km', h2o_melt_wt_pct: 'wt%' }, inputs: ['tp_c', 'water_ppm'], empty: ['h2o_melt_wt_pct'], source: 'r7.arrow' };

describe('--observe NAME=VALUE+-SD', () => {
  it('parses value and sd (+- or ±, exponents)', () => {
    expect(parseObserveOption('crust_km=7.1+-0.8')).toEqual({ output: 'crust_km', value: 7.1, sd: 0.8 });
    expect(parseObserveOption('crust_km = 6.3 ± 0.6')).toEqual({ output: 'crust_km', value: 6.3, sd: 0.6 });
    expect(parseObserveOption('f_max=1.5e-1+-2e-2')).toEqual({ output: 'f_max', value: 0.15, sd: 0.02 });
  });

  it('names what is wrong', () => {
    expect(problems(() => parseObserveOption('crust_km=7.1+-'))).toEqual(['--observe crust_km: the standard deviation after "+-" is missing; write crust_km=7.1+-SD with SD above 0']);
    expect(problems(() => parseObserveOption('crust_km=7.1+--0.8'))).toEqual(['--observe crust_km: standard deviation -0.8 is not allowed; it must be above 0']);
    expect(problems(() => parseObserveOption('crust_km=7.1+-0'))).toEqual(['--observe crust_km: standard deviation 0 is not allowed; it must be above 0']);
    expect(problems(() => parseObserveOption('crust_km=seven+-0.8'))).toEqual(['--observe crust_km: "seven" is not a number; the value must be a number in the output\'s unit']);
    expect(problems(() => parseObserveOption('crust_km=7.1+-wide'))).toEqual(['--observe crust_km: "wide" is not a number; the standard deviation must be a number above 0']);
    expect(problems(() => parseObserveOption('crust_km=7.1'))[0]).toMatch(/^--observe crust_km: 7.1 has no standard deviation; write crust_km=VALUE\+-SD/);
    expect(problems(() => parseObserveOption('7.1+-0.8'))[0]).toMatch(/^--observe: "7.1\+-0.8" is not allowed; write NAME=VALUE\+-SD, e.g. crust_km=7.1\+-0.8/);
    expect(problems(() => parseObserveOption('crust_km=+-0.8'))[0]).toMatch(/the value before "\+-" is missing/);
  });

  it('--discrepancy NAME=SD: 0 or more', () => {
    expect(parseDiscrepancyOption('crust_km=0.5')).toEqual({ output: 'crust_km', sd: 0.5 });
    expect(problems(() => parseDiscrepancyOption('crust_km=-1'))).toEqual(['--discrepancy crust_km: -1 is not allowed; the discrepancy standard deviation must be 0 or above']);
  });
});

describe('observations against the table', () => {
  it('an unknown name gets "did you mean"; an input is named as one; an empty output is refused', () => {
    const p = problems(() =>
      checkObservations(
        [
          { output: 'crust', value: 7, sd: 1 },
          { output: 'tp_c', value: 1300, sd: 10 },
          { output: 'h2o_melt_wt_pct', value: 0.2, sd: 0.05 },
        ],
        [{ output: 'f_max', sd: 0.01 }],
        ['onset_dept_km'],
        cols,
      ),
    );
    expect(p).toEqual([
      '--observe: "crust" is not an output column of r7.arrow; did you mean crust_km?',
      '--observe: tp_c is an input of the sweep, not an output; the fit infers inputs from observed outputs (outputs: crust_km, f_max, onset_depth_km, h2o_melt_wt_pct)',
      '--observe: h2o_melt_wt_pct holds no value in r7.arrow (every row is null); choose an output with values',
      '--discrepancy: f_max is not observed; a discrepancy applies to an observed output (observed: none)',
      '--predict: "onset_dept_km" is not an output column of r7.arrow; did you mean onset_depth_km?',
    ]);
  });

  it('combines discrepancies with their observations; an output observed twice is refused', () => {
    const ok = checkObservations([{ output: 'crust_km', value: 7.1, sd: 0.8 }], [{ output: 'crust_km', sd: 0.5 }], ['f_max'], cols);
    expect(ok).toEqual({ observations: [{ output: 'crust_km', value: 7.1, sd: 0.8, discrepancySd: 0.5 }], predict: ['f_max'] });
    expect(problems(() => checkObservations([{ output: 'crust_km', value: 7, sd: 1 }, { output: 'crust_km', value: 8, sd: 1 }], [], [], cols))[0]).toMatch(/crust_km is observed twice/);
    expect(problems(() => checkObservations([], [], [], cols))[0]).toMatch(/^--observe: no observation given/);
  });

  it('reads a file mapping with { value, sd, discrepancy } or "VALUE+-SD", with paths in messages', () => {
    expect(observationsFromData({ crust_km: { value: 6.3, sd: 0.6 }, f_max: '0.18+-0.02', onset_depth_km: { value: 70, sd: 10, discrepancy: 5 } }, 'S-4.yaml')).toEqual([
      { output: 'crust_km', value: 6.3, sd: 0.6 },
      { output: 'f_max', value: 0.18, sd: 0.02 },
      { output: 'onset_depth_km', value: 70, sd: 10, discrepancySd: 5 },
    ]);
    expect(problems(() => observationsFromData({ crust_km: { value: 6.3, sdd: 0.6 }, f_max: { value: 'high', sd: -1 } }, 'S-4.yaml'))).toEqual([
      'S-4.yaml: crust_km.sdd: unknown key; did you mean sd?',
      'S-4.yaml: crust_km.sd: missing; an observation needs value and sd',
      'S-4.yaml: f_max.value: "high" is not a number',
      'S-4.yaml: f_max.sd: -1 is not allowed; the standard deviation must be above 0',
    ]);
    expect(problems(() => observationsFromData([1, 2], 'S-4.yaml'))[0]).toMatch(/expected a mapping of outputs to observations/);
  });
});
