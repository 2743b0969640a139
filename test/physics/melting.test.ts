import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import {
  batchMeltWaterWtPct,
  cpxOutC,
  createMeltingCurves,
  drySolidusC,
  dryMeltFraction,
  dryTempForMeltFraction,
  dryTempFromCurves,
  dryTempPressureSlope,
  dryTempSlopeFromCurves,
  fCpxOut,
  liquidusC,
  meltFraction,
  powNonNeg,
  setMeltingCurves,
  tempForMeltFractionC,
  waterSaturationLowerBound,
  waterSaturationWtPct,
  wetSolidusC,
} from '../../src/physics/melting.js';
import { DEFAULT_PARAMS as P, resolveParams } from '../../src/physics/params.js';

const PRESSURES = [0, 0.5, 1, 2, 3, 4, 6, 8];

describe('published parameters', () => {
  it('defaults are Katz, Spiegelman & Langmuir (2003) Table 2 (from memory)', () => {
    // values from memory of Katz et al. 2003, G-cubed 4(9), 1073, Table 2
    expect([P.A1, P.A2, P.A3]).toEqual([1085.7, 132.9, -5.1]);
    expect([P.B1, P.B2, P.B3]).toEqual([1475.0, 80.0, -3.2]);
    expect([P.C1, P.C2, P.C3]).toEqual([1780.0, 45.0, -2.0]);
    expect([P.r1, P.r2, P.beta1, P.beta2]).toEqual([0.5, 0.08, 1.5, 1.5]);
    expect([P.K, P.gamma, P.D_H2O]).toEqual([43, 0.75, 0.01]);
    expect([P.chi1, P.chi2, P.lambda, P.M_cpx]).toEqual([12.0, 1.0, 0.6, 0.17]);
    expect([P.c_P, P.alpha_s, P.alpha_f, P.rho_s, P.rho_f, P.dS]).toEqual([1000, 40e-6, 68e-6, 3300, 2900, 300]);
  });

  it('the anhydrous solidus runs parallel to Hirschmann (2000), with a lower intercept', () => {
    // Hirschmann 2000, G-cubed 1, abstract: T = 1120.661 + 132.899 P - 5.104 P^2 (degC, GPa)
    const hirschmann = (pGpa: number): number => 1120.661 + 132.899 * pGpa - 5.104 * pGpa * pGpa;
    expect(Math.abs(P.A2 - 132.899)).toBeLessThan(0.05); // same linear term within rounding
    expect(Math.abs(P.A3 - -5.104)).toBeLessThan(0.05); // same quadratic term within rounding
    expect(P.A1).toBeLessThan(1120.661);
    const offset0 = drySolidusC(0, P) - hirschmann(0);
    expect(offset0).toBeLessThan(0);
    for (const p of PRESSURES) expect(Math.abs(drySolidusC(p, P) - hirschmann(p) - offset0)).toBeLessThan(0.3);
  });
});

describe('anhydrous melt fraction', () => {
  it('is 0 at and below the solidus and 1 at and above the liquidus', () => {
    for (const p of PRESSURES) {
      expect(dryMeltFraction(drySolidusC(p, P), p, P)).toBe(0);
      expect(dryMeltFraction(drySolidusC(p, P) - 50, p, P)).toBe(0);
      expect(dryMeltFraction(liquidusC(p, P), p, P)).toBe(1);
      expect(dryMeltFraction(liquidusC(p, P) + 50, p, P)).toBe(1);
      expect(meltFraction(drySolidusC(p, P) - 1e-9, p, 0, P)).toBe(0);
    }
  });

  it('is continuous at cpx exhaustion, where it equals F_cpx_out', () => {
    for (const p of PRESSURES) {
      const t = cpxOutC(p, P);
      const below = dryMeltFraction(t - 1e-9, p, P);
      const above = dryMeltFraction(t + 1e-9, p, P);
      expect(Math.abs(below - fCpxOut(p, P))).toBeLessThan(1e-9);
      expect(Math.abs(above - fCpxOut(p, P))).toBeLessThan(1e-9);
    }
  });

  it('caps F_cpx_out at 1 when the reaction cannot exhaust cpx (parameter overrides)', () => {
    const q = resolveParams({ M_cpx: 0.5, r1: 0.01, r2: 0 });
    expect(fCpxOut(1, q)).toBe(1);
    expect(dryMeltFraction(liquidusC(1, q) - 1, 1, q)).toBeLessThanOrEqual(1);
    expect(dryTempForMeltFraction(1, 1, q)).toBeCloseTo(q.B1 + q.B2 + q.B3, 9); // F = 1 at the lherzolite liquidus
  });

  it('inverts exactly: dryTempForMeltFraction(dryMeltFraction(T)) = T', () => {
    for (const p of PRESSURES) {
      const lo = drySolidusC(p, P);
      const hi = liquidusC(p, P);
      for (let i = 1; i < 40; i++) {
        const t = lo + ((hi - lo) * i) / 40;
        expect(dryTempForMeltFraction(dryMeltFraction(t, p, P), p, P)).toBeCloseTo(t, 8);
      }
    }
  });
});

