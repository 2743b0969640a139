/**
 * The range of each scenario input the model accepts, and the defaults of inputs that are
 * neither swept nor fixed. Ranges catch unit slips (wt% given as ppm, m given as km) and
 * values outside what the melting model was built for.
 *
 * (Kept here until the physics owns a shared INPUT_RANGES; the shape is meant to merge.)
 */
import type { InputName } from '../physics/fields.js';

export interface InputRange {
  /** smallest allowed value (inclusive unless minExclusive) */
  readonly min: number;
  /** largest allowed value (inclusive) */
  readonly max: number;
  /** true when min itself is not allowed (the value must be above min) */
  readonly minExclusive: boolean;
  readonly unit: string;
  readonly description: string;
}

/** Allowed range of each input, in the input's unit. */
export const INPUT_RANGES: Readonly<Record<InputName, InputRange>> = Object.freeze({
  tp_c: Object.freeze({ min: 1100, max: 1800, minExclusive: false, unit: 'degC', description: 'mantle potential temperature' }),
  water_ppm: Object.freeze({ min: 0, max: 50000, minExclusive: false, unit: 'ppm', description: 'bulk water of the source' }),
  lid_km: Object.freeze({ min: 0, max: 200, minExclusive: false, unit: 'km', description: 'thickness of the conductive lid' }),
  upwelling_mm_yr: Object.freeze({ min: 0, max: 10000, minExclusive: true, unit: 'mm/yr', description: 'solid upwelling rate' }),
});

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

/** "1100-1800 degC", or "0-10000 mm/yr (0 excluded)" for an exclusive minimum. */
export function formatInputRange(name: InputName): string {
  const r = INPUT_RANGES[name];
  return `${r.min}-${r.max} ${r.unit}${r.minExclusive ? ` (${r.min} excluded)` : ''}`;
}

/**
 * Why a value is outside an input's range, or null when it is allowed.
 * The text completes "<path>: <value> ..." (e.g. "is above the model's range 1100-1800 degC").
 */
export function checkInputValue(name: InputName, value: number): string | null {
  const r = INPUT_RANGES[name];
  if (value > r.max) return `is above the model's range ${formatInputRange(name)}`;
  if (value < r.min) return `is below the model's range ${formatInputRange(name)}`;
  if (r.minExclusive && value === r.min) return `is outside the model's range ${formatInputRange(name)}`;
  return null;
}
