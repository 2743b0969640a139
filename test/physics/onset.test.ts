import { describe, expect, it } from 'vitest';
import { adiabatTempC } from '../../src/physics/adiabat.js';
import { drySolidusC, meltFraction, wetSolidusC } from '../../src/physics/melting.js';
import { findMeltOnset, type OnsetResult } from '../../src/physics/onset.js';
import { DEFAULT_PARAMS as P, resolveParams } from '../../src/physics/params.js';
import { MODEL_MAX_P_GPA } from '../../src/physics/types.js';

function onsetP(r: OnsetResult): number {
  if (r.kind !== 'onset') throw new Error(`expected an onset, got ${r.kind}`);
  return r.pGpa;
}

describe('onset of melting', () => {
  it('is the F = 0 boundary on the adiabat to within 1e-6 GPa', () => {
    for (const tp of [1200, 1300, 1400, 1450]) {
      for (const x of [0, 0.01, 0.05]) {
        const p = onsetP(findMeltOnset(tp, x, 0, P));
        // deeper by 1e-6 GPa: no melt; shallower by 1e-6 GPa: melt
        expect(meltFraction(adiabatTempC(tp, p + 1e-6, P), p + 1e-6, x, P)).toBe(0);
        expect(meltFraction(adiabatTempC(tp, p - 1e-6, P), p - 1e-6, x, P)).toBeGreaterThan(0);
      }
    }
  });

  it('finds the same boundary whether or not the monotone shortcut applies (steep adiabat, saturated first melt)', () => {
    // alpha_s = 1e-4 1/K makes the adiabat steeper than the solidus at depth (no shortcut);
    // 0.1-0.3 wt% water, or a low saturation (chi1 = 1, chi2 = 0.5), saturates the first melt over
    // part of the column (the scanned region)
    const kinds: string[] = [];
    for (const q of [P, resolveParams({ alpha_s: 1e-4 }), resolveParams({ chi1: 1, chi2: 0.5 })]) {
      for (const [tp, x, pTop] of [[1100, 0.1, 0], [1150, 0.3, 0], [1300, 0.02, 0.5], [1200, 0, 0.2]] as const) {
        const r = findMeltOnset(tp, x, pTop, q);
        kinds.push(r.kind);
        if (r.kind !== 'onset') continue;
        const p = r.pGpa;
        expect(meltFraction(adiabatTempC(tp, p + 1e-6, q), p + 1e-6, x, q)).toBe(0);
        expect(meltFraction(adiabatTempC(tp, p - 1e-6, q), p - 1e-6, x, q)).toBeGreaterThan(0);
        for (let z = p + 0.001; z <= MODEL_MAX_P_GPA; z += 0.005) expect(adiabatTempC(tp, z, q)).toBeLessThan(wetSolidusC(z, x, q));
      }
    }
    // the loop skips cases without an onset (here 1150 degC with 0.3 wt% melts below 8 GPa with the
    // published and the steep-adiabat sets): it must still have checked at least 10 of the 12 cases
    expect(kinds.filter((k) => k === 'onset').length).toBeGreaterThanOrEqual(10);
    expect(kinds.filter((k) => k === 'none')).toEqual([]);
  });

  it('is the deepest crossing: the adiabat is below the solidus everywhere deeper', () => {
    for (const tp of [1250, 1450]) {
      const p = onsetP(findMeltOnset(tp, 0.03, 0, P));
      for (let q = p + 0.001; q <= MODEL_MAX_P_GPA; q += 0.01) expect(adiabatTempC(tp, q, P)).toBeLessThan(wetSolidusC(q, 0.03, P));
    }
  });

  it('deepens with water (the solidus is lowered)', () => {
    let prev = onsetP(findMeltOnset(1300, 0, 0, P));
    for (const ppm of [25, 50, 100, 200, 400, 800]) {
      const p = onsetP(findMeltOnset(1300, ppm * 1e-4, 0, P));
      expect(p).toBeGreaterThan(prev);
      prev = p;
    }
  });

  it('reports none when the adiabat stays below the solidus down to the lid base', () => {
    // Tp 1150 degC crosses the dry solidus near 0.57 GPa, above a 1 GPa lid base
    const pLid = 1;
    for (let q = pLid; q <= MODEL_MAX_P_GPA; q += 0.01) expect(adiabatTempC(1150, q, P)).toBeLessThan(drySolidusC(q, P));
    expect(findMeltOnset(1150, 0, pLid, P).kind).toBe('none');
  });

  it('reports beyond when the adiabat is above the solidus at the deepest model pressure', () => {
    const r = findMeltOnset(1800, 0, 0, P);
    expect(r.kind).toBe('beyond');
    if (r.kind === 'beyond') {
      expect(r.pMaxGpa).toBe(MODEL_MAX_P_GPA);
      expect(r.tAdiabatC).toBeCloseTo(adiabatTempC(1800, MODEL_MAX_P_GPA, P), 9);
      expect(r.tSolidusC).toBeCloseTo(drySolidusC(MODEL_MAX_P_GPA, P), 9);
    }
  });
});
