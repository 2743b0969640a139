import { describe, expect, it } from 'vitest';
import { adiabatTempK } from '../../src/physics/adiabat.js';
import { cappedStart } from '../../src/physics/capped-onset.js';
import { meltColumn, defaultModel } from '../../src/physics/column.js';
import { meltFraction, tempForMeltFractionC, wetSolidusC } from '../../src/physics/melting.js';
import { findMeltOnset } from '../../src/physics/onset.js';
import { DEFAULT_PARAMS } from '../../src/physics/params.js';
import { MODEL_MAX_P_GPA, type Scenario } from '../../src/physics/types.js';
import { KELVIN_OFFSET, wtPctFromPpm } from '../../src/physics/units.js';

const p = DEFAULT_PARAMS;
const scenario = (tpC: number, waterPpm: number, upwelling = Number.NaN): Scenario => ({ tp_c: tpC, water_ppm: waterPpm, lid_km: 0, upwelling_mm_yr: upwelling });

/** Water (ppm) at which the onset of a tp column lies exactly at 8 GPa (bisection on the onset kind). */
function waterAtCap(tpC: number): number {
  let lo = 100;
  let hi = 5000;
  expect(findMeltOnset(tpC, wtPctFromPpm(lo), 0, p).kind).toBe('onset');
  expect(findMeltOnset(tpC, wtPctFromPpm(hi), 0, p).kind).toBe('beyond');
  for (let i = 0; i < 60; i++) {
    const mid = 0.5 * (lo + hi);
    if (findMeltOnset(tpC, wtPctFromPpm(mid), 0, p).kind === 'beyond') hi = mid;
    else lo = mid;
  }
  return 0.5 * (lo + hi);
}

describe('capped start state (melting at constant entropy and pressure at the cap)', () => {
  it('satisfies c_P ln(T/T_ad) + dS F = 0 with T on the melting curve (the definition, analytic)', () => {
    for (const [tpC, waterPpm] of [[1400, 3000], [1450, 1500], [1350, 5000]] as const) {
      const x0 = wtPctFromPpm(waterPpm);
      expect(findMeltOnset(tpC, x0, 0, p).kind).toBe('beyond');
      const s = cappedStart(tpC, x0, MODEL_MAX_P_GPA, 'batch', p);
      const tAdK = adiabatTempK(tpC, MODEL_MAX_P_GPA, p);
      expect(s.f).toBeGreaterThan(0);
      expect(p.c_P * Math.log(s.tK / tAdK) + p.dS * s.f).toBeCloseTo(0, 6); // J/kg/K
      // T is the melting-curve temperature at (F, X_melt), and F is the equilibrium melt fraction at T
      expect(s.tK - KELVIN_OFFSET).toBeCloseTo(tempForMeltFractionC(s.f, MODEL_MAX_P_GPA, s.xMeltWtPct, p), 4);
      expect(meltFraction(s.tK - KELVIN_OFFSET, MODEL_MAX_P_GPA, x0, p)).toBeCloseTo(s.f, 6);
      // latent heat is paid from sensible heat: colder than the adiabat, less melt than F(T_ad)
      expect(s.tK).toBeLessThan(tAdK);
      expect(s.f).toBeLessThan(meltFraction(tAdK - KELVIN_OFFSET, MODEL_MAX_P_GPA, x0, p));
      expect(s.tK - KELVIN_OFFSET).toBeGreaterThan(wetSolidusC(MODEL_MAX_P_GPA, x0, p));
      // batch water balance: melt + residue hold the source water
      expect(s.f * s.xMeltWtPct + (1 - s.f) * s.xResidueWtPct).toBeCloseTo(x0, 12);
      expect(s.waterExtractedWtPct).toBeCloseTo(s.f * s.xMeltWtPct, 12);
    }
  });

  it('fractional water: the residue leaves the cap depleted, extracted + residue = source', () => {
    const x0 = wtPctFromPpm(3000);
    const s = cappedStart(1400, x0, MODEL_MAX_P_GPA, 'fractional', p);
    expect(s.xResidueWtPct).toBeLessThan(x0);
    expect(s.waterExtractedWtPct + (1 - s.f) * s.xResidueWtPct).toBeCloseTo(x0, 9);
  });

  it('refuses a source that is not above its solidus at the cap', () => {
    expect(() => cappedStart(1350, 0, MODEL_MAX_P_GPA, 'batch', p)).toThrow('capped onset: the adiabat is not above the solidus at 8 GPa');
  });
});

