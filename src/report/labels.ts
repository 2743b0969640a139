/**
 * Axis titles, legend titles and scenario labels for the pictures, all derived from the process
 * registry (src/process/; decompression's fields are in src/physics/fields.ts): every field's
 * display label and display unit ("°C", "km", "wt%", "" for fractions) are looked up, never typed here.
 */
import { PROFILE_FIELDS, type FieldInfo } from '../physics/fields.js';
import { allProcesses, everyResultOf } from '../process/registry.js';

/** Every field a picture can show: the inputs and numeric outputs of every process (first process first). */
function registryFields(): FieldInfo[] {
  return allProcesses().flatMap((p) => [...p.inputsFor({ ...p.model.defaults, params: {} }), ...everyResultOf(p)]);
}

/** A registry entry by name: inputs and outputs first, then profile columns. @throws Error for an unknown name */
export function fieldInfo(name: string): FieldInfo {
  const f = registryFields().find((x) => x.name === name) ?? PROFILE_FIELDS.find((x) => x.name === name);
  if (f === undefined) throw new Error(`report: ${name} is not in the field registry`);
  return f;
}

/** A profile column's registry entry (profile names such as h2o_melt_wt_pct also name outputs). */
export function profileFieldInfo(name: (typeof PROFILE_FIELDS)[number]['name']): FieldInfo {
  return PROFILE_FIELDS.find((x) => x.name === name) as FieldInfo;
}

/**
 * The short form of a registry description: the text before the first comma, semicolon or
 * parenthesis, first letter capitalised ("crust thickness of the passive melting regime, ..." ->
 * "Crust thickness of the passive melting regime").
 */
export function shortDescription(info: FieldInfo): string {
  const cut = info.description.split(/,|;| \(/)[0].trim();
  return capitalise(cut);
}

/** First letter upper case. */
export function capitalise(text: string): string {
  return text.charAt(0).toUpperCase() + text.slice(1);
}

/** The display label of a field ("potential temperature"); the short description where none is given. */
export function displayLabel(info: FieldInfo): string {
  return info.label ?? shortDescription(info).toLowerCase();
}

/** The unit as printed ("°C"; "" for fractions); the registry unit where no display unit is given. */
export function displayUnit(info: FieldInfo): string {
  if (info.displayUnit !== undefined) return info.displayUnit;
  return info.unit === 'fraction' ? '' : info.unit.replace(/^degC/, '°C');
}

/** An axis title with the unit from the registry: "Potential temperature (°C)", "Melt fraction". */
export function axisTitle(info: FieldInfo): string {
  const unit = displayUnit(info);
  const label = capitalise(displayLabel(info));
  return unit === '' ? label : `${label} (${unit})`;
}

/** axisTitle of a registry field by name. */
export function axisTitleOf(name: string): string {
  return axisTitle(fieldInfo(name));
}

/** The display label of a registry field by name ("crust thickness"). */
export function labelOf(name: string): string {
  return displayLabel(fieldInfo(name));
}

/** The display unit of a registry field by name ("km"; "" for fractions). */
export function unitOf(name: string): string {
  return displayUnit(fieldInfo(name));
}

/** A value with its display unit: "7 km", "0.12" (unit from the registry). */
export function valueWithUnit(name: string, value: number): string {
  const unit = unitOf(name);
  return unit === '' ? formatNumber(value) : `${formatNumber(value)} ${unit}`;
}

/** Short names of the scenario inputs for legends (the trade's symbols; units come from the registry). */
const INPUT_SYMBOLS: Readonly<Record<string, string>> = {
  tp_c: 'Tp',
  water_ppm: 'water',
  lid_km: 'lid',
  upwelling_mm_yr: 'upwelling',
};

/** A compact number for labels: up to 4 significant digits, no trailing zeros, no thousands separator. */
export function formatNumber(v: number): string {
  if (!Number.isFinite(v)) return String(v);
  if (v === 0) return '0';
  const a = Math.abs(v);
  if (a >= 1e5 || a < 1e-3) return v.toExponential(2);
  return String(Number(v.toPrecision(4)));
}

/** "Tp 1350 °C" for one input value (unit from the registry). */
export function inputValueLabel(name: string, value: number): string {
  const unit = unitOf(name);
  return `${INPUT_SYMBOLS[name] ?? name} ${formatNumber(value)}${unit === '' ? '' : ` ${unit}`}`;
}

/** "lid thickness 10 km" for a fixed value of an input (label and unit from the registry). */
export function fixedValueLabel(name: string, value: number): string {
  return `${labelOf(name)} ${valueWithUnit(name, value)}`;
}
