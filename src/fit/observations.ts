/**
 * Observations from the command line (`crust_km=7.1+-0.8`) or from a file (YAML or JSON), checked
 * against the table they are fitted to. Every problem names the option or path, the value found
 * and what is allowed; all problems are thrown together as one InputError.
 */
import { InputError } from '../errors.js';
import { suggestName } from '../spec/suggest.js';
import type { Observation } from './types.js';

/** What a table offers to observe: its numeric output columns and its inputs (units for messages). */
export interface ObservableColumns {
  /** numeric output columns, by name -> unit */
  readonly outputs: Readonly<Record<string, string>>;
  /** input columns (swept or fixed): named in a helpful message when someone observes one */
  readonly inputs: readonly string[];
  /** outputs that hold no value in the table */
  readonly empty?: readonly string[];
  /** the table's file name, for messages */
  readonly source: string;
}

const EXAMPLE = 'crust_km=7.1+-0.8';
const NAME = /^[A-Za-z_][A-Za-z0-9_]*$/;

/** A number written in full; null for anything else ("", "abc", "1e", "Infinity"). */
function parseNumber(text: string): number | null {
  const t = text.trim();
  if (!/^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/.test(t)) return null;
  const v = Number(t);
  return Number.isFinite(v) ? v : null;
}

function splitNameValue(option: string, raw: string, shape: string): { name: string; rest: string } {
  const eq = raw.indexOf('=');
  const name = eq < 0 ? '' : raw.slice(0, eq).trim();
  if (eq < 0 || !NAME.test(name)) {
    throw new InputError(`${option}: ${JSON.stringify(raw)} is not allowed; write ${shape}`);
  }
  return { name, rest: raw.slice(eq + 1).trim() };
}

/**
 * Parse one `--observe NAME=VALUE+-SD` (also `±`).
 * @throws InputError naming the part that is wrong (a missing or non-numeric value or sd, sd <= 0)
 */
export function parseObserveOption(raw: string, option = '--observe'): Observation {
  const { name, rest } = splitNameValue(option, raw, `NAME=VALUE+-SD, e.g. ${EXAMPLE}`);
  return parseValueSd(`${option} ${name}`, name, rest);
}

/** VALUE+-SD (or VALUE±SD) of one output. */
function parseValueSd(where: string, name: string, text: string): Observation {
  const m = /^(.*?)(\+-|±|\+\/-)(.*)$/.exec(text);
  if (m === null) {
    const alone = parseNumber(text);
    const why = alone === null ? `${JSON.stringify(text)} is not VALUE+-SD` : `${text} has no standard deviation`;
    throw new InputError(`${where}: ${why}; write ${name}=VALUE+-SD, e.g. ${name}=7.1+-0.8 (one standard deviation after +-)`);
  }
  const [, valueText, , sdText] = m;
  const problems: string[] = [];
  const value = parseNumber(valueText);
  if (valueText.trim() === '') problems.push(`${where}: the value before "+-" is missing; write ${name}=VALUE+-SD`);
  else if (value === null) problems.push(`${where}: ${JSON.stringify(valueText.trim())} is not a number; the value must be a number in the output's unit`);
  const sd = parseNumber(sdText);
  if (sdText.trim() === '') problems.push(`${where}: the standard deviation after "+-" is missing; write ${name}=${valueText.trim() || 'VALUE'}+-SD with SD above 0`);
  else if (sd === null) problems.push(`${where}: ${JSON.stringify(sdText.trim())} is not a number; the standard deviation must be a number above 0`);
  else if (!(sd > 0)) problems.push(`${where}: standard deviation ${sdText.trim()} is not allowed; it must be above 0`);
  if (problems.length > 0) throw new InputError(problems);
  return { output: name, value: value as number, sd: sd as number };
}

/**
 * Parse one `--discrepancy NAME=SD` (a model-discrepancy standard deviation, >= 0).
 * @throws InputError for a malformed pair or a negative or non-numeric sd
 */
export function parseDiscrepancyOption(raw: string, option = '--discrepancy'): { output: string; sd: number } {
  const { name, rest } = splitNameValue(option, raw, 'NAME=SD, e.g. crust_km=0.5');
  const sd = parseNumber(rest);
  if (rest === '') throw new InputError(`${option} ${name}: the standard deviation after "=" is missing; write ${name}=SD with SD >= 0`);
  if (sd === null) throw new InputError(`${option} ${name}: ${JSON.stringify(rest)} is not a number; the discrepancy is a standard deviation >= 0 in the output's unit`);
  if (sd < 0) throw new InputError(`${option} ${name}: ${rest} is not allowed; the discrepancy standard deviation must be 0 or above`);
  return { output: name, sd };
}

function isMapping(v: unknown): v is Record<string, unknown> {
  return typeof v === 'object' && v !== null && !Array.isArray(v);
}

const ENTRY_KEYS = ['value', 'sd', 'discrepancy'] as const;

/**
 * Observations from a parsed file: a mapping of output names to `{ value, sd, discrepancy? }`
 * or to the text `VALUE+-SD`:
 * ```yaml
 * crust_km: { value: 6.3, sd: 0.6 }      # seismic line S-4
 * h2o_melt_wt_pct: 0.25+-0.05
 * ```
 * @param source the file name, for messages
 * @throws InputError listing every problem with its path
 */