describe('columns with deep_onset cap', () => {
  const cap = defaultModel({ thermal: 'isentropic', deepOnset: 'cap' });

  it('default (drop): onset_beyond_range and no capped fields; cap: an ok row marked with the melt at the cap', () => {
    const dropped = meltColumn(scenario(1400, 3000), defaultModel({ thermal: 'isentropic' }));
    expect(dropped.status).toBe('onset_beyond_range');
    expect('onset_capped' in dropped).toBe(false);
    const r = meltColumn(scenario(1400, 3000), cap);
    expect(r.status).toBe('ok');
    expect(r.onset_capped).toBe(1);
    expect(r.onset_p_gpa).toBe(MODEL_MAX_P_GPA);
    expect(r.f_at_cap).toBeCloseTo(cappedStart(1400, wtPctFromPpm(3000), MODEL_MAX_P_GPA, 'batch', p).f, 12);
    // productivity over the computed interval counts only the melt made above the cap
    expect(r.productivity_pct_per_gpa).toBeCloseTo((100 * (r.f_max! - r.f_at_cap!)) / MODEL_MAX_P_GPA, 9);
    const normal = meltColumn(scenario(1350, 100), cap);
    expect([normal.status, normal.onset_capped, normal.f_at_cap]).toEqual(['ok', 0, null]);
    const cold = meltColumn({ ...scenario(1100, 0), lid_km: 80 }, cap);
    expect([cold.status, cold.onset_capped, cold.f_at_cap]).toEqual(['no_melt', 0, null]);
  });

  it('is continuous where the onset crosses the cap (crust, f_max; the melt at the cap tends to 0)', () => {
    const w = waterAtCap(1400);
    const below = meltColumn(scenario(1400, w * (1 - 1e-6)), cap);
    const above = meltColumn(scenario(1400, w * (1 + 1e-6)), cap);
    expect([below.onset_capped, above.onset_capped]).toEqual([0, 1]);
    expect(below.onset_p_gpa!).toBeCloseTo(MODEL_MAX_P_GPA, 3);
    expect(above.f_at_cap!).toBeLessThan(1e-4);
    expect(Math.abs(above.crust_km! - below.crust_km!) / below.crust_km!).toBeLessThan(1e-3);
    expect(above.f_max!).toBeCloseTo(below.f_max!, 4);
  });

  it('crust grows with water past the cap (more melt present at the cap)', () => {
    const crust = [2000, 3000, 5000].map((w) => meltColumn(scenario(1400, w), cap).crust_km!);
    expect(crust[1]).toBeGreaterThan(crust[0]);
    expect(crust[2]).toBeGreaterThan(crust[1]);
  });

  it('fractional water computes capped columns too', () => {
    const r = meltColumn(scenario(1400, 3000), defaultModel({ thermal: 'isentropic', water: 'fractional', deepOnset: 'cap' }));
    expect(r.status).toBe('ok');
    expect(r.onset_capped).toBe(1);
  });

  it('conductive: a fast column gives back the isentropic capped column; drop keeps onset_beyond_range', () => {
    const fast = meltColumn(scenario(1400, 3000, 300), defaultModel({ thermal: 'conductive', deepOnset: 'cap' }));
    const iso = meltColumn(scenario(1400, 3000), cap);
    expect(fast.status).toBe('ok');
    expect(fast.onset_capped).toBe(1);
    expect(fast.onset_p_gpa).toBeCloseTo(MODEL_MAX_P_GPA, 9);
    // the conductive node balance at the cap and the isentropic start solve the same energy balance
    expect(Math.abs(fast.f_at_cap! - iso.f_at_cap!) / iso.f_at_cap!).toBeLessThan(0.005);
    expect(Math.abs(fast.crust_km! - iso.crust_km!) / iso.crust_km!).toBeLessThan(0.005);
    const dropped = meltColumn(scenario(1400, 3000, 300), defaultModel({ thermal: 'conductive' }));
    expect(dropped.status).toBe('onset_beyond_range');
    expect(dropped.reason).toMatch(/^melting starts deeper than 8 GPa, the deepest pressure the model covers: at 8 GPa the adiabat \(1570\.\d degC\) is already above the solidus/);
  });
});
