import { describe, expect, it } from 'vitest';
import { adiabatGradientKPerKm, adiabatTempC, adiabatTempK } from '../../src/physics/adiabat.js';
import { DEFAULT_PARAMS as P } from '../../src/physics/params.js';
import { depthKmFromPGpa, pGpaFromDepthKm } from '../../src/physics/units.js';

describe('solid adiabat', () => {
  it('passes through Tp at P = 0 (definition of the potential temperature)', () => {
    for (const tp of [1100, 1350, 1800]) {
      expect(adiabatTempC(tp, 0, P)).toBeCloseTo(tp, 10);
      expect(adiabatTempK(tp, 0, P)).toBeCloseTo(tp + 273.15, 10);
    }
  });

  it('solves dT/dP = alpha_s T / (rho_s c_P) (central differences, P in Pa)', () => {
    for (const tp of [1250, 1500]) {
      for (const p of [0.5, 2, 5, 8]) {
        const h = 1e-4;
        const dTdPa = (adiabatTempK(tp, p + h, P) - adiabatTempK(tp, p - h, P)) / (2 * h * 1e9);
        const rhs = (P.alpha_s * adiabatTempK(tp, p, P)) / (P.rho_s * P.c_P);
        expect(dTdPa / rhs).toBeCloseTo(1, 8);
      }
    }
  });

  it('the depth gradient is the pressure gradient converted with z = P / (rho_s g)', () => {
    const tp = 1350;
    for (const zKm of [0, 50, 150]) {
      const p0 = pGpaFromDepthKm(zKm - 0.5, P.rho_s, P.g);
      const p1 = pGpaFromDepthKm(zKm + 0.5, P.rho_s, P.g);
      const perKm = adiabatTempK(tp, p1, P) - adiabatTempK(tp, p0, P);
      expect(adiabatGradientKPerKm(tp, pGpaFromDepthKm(zKm, P.rho_s, P.g), P)).toBeCloseTo(perKm, 6);
      expect(depthKmFromPGpa(pGpaFromDepthKm(zKm, P.rho_s, P.g), P.rho_s, P.g)).toBeCloseTo(zKm, 10);
    }
  });

  it('is a few tenths of a kelvin per km in the upper mantle', () => {
    // Common practice: the upper-mantle adiabat is ~0.3-0.6 K/km. With this parameter set
    // (alpha_s = 4e-5 1/K, c_P = 1000 J/kg/K) the gradient alpha g T / c_P is 0.6-0.7 K/km at
    // Tp 1300-1400 degC, the top of that range, so the check is "a few tenths": 0.3 to < 1 K/km.
    for (const tp of [1300, 1350, 1400]) {
      for (const p of [0, 1, 3]) {
        const g = adiabatGradientKPerKm(tp, p, P);
        expect(g).toBeGreaterThanOrEqual(0.3);
        expect(g).toBeLessThan(1);
        // the README's figure for this parameter set, from the analytic gradient alpha_s g T / c_P
        expect(g).toBeGreaterThanOrEqual(0.6);
        expect(g).toBeLessThanOrEqual(0.7);
      }
    }
  });
});
