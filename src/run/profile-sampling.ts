/**
 * Sampling a computed column onto the fixed pressure grid of the profile table.
 *
 * Rows (one per grid pressure, every scenario gets the whole grid, so the table reshapes to
 * scenarios x pressures):
 * - above the top of the column (inside the lid, P < P_top): t_c, f, h2o_melt_wt_pct and
 *   productivity are null for isentropic columns (the lid's temperature is not modelled there);
 *   a conductive column gives its geotherm, F as at the lid base, productivity 0 and no melt water;
 * - between the onset and the top (P_top <= P <= P_onset): the computed path, interpolated linearly
 *   in pressure between its points; productivity = -dF/dP x 100 is the slope of that interpolant
 *   (the path segment holding P; at a path point, the segment above it);
 * - below the onset (P > P_onset; every P >= P_top of a no_melt column): f = 0, productivity = 0,
 *   h2o_melt_wt_pct null (no melt), t_c on the solid adiabat for isentropic columns and on the
 *   conductive geotherm for conductive ones;
 * - conductive columns (ok and no_melt): t_c is the steady geotherm at every grid pressure, lid
 *   included: the solver's nodes interpolated linearly in pressure, and below its domain the
 *   sub-solidus far field it imposes there (conductiveGeothermC), T_surface at P = 0 and linear
 *   through the lid; a no_melt column has f = 0 and productivity 0 from the surface down;
 * - onset_beyond_range and failed scenarios: all four null.
 * NaN stands for null in the arrays (it becomes a validity bitmap in Arrow).
 */
import { adiabatTempC } from '../physics/adiabat.js';
import type { MeltParams } from '../physics/params.js';
import type { ColumnResult, ConductiveGeotherm, ThermalModel } from '../physics/types.js';
import { KELVIN_OFFSET, PA_PER_GPA, pGpaFromDepthKm } from '../physics/units.js';
import type { ProfileSamples } from '../process/chunk-result.js';

/** The sampled values of a chunk, row-major: scenario i, grid point j at index i * points + j. */
export type { ProfileSamples } from '../process/chunk-result.js';

/** Profile samples of n scenarios on a grid of `points` pressures, every value null (NaN). */
export function allocateProfileSamples(n: number, points: number): ProfileSamples {
  const make = (): Float64Array => new Float64Array(n * points).fill(Number.NaN);
  return { points, t_c: make(), f: make(), h2o_melt_wt_pct: make(), productivity_pct_per_gpa: make() };
}

/** Leave scenario `row`'s samples null (NaN). */
export function clearProfileRow(out: ProfileSamples, row: number): void {
  const a = row * out.points;
  const b = a + out.points;
  out.t_c.fill(Number.NaN, a, b);
  out.f.fill(Number.NaN, a, b);
  out.h2o_melt_wt_pct.fill(Number.NaN, a, b);
  out.productivity_pct_per_gpa.fill(Number.NaN, a, b);
}

/**
 * Temperature (degC) of a conductive column's geotherm at pressure pGpa: its nodes interpolated
 * linearly in pressure, and below the deepest node the far field T = Tp[K] exp(m+ z) that the solver
 * imposes there (z = P / (rho_s g)).
 */
export function conductiveGeothermC(geo: ConductiveGeotherm, pGpa: number, tpC: number, params: MeltParams): number {
  const pp = geo.p_gpa;
  const last = pp.length - 1;
  if (pGpa >= pp[last]) {
    const zM = (pGpa * PA_PER_GPA) / (params.rho_s * params.g);
    return (tpC + KELVIN_OFFSET) * Math.exp(geo.farFieldGrowthPerM * zM) - KELVIN_OFFSET;
  }
  if (pGpa <= pp[0]) return geo.t_c[0];
  // binary search for the node interval [lo, lo + 1] holding pGpa
  let lo = 0;
  let hi = last;
  while (hi - lo > 1) {
    const mid = (lo + hi) >> 1;
    if (pp[mid] <= pGpa) lo = mid;
    else hi = mid;
  }
  const w = (pGpa - pp[lo]) / (pp[hi] - pp[lo]);
  return geo.t_c[lo] + w * (geo.t_c[hi] - geo.t_c[lo]);
}

