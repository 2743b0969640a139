/**
 * The checks every thermal model makes of a scenario before computing it (one place, the same
 * words for both): finite potential temperature, non-negative water and lid, and a lid base
 * inside the model's pressure range.
 */
import type { MeltParams } from './params.js';
import { MODEL_MAX_P_GPA, type Scenario } from './types.js';
import { pGpaFromDepthKm } from './units.js';

/** The lid base pressure of a valid scenario, or why the scenario cannot be computed. */
export type ColumnInputCheck = { readonly ok: true; readonly pLidGpa: number } | { readonly ok: false; readonly reason: string };

/**
 * Check tp_c, water_ppm and lid_km of a scenario and find the pressure at the base of its lid.
 * @returns the lid base pressure (GPa), or the reason of a `failed` row
 */
export function checkColumnInputs(scenario: Scenario, p: MeltParams): ColumnInputCheck {
  const { tp_c: tpC, water_ppm: waterPpm, lid_km: lidKm } = scenario;
  if (!Number.isFinite(tpC)) return { ok: false, reason: `tp_c must be a finite number, got ${String(tpC)}` };
  if (!(Number.isFinite(waterPpm) && waterPpm >= 0)) return { ok: false, reason: `water_ppm must be a finite number >= 0, got ${String(waterPpm)}` };
  if (!(Number.isFinite(lidKm) && lidKm >= 0)) return { ok: false, reason: `lid_km must be a finite number >= 0, got ${String(lidKm)}` };
  const pLidGpa = pGpaFromDepthKm(lidKm, p.rho_s, p.g);
  if (!(pLidGpa < MODEL_MAX_P_GPA)) {
    return { ok: false, reason: `the lid base at ${pLidGpa.toFixed(3)} GPa is deeper than the model range (${MODEL_MAX_P_GPA} GPa)` };
  }
  return { ok: true, pLidGpa };
}
