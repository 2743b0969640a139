/**
 * Unit conversions used everywhere, so every part of the code follows one convention
 * (project physics reference: z = P / (rho_s g), rho_s = 3300 kg/m3, g = 9.81 m/s2).
 */

export const PA_PER_GPA = 1e9;
export const KELVIN_OFFSET = 273.15;
export const SECONDS_PER_YEAR = 365.25 * 24 * 3600;

/** Depth (km) of a lithostatic pressure (GPa) for a column of density rhoSolid (kg/m3). */
export function depthKmFromPGpa(pGpa: number, rhoSolidKgM3: number, gMS2: number): number {
  return (pGpa * PA_PER_GPA) / (rhoSolidKgM3 * gMS2) / 1000;
}

/** Lithostatic pressure (GPa) at depth (km) for a column of density rhoSolid (kg/m3). */
export function pGpaFromDepthKm(depthKm: number, rhoSolidKgM3: number, gMS2: number): number {
  return (depthKm * 1000 * rhoSolidKgM3 * gMS2) / PA_PER_GPA;
}

/** Water in wt% from ppm by weight (100 ppm = 0.01 wt%). */
export function wtPctFromPpm(waterPpm: number): number {
  return waterPpm * 1e-4;
}

/** Upwelling rate in m/s from mm/yr. */
export function mPerSFromMmPerYr(mmPerYr: number): number {
  return mmPerYr * 1e-3 / SECONDS_PER_YEAR;
}
