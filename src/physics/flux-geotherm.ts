/**
 * Geotherms of a wedge column (project physics reference, "Flux melting of a wedge column at a
 * prescribed geotherm"): the lid-adiabat geotherm, and a geotherm given as a table. Pressure is
 * lithostatic, z = P / (rho_s g) (src/physics/units.ts), so a table linear in depth is linear in
 * pressure as well.
 */
import { adiabatTempC } from './adiabat.js';
import type { MeltParams } from './params.js';
import { pGpaFromDepthKm } from './units.js';

/** A prescribed temperature T_geo(P) along a vertical column from the surface to the slab top. */
export interface Geotherm {
  /** pressure of the slab top, GPa: the bottom of the column */
  readonly pSlabGpa: number;
  /** pressures (GPa, ascending, strictly inside (0, pSlabGpa)) where dT/dP jumps */
  readonly kinksGpa: readonly number[];
  /** T_geo (degC) at pGpa, 0 <= pGpa <= pSlabGpa */
  tempC(pGpa: number): number;
}

/**
 * The lid-adiabat geotherm: T rises linearly from the surface temperature (params.T_surface,
 * 0 degC by default) at P = 0 to the solid adiabat of tpC at the base of the overriding plate
 * (lidKm), then follows the adiabat (src/physics/adiabat.ts) down to the slab top (slabDepthKm).
 */
export function lidAdiabatGeotherm(tpC: number, lidKm: number, slabDepthKm: number, p: MeltParams): Geotherm {
  const pSlabGpa = pGpaFromDepthKm(slabDepthKm, p.rho_s, p.g);
  const pLidGpa = pGpaFromDepthKm(lidKm, p.rho_s, p.g);
  const tSurfaceC = p.T_surface;
  if (!(pLidGpa > 0)) return { pSlabGpa, kinksGpa: [], tempC: (pGpa) => adiabatTempC(tpC, pGpa, p) };
  const tLidC = adiabatTempC(tpC, pLidGpa, p);
  const slope = (tLidC - tSurfaceC) / pLidGpa;
  return {
    pSlabGpa,
    kinksGpa: pLidGpa < pSlabGpa ? [pLidGpa] : [],
    tempC: (pGpa) => (pGpa < pLidGpa ? tSurfaceC + slope * pGpa : adiabatTempC(tpC, pGpa, p)),
  };
}

/** A geotherm table on pressure: nodes ascending from P = 0, temperatures in degC. */
export interface GeothermTable {
  readonly pGpa: Float64Array;
  readonly tC: Float64Array;
}

/**
 * A geotherm table's nodes as pressures (GPa) from depths (km), z = P / (rho_s g).
 */
export function geothermTableFromDepths(depthKm: readonly number[], tC: readonly number[], p: MeltParams): GeothermTable {
  return { pGpa: Float64Array.from(depthKm, (z) => pGpaFromDepthKm(z, p.rho_s, p.g)), tC: Float64Array.from(tC) };
}

/**
 * The geotherm of a table, linearly interpolated between its nodes (ascending pressures starting
 * at 0). Every interior node is a kink.
 * @returns the geotherm, or a reason text when the table does not reach down to the slab top
 */
export function tableGeotherm(table: GeothermTable, slabDepthKm: number, p: MeltParams): Geotherm | string {
  const pSlabGpa = pGpaFromDepthKm(slabDepthKm, p.rho_s, p.g);
  const ps = table.pGpa;
  const ts = table.tC;
  const n = ps.length;
  const last = ps[n - 1];
  // 1e-12 GPa of slack: a table written in depth and read back lands within rounding of the slab
  if (last < pSlabGpa - 1e-12) {
    return `the geotherm table ends at ${last.toPrecision(6)} GPa, above the slab top at ${pSlabGpa.toPrecision(6)} GPa (${slabDepthKm} km)`;
  }
  const kinks: number[] = [];
  for (let i = 1; i < n - 1 && ps[i] < pSlabGpa; i++) kinks.push(ps[i]);
  return {
    pSlabGpa,
    kinksGpa: kinks,
    tempC(pGpa) {
      // binary search for the interval ps[lo] <= P <= ps[lo + 1]
      let lo = 0;
      let hi = n - 1;
      while (hi - lo > 1) {
        const mid = (lo + hi) >> 1;
        if (ps[mid] <= pGpa) lo = mid;
        else hi = mid;
      }
      const w = (pGpa - ps[lo]) / (ps[hi] - ps[lo]);
      return ts[lo] + w * (ts[hi] - ts[lo]);
    },
  };
}