export function observationsFromData(data: unknown, source: string): Observation[] {
  if (!isMapping(data)) {
    throw new InputError(`${source}: expected a mapping of outputs to observations, e.g. crust_km: { value: 6.3, sd: 0.6 }`);
  }
  const problems: string[] = [];
  const out: Observation[] = [];
  for (const [name, entry] of Object.entries(data)) {
    const where = `${source}: ${name}`;
    try {
      if (typeof entry === 'string') {
        out.push(parseValueSd(where, name, entry));
        continue;
      }
      if (!isMapping(entry)) {
        problems.push(`${where}: ${JSON.stringify(entry)} is not an observation; write { value: ..., sd: ... } or "VALUE+-SD"`);
        continue;
      }
      for (const key of Object.keys(entry)) {
        if (!(ENTRY_KEYS as readonly string[]).includes(key)) {
          const near = suggestName(key, ENTRY_KEYS);
          problems.push(`${where}.${key}: unknown key; ${near === null ? `allowed: ${ENTRY_KEYS.join(', ')}` : `did you mean ${near}?`}`);
        }
      }
      const num = (key: string, required: boolean): number | undefined => {
        const v = entry[key];
        if (v === undefined) {
          if (required) problems.push(`${where}.${key}: missing; an observation needs value and sd`);
          return undefined;
        }
        if (typeof v !== 'number' || !Number.isFinite(v)) {
          problems.push(`${where}.${key}: ${JSON.stringify(v)} is not a number`);
          return undefined;
        }
        return v;
      };
      const value = num('value', true);
      const sd = num('sd', true);
      const disc = num('discrepancy', false);
      if (sd !== undefined && !(sd > 0)) problems.push(`${where}.sd: ${sd} is not allowed; the standard deviation must be above 0`);
      if (disc !== undefined && disc < 0) problems.push(`${where}.discrepancy: ${disc} is not allowed; the discrepancy standard deviation must be 0 or above`);
      if (value !== undefined && sd !== undefined && sd > 0 && (disc === undefined || disc >= 0)) {
        out.push(disc === undefined ? { output: name, value, sd } : { output: name, value, sd, discrepancySd: disc });
      }
    } catch (err) {
      if (err instanceof InputError) problems.push(...err.problems);
      else throw err;
    }
  }
  if (problems.length > 0) throw new InputError(problems);
  return out;
}

/** "unknown output ... did you mean ...?" for a name that is not an output column. */
function unknownOutput(where: string, name: string, cols: ObservableColumns): string {
  const outputs = Object.keys(cols.outputs);
  if (cols.inputs.includes(name)) {
    return `${where}: ${name} is an input of the sweep, not an output; the fit infers inputs from observed outputs (outputs: ${outputs.join(', ')})`;
  }
  const near = suggestName(name, outputs);
  const hint = near === null ? `outputs of ${cols.source}: ${outputs.join(', ')}` : `did you mean ${near}?`;
  return `${where}: ${JSON.stringify(name)} is not an output column of ${cols.source}; ${hint}`;
}

/**
 * Check observations, discrepancies and predicted outputs against a table's columns and combine
 * them: each output observed once, each discrepancy for an observed output, every name a numeric
 * output that holds values.
 * @throws InputError listing every problem
 */
export function checkObservations(
  observations: readonly Observation[],
  discrepancies: readonly { readonly output: string; readonly sd: number }[],
  predict: readonly string[],
  cols: ObservableColumns,
): { observations: Observation[]; predict: string[] } {
  const problems: string[] = [];
  const seen = new Set<string>();
  const known = (where: string, name: string): boolean => {
    if (cols.outputs[name] !== undefined) {
      if (cols.empty?.includes(name)) {
        problems.push(`${where}: ${name} holds no value in ${cols.source} (every row is null); choose an output with values`);
        return false;
      }
      return true;
    }
    problems.push(unknownOutput(where, name, cols));
    return false;
  };
  if (observations.length === 0) problems.push(`--observe: no observation given; give at least one, e.g. --observe ${EXAMPLE} (or --observations FILE)`);
  const out: Observation[] = [];
  for (const o of observations) {
    if (!known('--observe', o.output)) continue;
    if (seen.has(o.output)) {
      problems.push(`--observe: ${o.output} is observed twice; give each output once (combine measurements into one value and sd)`);
      continue;
    }
    seen.add(o.output);
    out.push({ ...o });
  }
  const discSeen = new Set<string>();
  for (const d of discrepancies) {
    if (!known('--discrepancy', d.output)) continue;
    if (discSeen.has(d.output)) problems.push(`--discrepancy: ${d.output} is given twice`);
    discSeen.add(d.output);
    const i = out.findIndex((o) => o.output === d.output);
    if (i < 0) {
      if (!seen.has(d.output)) problems.push(`--discrepancy: ${d.output} is not observed; a discrepancy applies to an observed output (observed: ${[...seen].join(', ') || 'none'})`);
      continue;
    }
    out[i] = { ...out[i], discrepancySd: d.sd };
  }
  const pred: string[] = [];
  for (const name of predict) {
    if (known('--predict', name) && !pred.includes(name)) pred.push(name);
  }
  if (problems.length > 0) throw new InputError(problems);
  return { observations: out, predict: pred };
}
