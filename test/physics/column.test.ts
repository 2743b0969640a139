import { describe, expect, it } from 'vitest';
import { defaultModel, meltColumn, resolveThermalModel, THERMAL_MODELS } from '../../src/physics/column.js';
import {
  checkFinite,
  crustKmFromMeltIntegral,
  failedResult,
  meltFluxKgM2Yr,
  meltingResult,
  noMeltResult,
  onsetBeyondRangeResult,
} from '../../src/physics/column-result.js';
import { RESULT_NUMERIC_NAMES } from '../../src/physics/fields.js';
import { isentropicColumn } from '../../src/physics/isentropic-column.js';
import { DEFAULT_PARAMS as P, type MeltParams } from '../../src/physics/params.js';
import type { Scenario } from '../../src/physics/types.js';

const dry1350: Scenario = { tp_c: 1350, water_ppm: 0, lid_km: 0, upwelling_mm_yr: Number.NaN };

describe('meltColumn', () => {
  it('picks the thermal model from the lookup table; auto = conductive only with an upwelling rate', () => {
    expect(Object.keys(THERMAL_MODELS).sort()).toEqual(['conductive', 'isentropic']);
    const auto = defaultModel();
    expect(resolveThermalModel(dry1350, auto)).toBe('isentropic');
    expect(resolveThermalModel({ ...dry1350, upwelling_mm_yr: 20 }, auto)).toBe('conductive');
    expect(resolveThermalModel({ ...dry1350, upwelling_mm_yr: 20 }, defaultModel({ thermal: 'isentropic' }))).toBe('isentropic');
    expect(meltColumn(dry1350, auto)).toEqual(isentropicColumn(dry1350, auto));
  });

  it('defaultModel: auto, batch, published parameters, each column its default tolerance, no profile; overrides win', () => {
    const m = defaultModel();
    expect(m).toEqual({ thermal: 'auto', water: 'batch', params: P, withProfile: false });
    // no tolerance given: the isentropic column runs at 1e-4, the conductive one at 1e-3
    expect(isentropicColumn(dry1350, m)).toEqual(isentropicColumn(dry1350, { ...m, tolerance: 1e-4 }));
    const slow = { ...dry1350, upwelling_mm_yr: 5 };
    expect(meltColumn(slow, m)).toEqual(meltColumn(slow, { ...m, tolerance: 1e-3 }));
    expect(meltColumn(slow, m)).not.toEqual(meltColumn(slow, { ...m, tolerance: 1e-4 }));
    expect(defaultModel({ water: 'fractional', stepGpa: 0.01 })).toMatchObject({ water: 'fractional', stepGpa: 0.01, thermal: 'auto' });
  });

  it('turns an exception inside the physics into a failed row with a reason', () => {
    const throwing = { ...P } as Record<string, number>;
    Object.defineProperty(throwing, 'A1', {
      get() {
        throw new Error('boom');
      },
    });
    const r = meltColumn(dry1350, defaultModel({ params: throwing as unknown as MeltParams }));
    expect(r.status).toBe('failed');
    expect(r.reason).toBe('isentropic column: boom');
    for (const k of RESULT_NUMERIC_NAMES) expect(r[k]).toBeNull();
    // the same for the conductive model, with deep_onset cap marks added to the failed row
    const c = meltColumn({ ...dry1350, upwelling_mm_yr: 10 }, defaultModel({ params: throwing as unknown as MeltParams, deepOnset: 'cap' }));
    expect(c.status).toBe('failed');
    expect(c.reason).toBe('conductive column: boom');
    expect(c.onset_capped).toBeNull();
    // meltColumn is the one guard: the thermal models themselves let the exception through
    expect(() => isentropicColumn(dry1350, defaultModel({ params: throwing as unknown as MeltParams }))).toThrow('boom');
  });

  it('turns non-finite parameters into a failed row, never a NaN in an ok row', () => {
    const r = meltColumn(dry1350, defaultModel({ params: { ...P, c_P: Number.NaN } }));
    expect(r.status).toBe('failed');
    expect(r.reason).toBeTruthy();
  });

  it('an unknown thermal model name is a failed row', () => {
    const r = meltColumn(dry1350, { ...defaultModel(), thermal: 'magic' as unknown as 'isentropic' });
    expect(r.status).toBe('failed');
    expect(r.reason).toContain('magic');
  });

  it('returns the profile only when asked', () => {
    expect(meltColumn(dry1350, defaultModel()).profile).toBeUndefined();
    const prof = meltColumn(dry1350, defaultModel({ withProfile: true })).profile;
    expect(prof).toBeDefined();
    expect(Object.keys(prof!).sort()).toEqual(['depth_km', 'f', 'h2o_melt_wt_pct', 'p_gpa', 't_c']);
  });
});

describe('shared result helpers', () => {
  it('crust: 1 GPa of F = 1 is 1e9 Pa / (2900 kg/m3 * 9.81 m/s2) = 35.15 km', () => {
    expect(crustKmFromMeltIntegral(1, P)).toBeCloseTo(1e9 / (2900 * 9.81) / 1000, 12);
    expect(crustKmFromMeltIntegral(1, P)).toBeCloseTo(35.15, 2);
  });

  it('melt flux: 20 mm/yr and F_max 0.2 give 3300 * 0.02 * 0.2 = 13.2 kg/m2/yr; null without a rate', () => {
    expect(meltFluxKgM2Yr(20, 0.2, P)).toBeCloseTo(13.2, 12);
    expect(meltFluxKgM2Yr(Number.NaN, 0.2, P)).toBeNull();
  });

  it('row factories: failed / beyond have all numbers null; no_melt has zero amounts', () => {
    for (const r of [failedResult('x'), onsetBeyondRangeResult('y')]) {
      expect(r.reason).toBeTruthy();
      for (const k of RESULT_NUMERIC_NAMES) expect(r[k]).toBeNull();
    }
    const nm = noMeltResult();
    expect(nm).toMatchObject({ status: 'no_melt', reason: null, crust_km: 0, f_max: 0, melt_flux_kg_m2_yr: null, onset_p_gpa: null });
    expect(noMeltResult(12, 55).melt_flux_kg_m2_yr).toBe(0);
    expect(noMeltResult(12, 55).surface_heat_flow_mw_m2).toBe(55);
  });

  it('meltingResult derives every aggregate from one summary and rejects non-finite numbers', () => {
    const summary = { onsetPGpa: 2, topPGpa: 0.5, fMax: 0.2, fTop: 0.2, tTopC: 1250, meltIntegralGpa: 0.15, waterIntegralWtPctGpa: 0.003 };
    const r = meltingResult(summary, { ...dry1350, upwelling_mm_yr: 10 }, P);
    expect(r.status).toBe('ok');
    expect(r.f_mean).toBeCloseTo(0.1, 12);
    expect(r.h2o_melt_wt_pct).toBeCloseTo(0.02, 12);
    expect(r.productivity_pct_per_gpa).toBeCloseTo((100 * 0.2) / 1.5, 12);
    expect(r.melt_flux_kg_m2_yr).toBeCloseTo(3300 * 0.01 * 0.2, 12);
    expect(r.surface_heat_flow_mw_m2).toBeNull();
    const bad = meltingResult({ ...summary, tTopC: Number.NaN }, dry1350, P);
    expect(bad.status).toBe('failed');
    expect(bad.reason).toContain('t_top_c');
    expect(meltingResult({ ...summary, topPGpa: 2 }, dry1350, P).status).toBe('failed');
    expect(checkFinite({ ...r, crust_km: Infinity }).status).toBe('failed');
  });
});
