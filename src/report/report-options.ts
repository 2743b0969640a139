/**
 * Options of the HTML report, checked against the results file they apply to. Every problem is an
 * InputError naming the option, the value and what is allowed.
 */
import { InputError } from '../errors.js';
import { decompression } from '../process/decompression.js';
import { inputsOfSpec, processOfSpec, resultsOfSpec } from '../process/registry.js';
import { didYouMean } from '../spec/suggest.js';
import type { SweepSpec } from '../spec/types.js';
import type { CappedChoice } from '../io/capped-rows.js';
import { fieldInfo, formatNumber } from './labels.js';

/** What the report shows. Every field is optional; see resolveReportOptions for the defaults. */
export interface ReportOptions {
  /** outputs to draw (default: the process's reportOutputs that hold values) */
  readonly outputs?: readonly string[];
  /** swept input on the maps' horizontal axis (default: the first swept input) */
  readonly x?: string;
  /** swept input on the maps' vertical axis (default: the first other swept input) */
  readonly y?: string;
  /** values of the other swept inputs for grid slices (default: each axis's middle value) */
  readonly at?: Readonly<Record<string, number>>;
  /** bootstrap resamples of the sensitivity analysis (default: the analysis default) */
  readonly resamples?: number;
  /** bootstrap seed (default: the analysis default) */
  readonly seed?: number;
  /** page title (default: "meltsweep report: <sweep name>") */
  readonly title?: string;
  /** contour values per output drawn on its map (--contour crust_km=7) */
  readonly contours?: Readonly<Record<string, readonly number[]>>;
  /** rows with a capped onset (deep_onset: cap): drawn and analysed (default) or left out */
  readonly capped?: CappedChoice;
}

/** Outputs a report of a decompression table shows by default, where they hold values (see ProcessDefinition.reportOutputs). */
export const DEFAULT_REPORT_OUTPUTS: readonly string[] = decompression.reportOutputs ?? [];

/** Options with defaults filled in and checked. */
export interface ResolvedReportOptions {
  readonly outputs: readonly string[];
  /** null when the sweep has no swept input */
  readonly x: string | null;
  /** null when the sweep has fewer than two swept inputs */
  readonly y: string | null;
  /** slice values of the other swept inputs (grid designs) */
  readonly at: Partial<Record<string, number>>;
  /** contour values by output (only outputs that are drawn) */
  readonly contours: Readonly<Record<string, readonly number[]>>;
  /** what the defaults or the design changed, in plain words */
  readonly notes: readonly string[];
}

/**
 * Parse `name=value[,name=value...]` (the --at option) into numbers by name.
 * @throws InputError naming the malformed part
 */
export function parseAtOption(raw: string): Record<string, number> {
  const out: Record<string, number> = {};
  for (const part of raw.split(',').map((s) => s.trim()).filter(Boolean)) {
    const m = /^([A-Za-z_][A-Za-z0-9_]*)\s*=\s*(.+)$/.exec(part);
    const value = m === null ? Number.NaN : Number(m[2]);
    if (m === null || !Number.isFinite(value)) {
      throw new InputError(`--at: ${JSON.stringify(part)} is not allowed; give name=value pairs of swept inputs, e.g. lid_km=10,upwelling_mm_yr=20`);
    }
    out[m[1]] = value;
  }
  return out;
}

/**
 * Parse a list of contour values ("7,9.5"). @throws InputError naming the option and the bad part
 */
export function parseContourValues(option: string, raw: string): number[] {
  const values: number[] = [];
  for (const part of raw.split(',').map((s) => s.trim())) {
    const v = part === '' ? Number.NaN : Number(part);
    if (!Number.isFinite(v)) throw new InputError(`${option}: ${JSON.stringify(part)} is not a number; give the output values to draw contours of, separated by commas, e.g. 7,9`);
    if (!values.includes(v)) values.push(v);
  }
  return values;
}

/**
 * Parse report --contour values (the option may be repeated): "crust_km=7", "crust_km=7,9",
 * "crust_km=7,f_max=0.1". A bare number continues the list of the name before it.
 * @throws InputError naming the malformed part
 */
export function parseContourOption(raws: readonly string[]): Record<string, number[]> {
  const out: Record<string, number[]> = {};
  for (const raw of raws) {
    let name: string | null = null;
    for (const part of raw.split(',').map((s) => s.trim()).filter(Boolean)) {
      const m = /^([A-Za-z_][A-Za-z0-9_]*)\s*=\s*(.*)$/.exec(part);
      if (m !== null) name = m[1];
      if (name === null) throw new InputError(`--contour: ${JSON.stringify(part)} is not allowed; give output=value pairs, e.g. crust_km=7 or crust_km=7,9`);
      const [v] = parseContourValues('--contour', m === null ? part : m[2]);
      const list = (out[name] ??= []);
      if (!list.includes(v)) list.push(v);
    }
  }
  return out;
}

