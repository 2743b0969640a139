import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { adiabatTempC } from '../../src/physics/adiabat.js';
import { fluxColumn, type FluxColumnResult } from '../../src/physics/flux-column.js';
import { geothermTableFromDepths, lidAdiabatGeotherm, tableGeotherm, type Geotherm } from '../../src/physics/flux-geotherm.js';
import { fluxWaterThreshold } from '../../src/physics/flux-threshold.js';
import { GAUSS7_WEIGHTS_ASCENDING, KRONROD15_ASCENDING, KRONROD15_WEIGHTS_ASCENDING } from '../../src/physics/gauss-kronrod.js';
import { drySolidusC, meltFraction, wetSolidusC } from '../../src/physics/melting.js';
import { DEFAULT_PARAMS as P } from '../../src/physics/params.js';
import { brentMinimize, brentRoot } from '../../src/physics/scalar-search.js';
import { pGpaFromDepthKm } from '../../src/physics/units.js';

const KELVIN = 273.15;
const run = (geo: Geotherm, waterPpm: number, heat: 'fixed' | 'balanced' = 'balanced', withProfile = false): FluxColumnResult =>
  fluxColumn(geo, waterPpm, { heat, params: P, withProfile });

describe('quadrature and scalar search', () => {
  it('Gauss–Kronrod 15 / Gauss 7 constants: weights sum to 2, exact on polynomials of degree 22 / 13 (analytic integrals)', () => {
    const sum = (w: readonly number[]): number => w.reduce((a, b) => a + b, 0);
    expect(sum(KRONROD15_WEIGHTS_ASCENDING)).toBeCloseTo(2, 14);
    expect(sum(GAUSS7_WEIGHTS_ASCENDING)).toBeCloseTo(2, 14);
    for (let k = 0; k <= 22; k++) {
      const exact = k % 2 === 1 ? 0 : 2 / (k + 1); // integral of x^k over [-1, 1]
      const kr = KRONROD15_ASCENDING.reduce((a, x, i) => a + KRONROD15_WEIGHTS_ASCENDING[i] * x ** k, 0);
      expect(kr, `K15 x^${k}`).toBeCloseTo(exact, 13);
      if (k <= 13) {
        const g = KRONROD15_ASCENDING.reduce((a, x, i) => a + GAUSS7_WEIGHTS_ASCENDING[i] * x ** k, 0);
        expect(g, `G7 x^${k}`).toBeCloseTo(exact, 13);
      }
    }
    // G7 is not exact at degree 14: the error estimate |K15 - G7| is real
    const g14 = KRONROD15_ASCENDING.reduce((a, x, i) => a + GAUSS7_WEIGHTS_ASCENDING[i] * x ** 14, 0);
    expect(Math.abs(g14 - 2 / 15)).toBeGreaterThan(1e-6);
  });

  it('Brent root and minimum on functions with known answers (analytic)', () => {
    const r = brentRoot((x) => Math.cos(x) - x, 0, 1, 1, Math.cos(1) - 1, 1e-14);
    expect(r).toBeCloseTo(0.7390851332151607, 13); // Dottie number, cos x = x
    const m = brentMinimize((x) => (x - 0.3) ** 2 + 1, -2, 2, 1e-12);
    expect(m.x).toBeCloseTo(0.3, 7);
    expect(m.fx).toBeCloseTo(1, 14);
  });
});

describe('flux column: the geotherm', () => {
  it('lid-adiabat: linear from the surface temperature to the adiabat at the plate base, the adiabat below (physics reference)', () => {
    const g = lidAdiabatGeotherm(1350, 60, 120, P);
    const pLid = pGpaFromDepthKm(60, P.rho_s, P.g);
    expect(g.kinksGpa).toEqual([pLid]);
    expect(g.pSlabGpa).toBeCloseTo(pGpaFromDepthKm(120, P.rho_s, P.g), 15);
    expect(g.tempC(0)).toBe(P.T_surface);
    expect(g.tempC(pLid / 2)).toBeCloseTo(adiabatTempC(1350, pLid, P) / 2, 10);
    expect(g.tempC(3)).toBeCloseTo(adiabatTempC(1350, 3, P), 12);
  });
});

