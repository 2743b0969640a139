/**
 * Defaults of inputs that are neither swept nor fixed. (Allowed ranges live with the physics,
 * in src/physics/ranges.ts, shared with the `column` command.)
 */
import type { InputName } from '../physics/fields.js';

/**
 * Value of an input that is neither swept nor fixed: water_ppm 0, lid_km 0,
 * upwelling_mm_yr NaN (no rate: the column is isentropic and melt flux is null).
 * tp_c has no default: a sweep must sweep or fix it.
 */
export const INPUT_DEFAULTS: Readonly<Record<Exclude<InputName, 'tp_c'>, number>> = Object.freeze({
  water_ppm: 0,
  lid_km: 0,
  upwelling_mm_yr: Number.NaN,
});
