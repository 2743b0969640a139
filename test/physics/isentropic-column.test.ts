import { describe, expect, it } from 'vitest';
import { adiabatTempC, adiabatTempK } from '../../src/physics/adiabat.js';
import { defaultModel, meltColumn } from '../../src/physics/column.js';
import { integrateIsentropicPath, isentropicColumn } from '../../src/physics/isentropic-column.js';
import { drySolidusC, meltFraction, tempForMeltFractionC, waterSaturationWtPct } from '../../src/physics/melting.js';
import { findMeltOnset } from '../../src/physics/onset.js';
import { DEFAULT_PARAMS as P, resolveParams, type MeltParams } from '../../src/physics/params.js';
import { MODEL_MAX_P_GPA, type ColumnResult, type ModelOptions, type Scenario, type WaterMode } from '../../src/physics/types.js';
import { pGpaFromDepthKm, wtPctFromPpm } from '../../src/physics/units.js';

const scenario = (tpC: number, waterPpm = 0, lidKm = 0, upwellingMmYr = Number.NaN): Scenario => ({
  tp_c: tpC,
  water_ppm: waterPpm,
  lid_km: lidKm,
  upwelling_mm_yr: upwellingMmYr,
});

const isentropic = (overrides: Partial<ModelOptions> = {}): ModelOptions => defaultModel({ thermal: 'isentropic', ...overrides });

function okColumn(s: Scenario, model: ModelOptions = isentropic()): ColumnResult {
  const r = meltColumn(s, model);
  if (r.status !== 'ok') throw new Error(`expected ok for ${JSON.stringify(s)}, got ${r.status}: ${r.reason}`);
  return r;
}

function num(v: number | null): number {
  if (v === null) throw new Error('unexpected null');
  return v;
}

/**
 * Entropy relative to the solid at P = 0 on the adiabat of Tp, along the computed path, from the
 * entropy relation (physics reference): s = c_P ln T - int (alpha/rho)_mix dP + dS F, with the
 * pressure integral taken up the solid adiabat to the onset and then back along the profile
 * (mixture term linear in F between profile points). Zero for an isentropic path.
 */
function entropyDefects(tpC: number, r: ColumnResult, p: MeltParams): number[] {
  const prof = r.profile;
  if (prof === undefined) throw new Error('no profile');
  const aS = p.alpha_s / p.rho_s;
  const aF = p.alpha_f / p.rho_f;
  const s0 = p.c_P * Math.log(tpC + 273.15);
  let integral = aS * prof.p_gpa[0] * 1e9;
  const out: number[] = [];
  for (let i = 0; i < prof.p_gpa.length; i++) {
    if (i > 0) {
      const fMid = 0.5 * (prof.f[i] + prof.f[i - 1]);
      integral += (fMid * aF + (1 - fMid) * aS) * (prof.p_gpa[i] - prof.p_gpa[i - 1]) * 1e9;
    }
    out.push(p.c_P * Math.log(prof.t_c[i] + 273.15) - integral + p.dS * prof.f[i] - s0);
  }
  return out;
}