describe('hydrous melt fraction (batch water, saturation cap)', () => {
  const arbP = fc.double({ min: 0, max: 8, noNaN: true });
  const arbT = fc.double({ min: 900, max: 2100, noNaN: true });
  const arbX = fc.double({ min: 0, max: 0.5, noNaN: true });

  it('is monotone in T', () => {
    fc.assert(
      fc.property(arbP, arbT, arbT, arbX, (p, t1, t2, x) => {
        const [a, b] = t1 <= t2 ? [t1, t2] : [t2, t1];
        return meltFraction(a, p, x, P) <= meltFraction(b, p, x, P) + 1e-12;
      }),
      { numRuns: 500 },
    );
  });

  it('wet F >= dry F, and F lies in [0, 1]', () => {
    fc.assert(
      fc.property(arbP, arbT, arbX, (p, t, x) => {
        const wet = meltFraction(t, p, x, P);
        return wet >= dryMeltFraction(t, p, P) - 1e-12 && wet >= 0 && wet <= 1;
      }),
      { numRuns: 500 },
    );
  });

  it('solves its own defining equation F = F_dry(T + K X_melt(F)^gamma)', () => {
    fc.assert(
      fc.property(arbP, arbT, arbX, (p, t, x) => {
        const f = meltFraction(t, p, x, P);
        if (f <= 0 || f >= 1) return true;
        const xm = batchMeltWaterWtPct(f, p, x, P);
        return Math.abs(dryMeltFraction(t + P.K * Math.pow(xm, P.gamma), p, P) - f) < 1e-9;
      }),
      { numRuns: 500 },
    );
  });

  it('tempForMeltFractionC round-trips meltFraction', () => {
    fc.assert(
      fc.property(arbP, arbT, arbX, (p, t, x) => {
        const f = meltFraction(t, p, x, P);
        if (f <= 1e-6 || f >= 1) return true;
        return Math.abs(tempForMeltFractionC(f, p, batchMeltWaterWtPct(f, p, x, P), P) - t) < 1e-6;
      }),
      { numRuns: 500 },
    );
  });

  it('starts melting exactly at the wet solidus', () => {
    for (const p of [0.5, 1, 2, 4]) {
      for (const x of [0.005, 0.02, 0.1]) {
        const ts = wetSolidusC(p, x, P);
        expect(ts).toBeLessThan(drySolidusC(p, P));
        expect(meltFraction(ts - 1e-6, p, x, P)).toBe(0);
        expect(meltFraction(ts + 1e-3, p, x, P)).toBeGreaterThan(0);
      }
    }
  });

  it('caps melt water at saturation X_sat = chi1 P^lambda + chi2 P', () => {
    // 1 GPa: 12 * 1^0.6 + 1 = 13 wt% (arithmetic on the published parameters)
    expect(waterSaturationWtPct(1, P)).toBeCloseTo(13, 12);
    expect(batchMeltWaterWtPct(0, 1, 1, P)).toBeCloseTo(13, 12); // 1 wt% / D = 100 wt% > 13
    expect(batchMeltWaterWtPct(0.5, 1, 0.05, P)).toBeCloseTo(0.05 / (0.01 + 0.5 * 0.99), 12);
  });
});

describe('speed helpers agree with the plain formulas', () => {
  it('powNonNeg equals Math.pow to rounding', () => {
    for (const e of [1.5, 2 / 3, 0.75, 1, 0.6, 99, 100, 0.4]) {
      for (const x of [0, 1e-12, 0.003, 0.5, 0.99999, 1, 7.3, 40]) {
        const want = Math.pow(x, e);
        expect(Math.abs(powNonNeg(x, e) - want)).toBeLessThanOrEqual(1e-13 * Math.max(want, 1e-300));
      }
    }
  });

  it('waterSaturationLowerBound never exceeds the saturation', () => {
    for (const lambda of [0.1, 0.6, 1]) {
      const q = resolveParams({ lambda });
      for (let p = 0; p <= 8; p += 0.01) expect(waterSaturationLowerBound(p, q)).toBeLessThanOrEqual(waterSaturationWtPct(p, q) + 1e-12);
    }
  });

  it('curve slopes match finite differences on both sides of cpx exhaustion', () => {
    const c = createMeltingCurves();
    const c2 = createMeltingCurves();
    for (const p of [0.3, 1.5, 3, 6]) {
      setMeltingCurves(c, p, P);
      for (const f of [0.02, 0.1, fCpxOut(p, P) - 0.02, fCpxOut(p, P) + 0.02, 0.6, 0.95]) {
        const t = dryTempFromCurves(f, c, P);
        const h = 1e-7;
        const dTdF = (dryTempFromCurves(f + h, c, P) - dryTempFromCurves(f - h, c, P)) / (2 * h);
        expect(dryTempSlopeFromCurves(f, t, c, P)).toBeCloseTo(dTdF, 3);
        const hp = 1e-6;
        const dTdP = (dryTempFromCurves(f, setMeltingCurves(c2, p + hp, P), P) - dryTempFromCurves(f, setMeltingCurves(c2, p - hp, P), P)) / (2 * hp);
        expect(dryTempPressureSlope(f, t, p, c, P)).toBeCloseTo(dTdP, 3);
      }
    }
  });
});