function sweptCheck(option: string, name: string, spec: SweepSpec): string {
  const swept = spec.axes.map((a) => a.name);
  if ((swept as readonly string[]).includes(name)) return name;
  const allowed = swept.length > 0 ? `swept inputs: ${swept.join(', ')}` : 'this sweep has no swept input';
  if (inputsOfSpec(spec).some((i) => i.name === name)) {
    const v = spec.fixed[name];
    const held = v === undefined ? 'not given' : `held at ${formatNumber(v)} ${fieldInfo(name).unit}`;
    throw new InputError(`${option}: ${name} is not swept in this sweep (${held}); ${allowed}`);
  }
  const near = didYouMean(name, swept.length > 0 ? swept : inputsOfSpec(spec).map((i) => i.name));
  throw new InputError(`${option}: ${JSON.stringify(name)} is not an input; ${near}${allowed}`);
}

/**
 * Fill in the defaults and check the options against a results file's sweep and outputs.
 * @param outputsWithValues numeric outputs holding at least one value in the file
 * @throws InputError for an unknown or empty output, an input that is not swept, the same input on
 *   both axes, or an --at value outside the swept range
 */
export function resolveReportOptions(o: ReportOptions, spec: SweepSpec, outputsWithValues: readonly string[], file: string): ResolvedReportOptions {
  const notes: string[] = [];
  const problems: string[] = [];
  const RESULT_NUMERIC_NAMES = resultsOfSpec(spec).map((r) => r.name);
  // the default outputs: the process's own choice among the fields this table has, else all of them
  const chosen = (processOfSpec(spec).reportOutputs ?? []).filter((n) => RESULT_NUMERIC_NAMES.includes(n));
  const defaults = chosen.length > 0 ? chosen : RESULT_NUMERIC_NAMES;
  let outputs: string[];
  if (o.outputs !== undefined) {
    outputs = [];
    for (const name of o.outputs) {
      if (!(RESULT_NUMERIC_NAMES as readonly string[]).includes(name)) problems.push(`--outputs: ${JSON.stringify(name)} is not an output column; ${didYouMean(name, RESULT_NUMERIC_NAMES)}allowed: ${RESULT_NUMERIC_NAMES.join(', ')}`);
      else if (!outputsWithValues.includes(name)) problems.push(`--outputs: ${name} holds no values in ${file}; outputs with values: ${outputsWithValues.join(', ') || 'none'}`);
      else if (!outputs.includes(name)) outputs.push(name);
    }
    if (o.outputs.length === 0) problems.push(`--outputs: the list is empty; allowed: ${RESULT_NUMERIC_NAMES.join(', ')}`);
  } else {
    outputs = defaults.filter((n) => outputsWithValues.includes(n));
    const dropped = defaults.filter((n) => !outputsWithValues.includes(n));
    if (dropped.length > 0) notes.push(`left out for holding no values: ${dropped.join(', ')}`);
  }

  const swept = spec.axes.map((a) => a.name);
  const attempt = (fn: () => string): string | null => {
    try {
      return fn();
    } catch (err) {
      if (err instanceof InputError) problems.push(...err.problems);
      else throw err;
      return null;
    }
  };
  let x: string | null = o.x !== undefined ? attempt(() => sweptCheck('--x', o.x as string, spec)) : (swept[0] ?? null);
  let y: string | null = o.y !== undefined ? attempt(() => sweptCheck('--y', o.y as string, spec)) : (swept.find((n) => n !== x) ?? null);
  if (o.x === undefined && y !== null && x === y) x = swept.find((n) => n !== y) ?? null;
  if (x !== null && x === y) {
    problems.push(`--x and --y: both are ${x}; choose two different swept inputs (${swept.join(', ')})`);
    y = null;
  }
  if (swept.length === 1 && x !== null) notes.push(`one swept input (${x}): no maps (they need two); the main-effect curves show each output along it`);

  const at: Partial<Record<string, number>> = {};
  for (const [name, value] of Object.entries(o.at ?? {})) {
    const input = attempt(() => sweptCheck('--at', name, spec));
    if (input === null) continue;
    if (input === x || input === y) {
      problems.push(`--at: ${name} is on the ${input === x ? '--x' : '--y'} axis; --at sets the other swept inputs (${swept.filter((n) => n !== x && n !== y).join(', ') || 'none'})`);
      continue;
    }
    const axis = spec.axes.find((a) => a.name === input)!;
    const unit = fieldInfo(input).unit;
    if (value < axis.min || value > axis.max) {
      problems.push(`--at: ${name}=${formatNumber(value)} ${unit} is outside the swept range ${formatNumber(axis.min)}-${formatNumber(axis.max)} ${unit}`);
      continue;
    }
    at[input] = value;
  }
  const contours: Record<string, readonly number[]> = {};
  for (const [name, values] of Object.entries(o.contours ?? {})) {
    if (!RESULT_NUMERIC_NAMES.includes(name)) problems.push(`--contour: ${JSON.stringify(name)} is not an output column; ${didYouMean(name, RESULT_NUMERIC_NAMES)}allowed: ${RESULT_NUMERIC_NAMES.join(', ')}`);
    else if (!outputs.includes(name)) problems.push(`--contour: ${name} is not among the outputs drawn (${outputs.join(', ') || 'none'}); add it with --outputs`);
    else if (x !== null && y !== null) contours[name] = values;
  }
  if (problems.length > 0) throw new InputError(problems);
  if (spec.design.kind !== 'grid' && Object.keys(at).length > 0) {
    notes.push(`--at applies to grid designs; in this ${spec.design.kind} design each map cell averages over the other inputs`);
  }
  return { outputs, x, y, at, contours, notes };
}