describe('isentropic column: entropy and the melting law along the path', () => {
  const cases: [number, number, number, WaterMode][] = [
    [1350, 0, 0, 'batch'],
    [1350, 300, 0, 'batch'],
    [1300, 200, 10, 'fractional'],
    [1450, 100, 25, 'batch'],
  ];

  it.each(cases)('Tp %d degC, %d ppm, lid %d km, %s: entropy is conserved at every point', (tp, ppm, lid, water) => {
    const r = okColumn(scenario(tp, ppm, lid), isentropic({ water, withProfile: true }));
    for (const d of entropyDefects(tp, r, P)) expect(Math.abs(d)).toBeLessThan(1e-6); // J/kg/K, of ~7000
  });

  it.each(cases)('Tp %d degC, %d ppm, lid %d km, %s: points where F grows lie on the melting curve', (tp, ppm, lid, water) => {
    const r = okColumn(scenario(tp, ppm, lid), isentropic({ water, withProfile: true }));
    const prof = r.profile!;
    const x0 = wtPctFromPpm(ppm);
    expect(prof.t_c[0]).toBeCloseTo(adiabatTempC(tp, prof.p_gpa[0], P), 9); // starts on the solid adiabat
    for (let i = 1; i < prof.f.length; i++) {
      expect(prof.f[i]).toBeGreaterThanOrEqual(prof.f[i - 1]); // melt is never refrozen
      if (!(prof.f[i] > prof.f[i - 1])) continue;
      expect(tempForMeltFractionC(prof.f[i], prof.p_gpa[i], prof.h2o_melt_wt_pct[i], P)).toBeCloseTo(prof.t_c[i], 7);
      // batch: the forward solver (an independent root find) gives the same F at (T, P)
      if (water === 'batch') expect(meltFraction(prof.t_c[i], prof.p_gpa[i], x0, P)).toBeCloseTo(prof.f[i], 8);
    }
  });

  it('with no latent heat and equal expansivity/density the path is the solid adiabat (analytic limit)', () => {
    // dS = 0 and alpha_f/rho_f = alpha_s/rho_s remove every term but c_P dT/T - (alpha/rho) dP
    const q = resolveParams({ dS: 0, alpha_f: P.alpha_s, rho_f: P.rho_s });
    for (const [tp, ppm] of [[1350, 0], [1300, 250]] as const) {
      const r = okColumn(scenario(tp, ppm), isentropic({ params: q, withProfile: true }));
      const prof = r.profile!;
      const x0 = wtPctFromPpm(ppm);
      // F is the running maximum of the equilibrium F on the adiabat (melt is never refrozen)
      let fRun = 0;
      for (let i = 0; i < prof.p_gpa.length; i++) {
        expect(prof.t_c[i]).toBeCloseTo(adiabatTempC(tp, prof.p_gpa[i], q), 8);
        fRun = Math.max(fRun, meltFraction(prof.t_c[i], prof.p_gpa[i], x0, q));
        expect(prof.f[i]).toBeCloseTo(fRun, 8);
      }
      // crust from an independent composite Simpson quadrature of that running maximum
      const pOn = num(r.onset_p_gpa);
      const n = 20000;
      const h = pOn / n;
      let sum = 0;
      fRun = 0;
      for (let i = n; i >= 0; i--) {
        const pp = i * h;
        const w = i === 0 || i === n ? 1 : i % 2 === 1 ? 4 : 2;
        fRun = Math.max(fRun, meltFraction(adiabatTempC(tp, pp, q), pp, x0, q));
        sum += w * fRun;
      }
      const crustKm = ((sum * h) / 3) * 1e9 / (q.rho_c * q.g) / 1000;
      expect(Math.abs(num(r.crust_km) - crustKm) / crustKm).toBeLessThan(1e-4);
    }
  });
});

describe('isentropic column: steps', () => {
  it('steps of stepGpa from the onset, the final partial step landing exactly on the lid base', () => {
    const lid = 17.3;
    const r = okColumn(scenario(1400, 150, lid), isentropic({ stepGpa: 0.05, withProfile: true }));
    const prof = r.profile!;
    const n = prof.p_gpa.length;
    const pLid = pGpaFromDepthKm(lid, P.rho_s, P.g);
    expect(prof.p_gpa[n - 1]).toBe(pLid);
    expect(r.top_p_gpa).toBe(pLid);
    for (let i = 1; i < n - 1; i++) expect(prof.p_gpa[i - 1] - prof.p_gpa[i]).toBeCloseTo(0.05, 12);
    const last = prof.p_gpa[n - 2] - prof.p_gpa[n - 1];
    expect(last).toBeGreaterThan(0);
    expect(last).toBeLessThanOrEqual(0.05 + 1e-12);
  });

  const convergenceCases: [number, number, number, WaterMode][] = [
    [1250, 0, 0, 'batch'],
    [1350, 0, 0, 'batch'],
    [1500, 0, 20, 'batch'],
    [1350, 300, 0, 'batch'],
    [1350, 300, 0, 'fractional'],
    [1300, 150, 12.3, 'fractional'],
    [1400, 1000, 5, 'batch'],
    [1150, 300, 30, 'batch'],
  ];

  it.each(convergenceCases)('a 0.05 GPa step is within 0.1 percent of a 0.001 GPa step: Tp %d, %d ppm, lid %d km, %s', (tp, ppm, lid, water) => {
    const coarse = okColumn(scenario(tp, ppm, lid), isentropic({ water, stepGpa: 0.05 }));
    const fine = okColumn(scenario(tp, ppm, lid), isentropic({ water, stepGpa: 0.001 }));
    for (const k of ['crust_km', 'f_max', 'onset_p_gpa'] as const) {
      const rel = Math.abs(num(coarse[k]) - num(fine[k])) / Math.abs(num(fine[k]));
      expect(rel, k).toBeLessThan(1e-3);
    }
  });
});

