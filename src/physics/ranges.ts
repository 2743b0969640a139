/**
 * Allowed ranges of the four scenario inputs, in one place: the `column` command and the sweep-file
 * validator check the same limits and word a problem the same way. Units and descriptions come from
 * the field registry (INPUT_FIELDS). The ranges catch unit slips (wt% given as ppm, m given as km)
 * and values outside what the melting model was built for.
 */
import { INPUT_FIELDS, type InputName } from './fields.js';

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

function range(name: InputName, min: number, max: number, minExclusive: boolean): InputRange {
  const f = INPUT_FIELDS.find((x) => x.name === name);
  if (f === undefined) throw new Error(`ranges: ${name} is not in INPUT_FIELDS`);
  return Object.freeze({ min, max, minExclusive, unit: f.unit, description: f.description });
}

/** Allowed range of each scenario input, in the input's unit. */
export const INPUT_RANGES: Readonly<Record<InputName, InputRange>> = Object.freeze({
  tp_c: range('tp_c', 1100, 1800, false),
  water_ppm: range('water_ppm', 0, 50000, false),
  lid_km: range('lid_km', 0, 200, false),
  upwelling_mm_yr: range('upwelling_mm_yr', 0, 10000, true),
});

/** Allowed isentropic pressure step, GPa (a model option, not a scenario input). */
export const STEP_GPA_RANGE: InputRange = Object.freeze({
  min: 1e-4,
  max: 0.5,
  minExclusive: false,
  unit: 'GPa',
  description: 'pressure step of the isentropic column',
});

/** Allowed relative tolerance of the error-controlled isentropic column (a model option). */
export const TOLERANCE_RANGE: InputRange = Object.freeze({
  min: 1e-6,
  max: 1e-2,
  minExclusive: false,
  unit: '(relative)',
  description: 'relative tolerance of the isentropic column',
});

/** "1100-1800 degC", or "0-10000 mm/yr (0 excluded)" for an exclusive minimum. */
export function formatRange(r: InputRange): string {
  return `${r.min}-${r.max} ${r.unit}${r.minExclusive ? ` (${r.min} excluded)` : ''}`;
}

/** formatRange of a scenario input. */
export function formatInputRange(name: InputName): string {
  return formatRange(INPUT_RANGES[name]);
}

/**
 * Why a value is outside a range, or null when it is allowed. The text completes
 * "<field or option>: <value> ...", e.g. "--tp: 1900 is above the model's range 1100-1800 degC".
 */
export function checkRangeValue(r: InputRange, value: number): string | null {
  if (Number.isNaN(value)) return `is not a number; allowed ${formatRange(r)}`;
  if (value > r.max) return `is above the model's range ${formatRange(r)}`;
  if (value < r.min) return `is below the model's range ${formatRange(r)}`;
  if (r.minExclusive && value === r.min) return `is outside the model's range ${formatRange(r)}`;
  return null;
}

/** checkRangeValue for a scenario input. */
export function checkInputValue(name: InputName, value: number): string | null {
  return checkRangeValue(INPUT_RANGES[name], value);
}
