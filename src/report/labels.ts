/**
 * Axis titles, legend titles and scenario labels for the pictures, all derived from the process
 * registry (src/process/; decompression's fields are in src/physics/fields.ts): every field's
 * display label and display unit ("°C", "km", "wt%", "" for fractions) are looked up, never typed here.
 *
 * Two processes may name a field alike and label it differently (lid_km is the "lid thickness" of
 * a decompression column and the "plate thickness" of a flux column), so a figure of a results
 * table takes its words from that table's process: `labelsOfProcess` (a FieldLabels). The
 * module-level functions below (labelOf, axisTitleOf, ...) are those of the default process.
 */
import { formatSignificant } from '../number-format.js';
import { PROFILE_FIELDS, type FieldInfo } from '../physics/fields.js';
import { allProcesses, DEFAULT_PROCESS, everyResultOf, processNamed } from '../process/registry.js';
import type { AnyProcess } from '../process/types.js';
import type { ModelSpec } from '../spec/types.js';

/** Every field a picture can show: the inputs and numeric outputs of every process (first process first). */
function registryFields(): FieldInfo[] {
  return allProcesses().flatMap((p) => [...p.inputsFor({ ...p.model.defaults, params: {} }), ...everyResultOf(p)]);
}

/** A registry entry by name (any process, the default first): inputs and outputs first, then profile columns. @throws Error for an unknown name */
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

/** The space between a number and its unit: no break, so "1300 °C" never splits over two lines. */
export const UNIT_SPACE = '\u00a0';

/** Short names of the scenario inputs for legends (the trade's symbols; units come from the registry). */
const INPUT_SYMBOLS: Readonly<Record<string, string>> = {
  tp_c: 'Tp',
  water_ppm: 'water',
  lid_km: 'lid',
  upwelling_mm_yr: 'upwelling',
};

/** A compact number for labels: up to 4 significant digits, no trailing zeros, no thousands separator. */
export function formatNumber(v: number): string {
  return formatSignificant(v, { expAbove: 1e5, expDigits: 2 });
}

/**
 * The words of one process's fields for figures, legends, tables and titles: each name is looked
 * up in that process's inputs, results and profile fields, and only then in the whole registry.
 */
export interface FieldLabels {
  /** the process the words are those of */
  readonly process: string;
  /** the registry entry of a field. @throws Error for a name no process knows */
  info(name: string): FieldInfo;
  /** "plate thickness" */
  label(name: string): string;
  /** "km"; "" for fractions */
  unit(name: string): string;
  /** "Plate thickness (km)", "Melt fraction" */
  axisTitle(name: string): string;
  /** "Plate thickness" (the table heading of a field) */
  heading(name: string): string;
  /** "7 km", "0.12" */
  valueWithUnit(name: string, value: number): string;
  /** "plate thickness 60 km" */
  fixedValue(name: string, value: number): string;
}

/** FieldLabels over a list of fields (looked up first) and the whole registry (after them). */
export function fieldLabels(process: string, fields: readonly FieldInfo[]): FieldLabels {
  const byName = new Map<string, FieldInfo>();
  for (const f of fields) if (!byName.has(f.name)) byName.set(f.name, f);
  const info = (name: string): FieldInfo => byName.get(name) ?? fieldInfo(name);
  const unit = (name: string): string => displayUnit(info(name));
  const label = (name: string): string => displayLabel(info(name));
  const valueWithUnit = (name: string, value: number): string => (unit(name) === '' ? formatNumber(value) : `${formatNumber(value)}${UNIT_SPACE}${unit(name)}`);
  return {
    process,
    info,
    label,
    unit,
    axisTitle: (name) => axisTitle(info(name)),
    heading: (name) => capitalise(label(name)),
    valueWithUnit,
    fixedValue: (name, value) => `${label(name)} ${valueWithUnit(name, value)}`,
  };
}

/**
 * The words of a process (by name or definition): its inputs under `model` (default: its default
 * options; options can only remove inputs), every result it can write, then its profile fields.
 */
export function labelsOfProcess(process: string | AnyProcess, model?: ModelSpec): FieldLabels {
  const p = typeof process === 'string' ? processNamed(process) : process;
  const inputs = p.inputsFor(model ?? { ...p.model.defaults, params: {} });
  return fieldLabels(p.name, [...inputs, ...everyResultOf(p), ...(p.profile ?? [])]);
}

/** The words of the default process (decompression). */
export function defaultLabels(): FieldLabels {
  return labelsOfProcess(DEFAULT_PROCESS);
}

/** axisTitle of a field of the default process by name. */
export function axisTitleOf(name: string): string {
  return defaultLabels().axisTitle(name);
}

/** The display label of a field of the default process by name ("crust thickness"). */
export function labelOf(name: string): string {
  return defaultLabels().label(name);
}

/** The display unit of a field of the default process by name ("km"; "" for fractions). */
export function unitOf(name: string): string {
  return defaultLabels().unit(name);
}

/** A value with its display unit: "7 km", "0.12" (default process; a no-break space before the unit). */
export function valueWithUnit(name: string, value: number): string {
  return defaultLabels().valueWithUnit(name, value);
}

/** "Tp 1350 °C" for one input value (unit from the registry, a no-break space before it). */
export function inputValueLabel(name: string, value: number, labels: FieldLabels = defaultLabels()): string {
  return `${INPUT_SYMBOLS[name] ?? name} ${labels.valueWithUnit(name, value)}`;
}

/** "lid thickness 10 km" for a fixed value of an input (label and unit from the registry). */
export function fixedValueLabel(name: string, value: number, labels: FieldLabels = defaultLabels()): string {
  return labels.fixedValue(name, value);
}