describe('isentropic column: water', () => {
  it('melts with a few hundred ppm water where the dry adiabat stays below the solidus under the lid', () => {
    // Tp 1150 degC under a 30 km lid: the adiabat is below the dry solidus at every pressure from the
    // lid base to the model's deepest pressure, yet 300 ppm water lowers the solidus enough to melt
    // (common practice: water lowers the peridotite solidus)
    const pLid = pGpaFromDepthKm(30, P.rho_s, P.g);
    for (let p = pLid; p <= MODEL_MAX_P_GPA; p += 0.01) expect(adiabatTempC(1150, p, P)).toBeLessThan(drySolidusC(p, P));
    const dry = meltColumn(scenario(1150, 0, 30), isentropic());
    expect(dry.status).toBe('no_melt');
    for (const water of ['batch', 'fractional'] as const) {
      const wet = okColumn(scenario(1150, 300, 30), isentropic({ water }));
      expect(num(wet.crust_km)).toBeGreaterThan(0);
      expect(num(wet.onset_p_gpa)).toBeGreaterThan(pLid);
    }
  });

  it('onset deepens with water', () => {
    let prev = num(okColumn(scenario(1300, 0, 0)).onset_p_gpa);
    for (const ppm of [50, 100, 200, 400, 800]) {
      const p = num(okColumn(scenario(1300, ppm, 0)).onset_p_gpa);
      expect(p).toBeGreaterThan(prev);
      prev = p;
    }
  });

  const fractionalCases: [number, number, number][] = [
    [1350, 300, 0],
    [1300, 200, 10],
    [1150, 300, 30],
    [1100, 300, 0],
    [1250, 1000, 0],
    [1400, 500, 40],
  ];

  it.each(fractionalCases)('fractional mode conserves water: Tp %d, %d ppm, lid %d km', (tp, ppm, lid) => {
    const x0 = wtPctFromPpm(ppm);
    const pLid = pGpaFromDepthKm(lid, P.rho_s, P.g);
    const on = findMeltOnset(tp, x0, pLid, P);
    if (on.kind !== 'onset') throw new Error(`no onset for ${tp}/${ppm}/${lid}`);
    for (const step of [0.05, 0.013]) {
      const path = integrateIsentropicPath(tp, x0, on.pGpa, pLid, 'fractional', P, step);
      // extracted with the melt (int X_melt dF) + left in the residue ((1 - F) X_res) = initial
      const total = path.waterExtractedWtPct + (1 - path.fTop) * path.residueWaterWtPct;
      expect(Math.abs(total - x0) / x0).toBeLessThan(1e-12);
      expect(path.residueWaterWtPct).toBeGreaterThanOrEqual(0);
      expect(path.residueWaterWtPct).toBeLessThan(x0);
    }
  });

  it('fractional mode conserves water through saturated stretches (low saturation parameters)', () => {
    // chi1 = 1, chi2 = 0.5 make the first melt saturated over most of the column, so the steps use the
    // saturated solution and the switch from saturated to unsaturated
    const q = resolveParams({ chi1: 1, chi2: 0.5 });
    for (const [tp, x0] of [[1100, 0.1], [1150, 0.3], [1250, 0.05]] as const) {
      const on = findMeltOnset(tp, x0, 0, q);
      if (on.kind !== 'onset') throw new Error('no onset');
      expect(x0 / q.D_H2O).toBeGreaterThan(waterSaturationWtPct(on.pGpa, q)); // saturated at the onset
      const path = integrateIsentropicPath(tp, x0, on.pGpa, 0, 'fractional', q);
      const total = path.waterExtractedWtPct + (1 - path.fTop) * path.residueWaterWtPct;
      expect(Math.abs(total - x0) / x0).toBeLessThan(1e-12);
    }
  });

  it('fractional residue water follows Rayleigh, X_res = X0 (1 - F)^(1/D - 1), while unsaturated', () => {
    // melt water stays below saturation: X0 / D = 2 wt% while X_sat >= 12 * 0.97^0.6 wt% at the lid base
    const x0 = wtPctFromPpm(200);
    const pLid = pGpaFromDepthKm(30, P.rho_s, P.g);
    expect(x0 / P.D_H2O).toBeLessThan(waterSaturationWtPct(pLid, P));
    const on = findMeltOnset(1350, x0, pLid, P);
    if (on.kind !== 'onset') throw new Error('no onset');
    const path = integrateIsentropicPath(1350, x0, on.pGpa, pLid, 'fractional', P);
    const rayleigh = x0 * Math.pow(1 - path.fTop, 1 / P.D_H2O - 1);
    expect(Math.abs(path.residueWaterWtPct - rayleigh) / rayleigh).toBeLessThan(1e-10);
  });

  it('the pooled melt cannot hold more water than the melting region supplied', () => {
    for (const water of ['batch', 'fractional'] as const) {
      for (const [tp, ppm, lid] of [[1350, 300, 0], [1300, 100, 20], [1200, 800, 0]] as const) {
        const r = okColumn(scenario(tp, ppm, lid), isentropic({ water }));
        // int W dP <= X0 (P_onset - P_top), and int F dP = f_mean (P_onset - P_top)
        expect(num(r.h2o_melt_wt_pct)).toBeGreaterThan(0);
        expect(num(r.h2o_melt_wt_pct) * num(r.f_mean)).toBeLessThanOrEqual(wtPctFromPpm(ppm) * (1 + 1e-12));
      }
    }
    expect(okColumn(scenario(1350)).h2o_melt_wt_pct).toBe(0);
  });
});