describe('flux column: water 0 (common practice: without water only a geotherm above the dry solidus melts)', () => {
  it('melts exactly where the geotherm exceeds the dry solidus; the interval ends are its crossings to 1e-9 GPa', () => {
    // no plate: the adiabat of 1450 degC crosses the dry solidus at depth
    const geo = lidAdiabatGeotherm(1450, 0, 150, P);
    const r = run(geo, 0, 'fixed', true);
    expect(r.status).toBe('ok');
    const diff = (pg: number): number => geo.tempC(pg) - drySolidusC(pg, P);
    // independent crossing by plain bisection
    let lo = 0;
    let hi = geo.pSlabGpa;
    for (let i = 0; i < 200; i++) {
      const mid = 0.5 * (lo + hi);
      if (diff(mid) > 0) lo = mid;
      else hi = mid;
    }
    expect(r.onset_p_gpa!).toBeCloseTo(lo, 9);
    expect(r.top_p_gpa).toBe(0);
    const prof = r.profile!;
    for (let i = 0; i < prof.p_gpa.length; i++) {
      const above = diff(prof.p_gpa[i]) > 0;
      expect(prof.f[i] > 0, `P = ${prof.p_gpa[i]}`).toBe(above);
    }
  });

  it('a geotherm below the dry solidus everywhere gives no_melt, F_max 0 and a melt column of 0', () => {
    const r = run(lidAdiabatGeotherm(1300, 70, 110, P), 0);
    expect(r.status).toBe('no_melt');
    expect([r.f_max, r.melt_column_km, r.onset_p_gpa, r.f_mean]).toEqual([0, 0, null, null]);
    expect(r.water_threshold_ppm!).toBeGreaterThan(0);
  });
});

describe('flux column: water threshold', () => {
  it('is 0 exactly where the geotherm touches the dry solidus (common practice) and the hand formula just below', () => {
    // for these curves T_sol - T_geo is smallest at the plate base: find the Tp whose adiabat touches the solidus there
    const lidKm = 50;
    const pLid = pGpaFromDepthKm(lidKm, P.rho_s, P.g);
    let lo = 1100;
    let hi = 1800;
    for (let i = 0; i < 200; i++) {
      const mid = 0.5 * (lo + hi);
      if (adiabatTempC(mid, pLid, P) < drySolidusC(pLid, P)) lo = mid;
      else hi = mid;
    }
    const touch = hi;
    expect(fluxWaterThreshold(lidAdiabatGeotherm(touch, lidKm, 100, P), P).ppm).toBe(0);
    expect(fluxWaterThreshold(lidAdiabatGeotherm(touch + 5, lidKm, 100, P), P).ppm).toBe(0);
    const cooler = touch - 20;
    const d = drySolidusC(pLid, P) - adiabatTempC(cooler, pLid, P);
    // physics reference: X_b* = D_H2O ((T_sol - T_geo) / K)^(1/gamma), here at the plate base (ppm = 1e4 wt%)
    const byHand = 0.01 * Math.pow(d / 43, 1 / 0.75) * 1e4;
    const t = fluxWaterThreshold(lidAdiabatGeotherm(cooler, lidKm, 100, P), P);
    expect(t.pGpa!).toBeCloseTo(pLid, 9);
    expect(t.ppm! / byHand - 1).toBeLessThan(1e-12);
    expect(t.ppm!).toBeGreaterThan(0);
  });

  it('is null where no water content melts the column (a slab top inside a cold plate)', () => {
    const r = run(lidAdiabatGeotherm(1300, 120, 40, P), 50000);
    expect(r.water_threshold_ppm).toBeNull();
    expect(r.status).toBe('no_melt');
  });

  it('property over random geotherms: below the threshold no_melt, above it ok with F_max -> 0+', () => {
    // random geotherms: plate + adiabat, and tables of random temperatures under a plate
    const lidAdiabat = fc.record({ tp: fc.double({ min: 1150, max: 1500, noNaN: true }), lid: fc.double({ min: 0, max: 120, noNaN: true }), slab: fc.double({ min: 30, max: 240, noNaN: true }) })
      .map((g) => lidAdiabatGeotherm(g.tp, g.lid, g.slab, P));
    const table = fc.record({
      temps: fc.array(fc.double({ min: 600, max: 1450, noNaN: true }), { minLength: 3, maxLength: 8 }),
      slab: fc.double({ min: 40, max: 200, noNaN: true }),
    }).map(({ temps, slab }) => {
      const depths = temps.map((_, i) => (slab * (i + 1)) / temps.length);
      const g = tableGeotherm(geothermTableFromDepths([0, ...depths], [0, ...temps], P), slab, P);
      if (typeof g === 'string') throw new Error(g);
      return g;
    });
    let checked = 0;
    fc.assert(
      fc.property(fc.oneof(lidAdiabat, table), fc.constantFrom<'fixed' | 'balanced'>('fixed', 'balanced'), (geo, heat) => {
        const t = fluxWaterThreshold(geo, P).ppm;
        if (t === null) {
          expect(run(geo, 50000, heat).status).toBe('no_melt');
          return;
        }
        if (t === 0) {
          // the geotherm reaches the dry solidus: any water melts somewhere (or it melts dry)
          expect(run(geo, 1, heat).status).toBe('ok');
          return;
        }
        if (t > 40000) return; // above the allowed water range
        checked++;
        expect(run(geo, t * (1 - 1e-6), heat).status).toBe('no_melt');
        const a = run(geo, t * (1 + 1e-4), heat);
        const b = run(geo, t * (1 + 1e-7), heat);
        expect(a.status).toBe('ok');
        expect(b.status).toBe('ok');
        expect(b.f_max!).toBeGreaterThan(0);
        expect(b.f_max!).toBeLessThan(a.f_max!);
        expect(a.f_max!).toBeLessThan(1e-3);
      }),
      { numRuns: 300, seed: 13 },
    );
    expect(checked).toBeGreaterThan(40);
  });
});

