import { describe, expect, it } from 'vitest';
import { conductiveColumn, conductiveProfile, type ConductiveState } from '../../src/physics/conductive-column.js';
import { boundaryLayerDecayPerM, farFieldGrowthPerM } from '../../src/physics/conductive-far-field.js';
import { DEFAULT_PARAMS } from '../../src/physics/params.js';
import type { ModelOptions, Scenario } from '../../src/physics/types.js';

// The bottom boundary of the conductive column: the sub-solidus steady solution T = Tp[K] exp(m+ z)
// imposed at z_b >= onset + 10 kappa/w (project physics reference, "Upwelling rate and conductive loss").
const MODEL: ModelOptions = { thermal: 'conductive', water: 'batch', params: DEFAULT_PARAMS };
const K = 273.15;
const p = DEFAULT_PARAMS;
const kappa = p.k / (p.rho_s * p.c_P);

function scenario(tp_c: number, water_ppm: number, lid_km: number, upwelling_mm_yr: number): Scenario {
  return { tp_c, water_ppm, lid_km, upwelling_mm_yr };
}

function solved(s: Scenario, minBottomM?: number): ConductiveState {
  const out = conductiveProfile(s, MODEL, minBottomM === undefined ? {} : { minBottomM });
  if (out.kind !== 'solved') throw new Error(`not solved: ${out.kind} ${out.reason}`);
  return out.state;
}

describe('analytic limit: no melting, with thermal expansion', () => {
  // Solid only: kappa T'' + w T' = w a T (a = alpha_s g / c_P), solved exactly by
  // T = Tp exp(m+ z) + C exp(m- (z - z_lid)) with C from the top condition: T(0) = T_s with no lid,
  // else continuity of the conductive flux, T'(z_lid) = (T(z_lid) - T_s) / z_lid (analytic solution
  // of the linear ODE; the far field is the physics reference's bottom condition).
  // Tp 1000 degC stays below the solidus everywhere (A1 = 1085.7 degC and the solidus is steeper).
  const tpC = 1000;
  for (const w of [0.3, 1, 3, 30]) {
    for (const lidKm of [0, 20]) {
      it(`w = ${w} mm/yr, lid ${lidKm} km: within 0.05 K of the exact profile`, () => {
        const s = solved(scenario(tpC, 0, lidKm, w));
        const mp = farFieldGrowthPerM(s.wMPerS, kappa, p);
        const mm = boundaryLayerDecayPerM(s.wMPerS, kappa, p);
        const tp = tpC + K;
        const ts = p.T_surface + K;
        const zl = lidKm * 1000;
        const c = zl > 0 ? (tp * Math.exp(mp * zl) * (1 / zl - mp) - ts / zl) / (mm - 1 / zl) : ts - tp;
        let maxErr = 0;
        for (let i = 0; i < s.zM.length; i++) {
          const exact = tp * Math.exp(mp * s.zM[i]) + c * Math.exp(mm * (s.zM[i] - zl));
          maxErr = Math.max(maxErr, Math.abs(s.tC[i] + K - exact));
          expect(s.f[i]).toBe(0);
        }
        expect(maxErr).toBeLessThan(0.05);
      });
    }
  }

  it('m+ tends to a = alpha_s g / c_P (the solid adiabat) as w grows, and stays below it', () => {
    const a = (p.alpha_s * p.g) / p.c_P;
    const slow = farFieldGrowthPerM(1e-12, kappa, p);
    const fast = farFieldGrowthPerM(1, kappa, p);
    expect(slow).toBeLessThan(a);
    expect(Math.abs(fast - a) / a).toBeLessThan(1e-6);
    // roots of kappa m^2 + w m - w a = 0
    for (const w of [1e-12, 1e-10, 1e-8]) {
      for (const m of [farFieldGrowthPerM(w, kappa, p), boundaryLayerDecayPerM(w, kappa, p)]) {
        expect(Math.abs(kappa * m * m + w * m - w * a)).toBeLessThan(1e-9 * w * a);
      }
    }
  });
});

describe('the column does not depend on the depth of its bottom', () => {
  // The physics reference: holding the solid adiabat at z_b drifts by ~0.26 K of effective Tp per 100 km
  // at 3 mm/yr and ~8 K at 0.1 mm/yr; the steady far field does not drift.
  for (const [tp, water, lid, w] of [
    [1350, 0, 0, 3],
    [1350, 0, 10, 1],
    [1400, 300, 20, 0.3],
    [1450, 100, 30, 10],
    [1300, 0, 0, 0.5],
  ] as const) {
    it(`Tp ${tp}, ${water} ppm, lid ${lid} km, ${w} mm/yr: bottom 300 km deeper changes nothing`, () => {
      const a = solved(scenario(tp, water, lid, w));
      const deeper = a.zM[a.zM.length - 1] + 300e3;
      const b = solved(scenario(tp, water, lid, w), deeper);
      expect(b.zM[b.zM.length - 1]).toBeCloseTo(deeper, 6);
      expect(Math.abs(a.tC[0] - b.tC[0])).toBeLessThan(0.02);
      expect(Math.abs(a.surfaceHeatFlowMwM2 - b.surfaceHeatFlowMwM2) / a.surfaceHeatFlowMwM2).toBeLessThan(1e-4);
      const ra = conductiveColumn(scenario(tp, water, lid, w), MODEL);
      const rb = conductiveColumn(scenario(tp, water, lid, w), MODEL, { minBottomM: deeper });
      expect(ra.status).toBe(rb.status);
      expect(Math.abs((ra.crust_km ?? NaN) - (rb.crust_km ?? NaN))).toBeLessThan(1e-3);
      expect(Math.abs((ra.f_max ?? NaN) - (rb.f_max ?? NaN))).toBeLessThan(1e-5);
    });
  }
});