describe('isentropic column: crust', () => {
  it('normal oceanic crust (7.1 km) comes from Tp between 1300 and 1350 degC, dry, no lid', () => {
    // White, McKenzie & O'Nions 1992 (JGR 97): oceanic crust 7.1 +/- 0.8 km; produced at Tp of
    // roughly 1300-1350 degC in models of this kind (memory). Order-of-magnitude check.
    const c1300 = num(okColumn(scenario(1300)).crust_km);
    const c1350 = num(okColumn(scenario(1350)).crust_km);
    expect(c1300).toBeLessThanOrEqual(7.1);
    expect(c1350).toBeGreaterThanOrEqual(7.1);
    for (const c of [c1300, c1350]) {
      expect(c).toBeGreaterThan(3);
      expect(c).toBeLessThan(15);
    }
  });

  it('grows with Tp and shrinks with the lid', () => {
    let prev = 0;
    for (let tp = 1250; tp <= 1550; tp += 25) {
      const c = num(okColumn(scenario(tp, 100, 10)).crust_km);
      expect(c).toBeGreaterThan(prev);
      prev = c;
    }
    prev = Infinity;
    for (const lid of [0, 5, 10, 20, 40, 60]) {
      const c = num(okColumn(scenario(1400, 100, lid)).crust_km);
      expect(c).toBeLessThan(prev);
      prev = c;
    }
  });

  it('crust_km = int F dP / (rho_c g) and f_mean = int F dP / (P_onset - P_top) describe one integral', () => {
    const r = okColumn(scenario(1380, 120, 8));
    const span = num(r.onset_p_gpa) - num(r.top_p_gpa);
    expect(num(r.crust_km)).toBeCloseTo((num(r.f_mean) * span * 1e9) / (P.rho_c * P.g) / 1000, 10);
    expect(num(r.productivity_pct_per_gpa)).toBeCloseTo((100 * num(r.f_max)) / span, 10);
  });
});

