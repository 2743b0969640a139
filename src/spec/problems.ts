/**
 * Building blocks of validation messages. Every message names the path in the sweep file,
 * the value found and what is allowed, e.g.
 * `axes.tp_c.to: 2400 is above the model's range 1100-1800 degC`.
 */
import { suggestName } from './suggest.js';

/** Ordered list of problems found in one sweep file. */
export class ProblemList {
  private readonly items: string[] = [];

  /** Record one problem at `path` (text completes "<path>: ..."). */
  add(path: string, text: string): void {
    this.items.push(`${path}: ${text}`);
  }

  /** Record one problem whose text already starts with its path. */
  addRaw(message: string): void {
    this.items.push(message);
  }

  /** Append the problems of another list (kept in its order). */
  addAll(other: ProblemList): void {
    this.items.push(...other.items);
  }

  get count(): number {
    return this.items.length;
  }

  list(): readonly string[] {
    return [...this.items];
  }
}

/** `a.b` from `a` and `b`; the top level has the empty path. */
function joinPath(base: string, key: string): string {
  return base === '' ? key : `${base}.${key}`;
}

/** How a value found in the file is shown in a message: numbers as written, text quoted. */
export function describeFound(value: unknown): string {
  if (value === null) return 'null';
  if (value === undefined) return 'nothing';
  if (typeof value === 'string') return JSON.stringify(value);
  if (typeof value === 'number' || typeof value === 'boolean' || typeof value === 'bigint') return String(value);
  if (Array.isArray(value)) return 'a list';
  if (value instanceof Date) return `the date ${value.toISOString().slice(0, 10)}`;
  if (typeof value === 'object') return 'a mapping';
  return typeof value;
}

/** A plain key-value object (a YAML mapping or JSON object), not a list or null. */
export function isMapping(value: unknown): value is Record<string, unknown> {
  return typeof value === 'object' && value !== null && !Array.isArray(value) && !(value instanceof Date);
}

/**
 * Report every key of `obj` that is not in `allowed`, with the nearest allowed key suggested.
 * `what` names the kind of key in the message ("key", "input", "parameter").
 * Returns the suggested names, so a caller can skip a "missing <key>" message that would only
 * repeat the typo.
 */
export function checkKeys(
  obj: Record<string, unknown>,
  allowed: readonly string[],
  path: string,
  problems: ProblemList,
  what = 'key',
): string[] {
  const suggested: string[] = [];
  for (const key of Object.keys(obj)) {
    if (allowed.includes(key)) continue;
    problems.add(joinPath(path, key), unknownKeyText(key, allowed, what));
    const near = suggestName(key, allowed);
    if (near !== null) suggested.push(near);
  }
  return suggested;
}

/** "unknown key; did you mean design?" or "unknown key; allowed: a, b, c". */
export function unknownKeyText(key: string, allowed: readonly string[], what = 'key'): string {
  const near = suggestName(key, allowed);
  return near === null ? `unknown ${what}; allowed: ${allowed.join(', ')}` : `unknown ${what}; did you mean ${near}?`;
}

/**
 * A finite number, or a problem "<found> is not a number" recorded at path, the value shown as
 * found ("abc", NaN, Infinity) and followed by `allowed` when given ("; allowed 1100-1800 degC").
 */
export function readNumber(value: unknown, path: string, problems: ProblemList, allowed?: string): number | undefined {
  const tail = allowed === undefined ? '' : `; ${allowed}`;
  if (typeof value !== 'number') {
    problems.add(path, `${describeFound(value)} is not a number${tail}`);
    return undefined;
  }
  if (!Number.isFinite(value)) {
    problems.add(path, `${describeFound(value)} is not a finite number${tail}`);
    return undefined;
  }
  return value;
}

/**
 * A whole number in [min, max], or a problem such as
 * "0 is not allowed; count must be a whole number from 1 to 100000".
 */
export function readWholeNumber(
  value: unknown,
  path: string,
  problems: ProblemList,
  label: string,
  min: number,
  max: number,
): number | undefined {
  const allowed = `a whole number from ${min} to ${max}`;
  if (typeof value !== 'number') {
    problems.add(path, `${describeFound(value)} is not a number; ${label} must be ${allowed}`);
    return undefined;
  }
  if (!Number.isInteger(value) || value < min || value > max) {
    problems.add(path, `${describeFound(value)} is not allowed; ${label} must be ${allowed}`);
    return undefined;
  }
  return value;
}

/** One of `choices`, or a problem naming the choices (and the nearest one when close). */
export function readChoice<T extends string>(
  value: unknown,
  choices: readonly T[],
  path: string,
  problems: ProblemList,
  what: string,
): T | undefined {
  if (typeof value === 'string' && (choices as readonly string[]).includes(value)) return value as T;
  const near = typeof value === 'string' ? suggestName(value, choices) : null;
  const hint = near === null ? `allowed: ${choices.join(', ')}` : `did you mean ${near}? (allowed: ${choices.join(', ')})`;
  problems.add(path, `${describeFound(value)} is not ${what}; ${hint}`);
  return undefined;
}
