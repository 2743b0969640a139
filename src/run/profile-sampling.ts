/**
 * Sampling a computed column onto the fixed pressure grid of the profile table.
 *
 * Rows (one per grid pressure, every scenario gets the whole grid, so the table reshapes to
 * scenarios x pressures):
 * - above the top of the column (inside the lid, P < P_top): t_c, f, h2o_melt_wt_pct and
 *   productivity are null (the lid's temperature is not modelled by the isentropic column);
 * - between the onset and the top (P_top <= P <= P_onset): the computed path, interpolated linearly
 *   in pressure between its points; productivity = -dF/dP x 100 is the slope of that interpolant
 *   (the path segment holding P; at a path point, the segment above it);
 * - below the onset (P > P_onset; every P >= P_top of a no_melt column): f = 0, productivity = 0,
 *   h2o_melt_wt_pct null (no melt), t_c on the solid adiabat for isentropic columns and null for
 *   conductive ones (their path starts at the onset; below it the conductive geotherm is not kept);
 * - onset_beyond_range and failed scenarios: all four null.
 * NaN stands for null in the arrays (it becomes a validity bitmap in Arrow).
 */
import { adiabatTempC } from '../physics/adiabat.js';
import type { MeltParams } from '../physics/params.js';
import type { ColumnResult, ThermalModel } from '../physics/types.js';
import { pGpaFromDepthKm } from '../physics/units.js';
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
  if (result.status === 'no_melt') {
    const top = pGpaFromDepthKm(lidKm, params.rho_s, params.g);
    for (let j = 0; j < g; j++) {
      const p = pressures[j];
      if (p < top) continue;
      out.t_c[base + j] = isentropic ? adiabatTempC(tpC, p, params) : Number.NaN;
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
    if (p < top) continue;
    if (p > onset) {
      out.t_c[at] = isentropic ? adiabatTempC(tpC, p, params) : Number.NaN;
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