describe('flux column: wet solidus at saturation (Katz et al. 2003)', () => {
  it('at 3 GPa: T_sol - K X_sat^gamma from the paper\'s equations written out', () => {
    // Katz, Spiegelman & Langmuir (2003): T_sol = A1 + A2 P + A3 P^2; X_sat = chi1 P^lambda + chi2 P;
    // dT = K X^gamma; Table 2 values (from memory): A 1085.7, 132.9, -5.1; chi 12, 1, 0.6; K 43, gamma 0.75
    const pGpa = 3;
    const tSol = 1085.7 + 132.9 * pGpa - 5.1 * pGpa * pGpa;
    const xSat = 12 * Math.pow(pGpa, 0.6) + 1 * pGpa;
    const byHand = tSol - 43 * Math.pow(xSat, 0.75);
    expect(byHand).toBeCloseTo(940.57, 2); // arithmetic: 1438.5 - 43 * 26.198^0.75
    // saturated first melt: 20000 ppm = 2 wt% bulk, X_b / D = 200 wt% > X_sat
    expect(wetSolidusC(pGpa, 2, P)).toBeCloseTo(byHand, 10);
    const geo = lidAdiabatGeotherm(1350, 40, 150, P);
    const prof = run(geo, 20000, 'balanced', true).profile!;
    const i = prof.p_gpa.findIndex((x) => Math.abs(x - 3) < 0.02);
    const x = prof.p_gpa[i];
    const hand = 1085.7 + 132.9 * x - 5.1 * x * x - 43 * Math.pow(12 * Math.pow(x, 0.6) + x, 0.75);
    expect(prof.t_wet_solidus_c[i]).toBeCloseTo(hand, 9);
  });
});

describe('flux column: heat', () => {
  const geo = lidAdiabatGeotherm(1320, 55, 130, P);
  it('balanced melts less than fixed, and conserves c_P ln(T/T_geo) + dS F = 0 at each depth to 1e-9 (physics reference)', () => {
    for (const water of [200, 1000, 5000, 20000]) {
      const fixed = run(geo, water, 'fixed', true);
      const bal = run(geo, water, 'balanced', true);
      expect(fixed.status).toBe('ok');
      expect(bal.f_max!).toBeLessThan(fixed.f_max!);
      expect(bal.melt_column_km!).toBeLessThan(fixed.melt_column_km!);
      const pr = bal.profile!;
      let melting = 0;
      for (let i = 0; i < pr.p_gpa.length; i++) {
        const entropy = P.c_P * Math.log((pr.t_c[i] + KELVIN) / (pr.t_geo_c[i] + KELVIN)) + P.dS * pr.f[i];
        expect(Math.abs(entropy)).toBeLessThan(1e-9);
        if (pr.f[i] > 0) {
          melting++;
          // the point is in melting equilibrium at its own temperature (independent solver in melting.ts)
          expect(meltFraction(pr.t_c[i], pr.p_gpa[i], water * 1e-4, P)).toBeCloseTo(pr.f[i], 9);
        }
      }
      expect(melting).toBeGreaterThan(10);
      const pf = fixed.profile!;
      for (let i = 0; i < pf.p_gpa.length; i++) {
        expect(pf.t_c[i]).toBe(pf.t_geo_c[i]);
        if (pf.f[i] > 0) expect(meltFraction(pf.t_c[i], pf.p_gpa[i], water * 1e-4, P)).toBeCloseTo(pf.f[i], 9);
      }
    }
  });
});

