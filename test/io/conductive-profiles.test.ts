/**
 * The profile table of conductive columns holds the whole steady geotherm, lid included, for every
 * computed row (ok and no_melt): users build geotherm lookup tables from it.
 */
import { describe, expect, it } from 'vitest';
import { defaultModel, meltColumn } from '../../src/physics/column.js';
import { farFieldTempK } from '../../src/physics/conductive-far-field.js';
import { DEFAULT_PARAMS } from '../../src/physics/params.js';
import type { ColumnResult, ConductiveGeotherm } from '../../src/physics/types.js';
import { KELVIN_OFFSET, PA_PER_GPA } from '../../src/physics/units.js';
import { allocateProfileSamples, conductiveGeothermC, sampleColumnProfile } from '../../src/run/profile-sampling.js';

const P = DEFAULT_PARAMS;
const kappa = P.k / (P.rho_s * P.c_P);
const grid = Float64Array.from({ length: 161 }, (_, j) => j * 0.05); // 0:8:0.05 GPa
const model = defaultModel({ thermal: 'conductive', withProfile: true });

function sampled(r: ColumnResult, tpC: number, lidKm: number): { t: number[]; f: number[]; prod: number[] } {
  const out = allocateProfileSamples(1, grid.length);
  sampleColumnProfile(r, tpC, lidKm, 'conductive', P, grid, out, 0);
  return { t: Array.from(out.t_c), f: Array.from(out.f), prod: Array.from(out.productivity_pct_per_gpa) };
}

describe('conductive geotherm in the profile table', () => {
  // a slow, cool column that never melts, and a melting one under a lid
  const cases = [
    { name: 'no_melt (Tp 1250, 2 mm/yr, lid 20 km)', s: { tp_c: 1250, water_ppm: 0, lid_km: 20, upwelling_mm_yr: 2 }, status: 'no_melt' },
    { name: 'melting (Tp 1380, 100 ppm, 10 mm/yr, lid 15 km)', s: { tp_c: 1380, water_ppm: 100, lid_km: 15, upwelling_mm_yr: 10 }, status: 'ok' },
  ] as const;

  for (const c of cases) {
    it(`${c.name}: T at every grid pressure, from the surface temperature down, continuous`, () => {
      const r = meltColumn(c.s, model);
      expect(r.status, r.reason ?? '').toBe(c.status);
      expect(r.geotherm).toBeDefined();
      const { t, f } = sampled(r, c.s.tp_c, c.s.lid_km);
      expect(t.every(Number.isFinite)).toBe(true);
      expect(f.every(Number.isFinite)).toBe(true);
      // boundary condition at the surface (physics reference: T = T_surface at z = 0)
      expect(t[0]).toBeCloseTo(P.T_surface, 9);
      // a steady column without heat sources warms downward through the lid
      const lidP = (c.s.lid_km * 1000 * P.rho_s * P.g) / PA_PER_GPA;
      for (let j = 1; j < grid.length && grid[j] <= lidP; j++) expect(t[j]).toBeGreaterThan(t[j - 1]);
      // inside the lid heat only conducts: T linear in depth from T_surface to the lid base
      // (physics reference, conductive column, top condition; analytic)
      const geo = r.geotherm as ConductiveGeotherm;
      const tLidBase = conductiveGeothermC(geo, lidP, c.s.tp_c, P);
      for (let j = 1; j < grid.length && grid[j] < lidP; j++) expect(t[j]).toBeCloseTo(P.T_surface + ((tLidBase - P.T_surface) * grid[j]) / lidP, 6);
      // no jump between neighbouring grid points anywhere (nodes to far field included): the lid's
      // gradient bounds the step, common practice for a smooth steady profile
      const steps = t.slice(1).map((v, j) => Math.abs(v - t[j]));
      expect(Math.max(...steps)).toBeLessThan(250);
      if (c.status === 'no_melt') expect(f.every((v) => v === 0)).toBe(true);
    });
  }

  it('below the solver domain T is the imposed far field, continuous at the bottom node', () => {
    const s = cases[1].s;
    const r = meltColumn(s, model);
    const geo = r.geotherm as ConductiveGeotherm;
    const last = geo.p_gpa.length - 1;
    const zBottomM = (geo.p_gpa[last] * PA_PER_GPA) / (P.rho_s * P.g);
    const w = (s.upwelling_mm_yr * 1e-3) / (365.25 * 24 * 3600);
    // the solver imposes farFieldTempK at its bottom node (physics reference, bottom condition)
    expect(geo.t_c[last]).toBeCloseTo(farFieldTempK(s.tp_c, zBottomM, w, kappa, P) - KELVIN_OFFSET, 6);
    expect(conductiveGeothermC(geo, geo.p_gpa[last], s.tp_c, P)).toBeCloseTo(geo.t_c[last], 6);
    const deeper = geo.p_gpa[last] + 1;
    const zDeep = (deeper * PA_PER_GPA) / (P.rho_s * P.g);
    expect(conductiveGeothermC(geo, deeper, s.tp_c, P)).toBeCloseTo(farFieldTempK(s.tp_c, zDeep, w, kappa, P) - KELVIN_OFFSET, 6);
  });

  it('the sampled T at the onset and at the top of melting matches the row', () => {
    const s = cases[1].s;
    const r = meltColumn(s, model);
    const geo = r.geotherm as ConductiveGeotherm;
    expect(conductiveGeothermC(geo, r.top_p_gpa as number, s.tp_c, P)).toBeCloseTo(r.t_top_c as number, 0);
    const { t } = sampled(r, s.tp_c, s.lid_km);
    // below the onset the sample is the geotherm itself
    const j = grid.findIndex((p) => p > (r.onset_p_gpa as number) + 0.1);
    expect(t[j]).toBeCloseTo(conductiveGeothermC(geo, grid[j], s.tp_c, P), 9);
  });

  it('isentropic rows keep the documented rule: no temperature in the lid', () => {
    const s = { tp_c: 1350, water_ppm: 100, lid_km: 30, upwelling_mm_yr: Number.NaN };
    const r = meltColumn(s, defaultModel({ thermal: 'isentropic', withProfile: true }));
    expect(r.geotherm).toBeUndefined();
    const out = allocateProfileSamples(1, grid.length);
    sampleColumnProfile(r, s.tp_c, s.lid_km, 'isentropic', P, grid, out, 0);
    expect(Number.isNaN(out.t_c[0])).toBe(true);
  });
});