/**
 * Write scenario `row`'s samples on the ascending grid `pressures` (GPa) into `out`.
 * @param result the column, computed with withProfile: true
 * @param tpC potential temperature (degC), for the adiabat below the onset
 * @param lidKm lid thickness (km): the top of a no_melt column
 * @param thermal the thermal model the column ran with
 */
export function sampleColumnProfile(
  result: ColumnResult,
  tpC: number,
  lidKm: number,
  thermal: ThermalModel,
  params: MeltParams,
  pressures: Float64Array,
  out: ProfileSamples,
  row: number,
): void {
  clearProfileRow(out, row);
  const base = row * out.points;
  const g = pressures.length;
  const isentropic = thermal === 'isentropic';
  const geo = isentropic ? undefined : result.geotherm;
  // temperature of the solid below the onset (and through a no_melt column)
  const solidC = (p: number): number => (geo !== undefined ? conductiveGeothermC(geo, p, tpC, params) : isentropic ? adiabatTempC(tpC, p, params) : Number.NaN);
  if (result.status === 'no_melt') {
    // a conductive no_melt column holds its geotherm from the surface down; an isentropic one stops at the lid base
    const top = geo !== undefined ? 0 : pGpaFromDepthKm(lidKm, params.rho_s, params.g);
    for (let j = 0; j < g; j++) {
      const p = pressures[j];
      if (p < top) continue;
      out.t_c[base + j] = solidC(p);
      out.f[base + j] = 0;
      out.productivity_pct_per_gpa[base + j] = 0;
    }
    return;
  }
  const prof = result.profile;
  if (result.status !== 'ok' || prof === undefined || prof.p_gpa.length < 2) return;
  const pp = prof.p_gpa; // descending: onset (index 0) to top (last)
  const n = pp.length;
  const onset = pp[0];
  const top = pp[n - 1];
  // k: the path point at or just below (deeper than) p; walks towards the onset as p grows
  let k = n - 1;
  for (let j = 0; j < g; j++) {
    const p = pressures[j];
    const at = base + j;
    if (p < top) {
      // inside a conductive column's lid: its geotherm, F as at the lid base (extracted), no melt
      if (geo !== undefined) {
        out.t_c[at] = solidC(p);
        out.f[at] = prof.f[n - 1];
        out.productivity_pct_per_gpa[at] = 0;
      }
      continue;
    }
    if (p > onset) {
      out.t_c[at] = solidC(p);
      out.f[at] = 0;
      out.productivity_pct_per_gpa[at] = 0;
      continue;
    }
    while (k > 0 && pp[k] < p) k--;
    // segment (a, b) with pp[a] >= p >= pp[b]: the one above the point when p sits on a path point
    const a = k === n - 1 ? n - 2 : k;
    const b = a + 1;
    const dp = pp[b] - pp[a];
    if (!(dp < 0)) {
      out.t_c[at] = prof.t_c[k];
      out.f[at] = prof.f[k];
      out.h2o_melt_wt_pct[at] = prof.h2o_melt_wt_pct[k];
      continue;
    }
    const w = (p - pp[a]) / dp;
    out.t_c[at] = prof.t_c[a] + w * (prof.t_c[b] - prof.t_c[a]);
    out.f[at] = prof.f[a] + w * (prof.f[b] - prof.f[a]);
    out.h2o_melt_wt_pct[at] = prof.h2o_melt_wt_pct[a] + w * (prof.h2o_melt_wt_pct[b] - prof.h2o_melt_wt_pct[a]);
    out.productivity_pct_per_gpa[at] = (-100 * (prof.f[b] - prof.f[a])) / dp;
  }
}