describe('flux column: accuracy', () => {
  it('a geotherm table reproducing lid-adiabat gives the same results to 1e-6', () => {
    const tp = 1320; // below the dry solidus at the plate base: a positive water threshold
    const lid = 70;
    const slab = 110;
    const depths: number[] = [];
    const temps: number[] = [];
    const ref = lidAdiabatGeotherm(tp, lid, slab, P);
    for (let i = 0; i <= 2200; i++) {
      const z = i * 0.05; // node at the plate base (70 km) and at the slab (110 km)
      depths.push(z);
      temps.push(ref.tempC(pGpaFromDepthKm(z, P.rho_s, P.g)));
    }
    const table = tableGeotherm(geothermTableFromDepths(depths, temps, P), slab, P);
    if (typeof table === 'string') throw new Error(table);
    for (const heat of ['fixed', 'balanced'] as const) {
      for (const water of [150, 1500]) {
        const a = run(ref, water, heat);
        const b = run(table, water, heat);
        expect(b.status).toBe(a.status);
        for (const k of ['onset_p_gpa', 'top_p_gpa', 'f_max', 'f_mean', 'melt_column_km', 'h2o_melt_wt_pct', 'water_threshold_ppm'] as const) {
          const x = a[k] as number;
          const y = b[k] as number;
          if (x === 0) expect(y, `${heat} ${water} ${k}`).toBe(0);
          else expect(Math.abs(y / x - 1), `${heat} ${water} ${k}`).toBeLessThan(1e-6);
        }
      }
    }
  });

  it('integrals agree with a much tighter tolerance to 5e-5 (well inside 0.1 %), interval ends are crossings to 1e-9 GPa', () => {
    const cases: [number, number, number, number][] = [[1300, 70, 110, 500], [1420, 35, 150, 3000], [1350, 90, 200, 20000], [1280, 50, 80, 60]];
    for (let i = 0; i < 40; i++) cases.push([1260 + 5 * i, 30 + (i * 7) % 60, 80 + (i * 13) % 120, Math.round(20 * Math.pow(1000, ((i * 0.618) % 1)))]);
    let checked = 0;
    for (const [tp, lid, slab, water] of cases) {
      const geo = lidAdiabatGeotherm(tp, lid, slab, P);
      const a = run(geo, water);
      const b = fluxColumn(geo, water, { heat: 'balanced', params: P, relTol: 1e-12 });
      expect(b.status, `${tp} ${lid} ${slab} ${water}`).toBe(a.status);
      if (a.status !== 'ok') continue;
      checked++;
      expect(Math.abs(a.melt_column_km! / b.melt_column_km! - 1)).toBeLessThan(5e-5);
      expect(Math.abs(a.h2o_melt_wt_pct! / b.h2o_melt_wt_pct! - 1)).toBeLessThan(5e-5);
      const over = (pg: number): number => geo.tempC(pg) - wetSolidusC(pg, water * 1e-4, P);
      expect(over(a.top_p_gpa! + 1e-9)).toBeGreaterThan(0);
      expect(over(a.top_p_gpa! - 1e-9)).toBeLessThanOrEqual(0);
      if (a.onset_p_gpa! < geo.pSlabGpa) {
        expect(over(a.onset_p_gpa! - 1e-9)).toBeGreaterThan(0);
        expect(over(a.onset_p_gpa! + 1e-9)).toBeLessThanOrEqual(0);
      } else {
        expect(a.onset_p_gpa).toBe(geo.pSlabGpa);
      }
    }
    expect(checked).toBeGreaterThan(25);
  });
});