describe('isentropic column: statuses', () => {
  it('no_melt for a cold Tp under a lid: crust 0, f_max 0, interval fields null', () => {
    const r = meltColumn(scenario(1150, 0, 30), isentropic());
    expect(r.status).toBe('no_melt');
    expect(r.reason).toBeNull();
    expect(r.crust_km).toBe(0);
    expect(r.f_max).toBe(0);
    for (const k of ['onset_p_gpa', 'onset_depth_km', 'top_p_gpa', 'top_depth_km', 'f_mean', 't_top_c', 'h2o_melt_wt_pct', 'productivity_pct_per_gpa', 'melt_flux_kg_m2_yr', 'surface_heat_flow_mw_m2'] as const) {
      expect(r[k], k).toBeNull();
    }
    expect(meltColumn(scenario(1150, 0, 30, 20), isentropic()).melt_flux_kg_m2_yr).toBe(0);
  });

  it('onset_beyond_range within the allowed inputs: very hot, or very wet', () => {
    for (const [tp, ppm] of [[1800, 0], [1800, 300], [1700, 0], [1350, 5000], [1100, 50000]] as const) {
      const r = meltColumn(scenario(tp, ppm), isentropic());
      expect(r.status, `${tp}/${ppm}`).toBe('onset_beyond_range');
      expect(r.reason).toMatch(/deeper than 8 GPa/);
      expect(r.crust_km).toBeNull();
    }
  });

  it('failed rows for impossible inputs, with a reason and no numbers', () => {
    for (const s of [scenario(Number.NaN), scenario(1350, -1), scenario(1350, 0, Infinity)]) {
      const r = isentropicColumn(s, isentropic());
      expect(r.status).toBe('failed');
      expect(r.reason).toBeTruthy();
      expect(r.crust_km).toBeNull();
    }
    expect(isentropicColumn(scenario(1350), isentropic({ stepGpa: 0 })).status).toBe('failed');
  });

  it('melt flux is rho_s w F_max with w in m/yr, null without an upwelling rate', () => {
    const r = okColumn(scenario(1350, 0, 0, 20), isentropic());
    expect(num(r.melt_flux_kg_m2_yr)).toBeCloseTo(3300 * 0.02 * num(r.f_max), 10);
    expect(okColumn(scenario(1350), isentropic()).melt_flux_kg_m2_yr).toBeNull();
  });

  it('never returns a non-finite number in an ok row, over the whole allowed input range', () => {
    // deterministic fill of the allowed box, both water modes
    const a = [0.6180339887498949, 0.41421356237309515, 0.7320508075688772];
    const counts: Record<string, number> = {};
    for (const water of ['batch', 'fractional'] as const) {
      for (let i = 0; i < 400; i++) {
        const u = a.map((x) => (0.5 + i * x) % 1);
        const ppm = i % 3 === 0 ? 0 : 50000 * Math.pow(u[1], 4);
        const r = meltColumn(scenario(1100 + 700 * u[0], ppm, 200 * u[2] * u[2]), isentropic({ water }));
        counts[r.status] = (counts[r.status] ?? 0) + 1;
        expect(r.status).not.toBe('failed');
        if (r.status !== 'ok') continue;
        for (const k of ['onset_p_gpa', 'onset_depth_km', 'top_p_gpa', 'top_depth_km', 'f_max', 'f_mean', 'crust_km', 't_top_c', 'h2o_melt_wt_pct', 'productivity_pct_per_gpa'] as const) {
          expect(Number.isFinite(r[k]), k).toBe(true);
        }
        expect(num(r.f_mean)).toBeLessThanOrEqual(num(r.f_max));
        expect(num(r.f_max)).toBeLessThanOrEqual(1);
        expect(num(r.onset_p_gpa)).toBeGreaterThan(num(r.top_p_gpa));
      }
    }
    // the fill reaches every non-failure status
    expect(Object.keys(counts).sort()).toEqual(['no_melt', 'ok', 'onset_beyond_range']);
  });

  it('the T at the top is below the adiabat at the top (latent heat was consumed)', () => {
    for (const tp of [1300, 1400, 1500]) {
      const r = okColumn(scenario(tp, 0, 10));
      expect(num(r.t_top_c)).toBeLessThan(adiabatTempK(tp, num(r.top_p_gpa), P) - 273.15);
    }
  });
});
