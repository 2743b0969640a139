/**
 * Checks that a table matches its design layout, and the row bookkeeping shared by every design:
 * which rows are usable for an output and how many were left out, by reason.
 */
import { InputError } from '../errors.js';
import type { AnalysisLayout, SensitivityInput } from './types.js';

/** The inputs a layout sweeps, in layout order. */
export function layoutInputs(layout: AnalysisLayout): readonly string[] {
  return layout.kind === 'grid' ? layout.axes.map((a) => a.name) : layout.inputs;
}

/** Number of rows the layout describes. */
export function layoutRows(layout: AnalysisLayout): number {
  switch (layout.kind) {
    case 'grid':
      return layout.axes.reduce((n, a) => n * a.values.length, 1);
    case 'saltelli':
      return layout.base * (layout.inputs.length + 2);
    default:
      return layout.samples;
  }
}

function describeLayout(layout: AnalysisLayout): string {
  switch (layout.kind) {
    case 'grid':
      return `grid ${layout.axes.map((a) => `${a.name}(${a.values.length})`).join(' x ')}`;
    case 'saltelli':
      return `saltelli base ${layout.base} x (${layout.inputs.length} inputs + 2)`;
    default:
      return `${layout.kind} ${layout.samples} samples`;
  }
}

/**
 * Validate the table against its layout and return the row count. Throws an InputError naming the
 * column, the value found and what the layout expects.
 */
export function checkTable(table: SensitivityInput, outputNames: readonly string[]): number {
  const { layout } = table;
  const problems: string[] = [];
  const names = layoutInputs(layout);
  if (names.length === 0) {
    throw new InputError('analyze: the design layout sweeps no inputs. Hint: sensitivity needs at least one swept input.');
  }
  if (new Set(names).size !== names.length) {
    throw new InputError(`analyze: the design layout names an input twice (${names.join(', ')}).`);
  }
  if (layout.kind === 'grid') {
    for (const axis of layout.axes) {
      if (axis.values.length === 0) problems.push(`analyze: grid axis "${axis.name}" has no values.`);
      if (!axis.values.every((v) => Number.isFinite(v))) problems.push(`analyze: grid axis "${axis.name}" has a non-finite value.`);
      if (new Set(axis.values).size !== axis.values.length) {
        problems.push(`analyze: grid axis "${axis.name}" repeats a value. Hint: grid axis values must be distinct.`);
      }
    }
  } else if (layout.kind === 'saltelli') {
    if (!Number.isInteger(layout.base) || layout.base < 1) {
      problems.push(`analyze: saltelli base must be a positive integer, got ${layout.base}.`);
    }
  } else if (!Number.isInteger(layout.samples) || layout.samples < 1) {
    problems.push(`analyze: ${layout.kind} samples must be a positive integer, got ${layout.samples}.`);
  }
  if (problems.length > 0) throw new InputError(problems);

  const n = layoutRows(layout);
  const where = `the design layout (${describeLayout(layout)}) has ${n} rows`;
  for (const name of names) {
    const col = table.inputs[name];
    if (col === undefined) {
      problems.push(`analyze: input column "${name}" is missing; the layout sweeps ${names.join(', ')}.`);
    } else if (col.length !== n) {
      problems.push(`analyze: input column "${name}" has ${col.length} rows but ${where}. Hint: pass the whole table in design row order.`);
    }
  }
  for (const name of outputNames) {
    const col = table.outputs[name];
    if (col === undefined) {
      problems.push(`analyze: output "${name}" is not in the table (outputs: ${Object.keys(table.outputs).join(', ') || 'none'}).`);
    } else if (col.length !== n) {
      problems.push(`analyze: output column "${name}" has ${col.length} rows but ${where}. Hint: pass the whole table in design row order.`);
    }
  }
  if (table.include !== undefined && table.include.length !== n) {
    problems.push(`analyze: the include mask has ${table.include.length} entries but ${where}.`);
  }
  if (problems.length > 0) throw new InputError(problems);

  if (layout.kind === 'grid') checkGridInputs(table, layout.axes, n);
  if (layout.kind === 'saltelli') checkSaltelliInputs(table, layout.base, layout.inputs);
  return n;
}

/** The grid's input columns must hold the layout's values at the mixed-radix positions. */
function checkGridInputs(table: SensitivityInput, axes: readonly { readonly name: string; readonly values: readonly number[] }[], n: number): void {
  const include = table.include;
  let stride = n;
  for (const axis of axes) {
    const size = axis.values.length;
    stride /= size;
    const col = table.inputs[axis.name];
    for (let r = 0; r < n; r++) {
      if (include !== undefined && include[r] === 0) continue;
      const expected = axis.values[Math.floor(r / stride) % size];
      const found = col[r];
      if (!same(found, expected)) {
        throw new InputError(
          `analyze: grid input "${axis.name}" at row ${r} is ${found} but the layout gives ${expected} there. ` +
            'Hint: grid rows are mixed-radix over the axes in layout order, the last axis fastest.',
        );
      }
    }
  }
}

function same(a: number, b: number): boolean {
  return a === b || Math.abs(a - b) <= 1e-9 * Math.max(1, Math.abs(b));
}

/**
 * Block AB_i must be A with column i taken from B (block-major, inputs in layout order); a table
 * whose blocks follow another input order would silently attribute effects to the wrong inputs.
 */
function checkSaltelliInputs(table: SensitivityInput, base: number, names: readonly string[]): void {
  const include = table.include;
  const cols = names.map((name) => table.inputs[name]);
  for (let i = 0; i < names.length; i++) {
    const off = (2 + i) * base;
    for (let j = 0; j < base; j++) {
      const r = off + j;
      if (include !== undefined && include[r] === 0) continue;
      for (let c = 0; c < names.length; c++) {
        const src = c === i ? base + j : j; // B row for column i, A row otherwise
        if (include !== undefined && include[src] === 0) continue;
        if (!same(cols[c][r], cols[c][src])) {
          throw new InputError(
            `analyze: saltelli row ${r} (block AB of "${names[i]}", base sample ${j}) has ${names[c]} = ${cols[c][r]} ` +
              `but ${c === i ? 'B' : 'A'} has ${cols[c][src]}. Hint: block 2 + i must be A with column i taken from B, ` +
              'i over the inputs in layout order.',
          );
        }
      }
    }
  }
}

/** Rows left out by the mask, by reason; notes any mismatch between the mask and the reasons. */
export function leftOutCounts(table: SensitivityInput, n: number, note: (text: string) => void): { included: number; leftOut: Record<string, number> } {
  let included = n;
  if (table.include !== undefined) {
    included = 0;
    for (let r = 0; r < n; r++) if (table.include[r] !== 0) included++;
  }
  const masked = n - included;
  const leftOut: Record<string, number> = {};
  let accounted = 0;
  for (const [reason, count] of Object.entries(table.excludedReasons ?? {})) {
    if (count > 0) {
      leftOut[reason] = count;
      accounted += count;
    }
  }
  if (accounted < masked) {
    leftOut.unspecified = (leftOut.unspecified ?? 0) + masked - accounted;
  } else if (accounted > masked) {
    note(`The left-out reasons add up to ${accounted} rows but the include mask leaves out ${masked}; the mask decides which rows are used.`);
  }
  return { included, leftOut };
}

/**
 * Fill `usable` (length n) with 1 where the row is included and the output is finite.
 * Returns the count of usable rows and of included rows with a null (non-finite) output.
 */
export function fillUsable(y: Float64Array, include: Uint8Array | undefined, usable: Uint8Array): { used: number; nullValues: number } {
  let used = 0;
  let nullValues = 0;
  for (let r = 0; r < y.length; r++) {
    const inc = include === undefined || include[r] !== 0;
    const ok = inc && Number.isFinite(y[r]);
    usable[r] = ok ? 1 : 0;
    if (ok) used++;
    else if (inc) nullValues++;
  }
  return { used, nullValues };
}

/** Mean and population variance (two-pass) of y over usable rows; null when none. */
export function usableMoments(y: Float64Array, usable: Uint8Array, used: number): { mean: number | null; variance: number | null } {
  if (used === 0) return { mean: null, variance: null };
  let s = 0;
  for (let r = 0; r < y.length; r++) if (usable[r] !== 0) s += y[r];
  const mean = s / used;
  let ss = 0;
  for (let r = 0; r < y.length; r++) {
    if (usable[r] !== 0) {
      const d = y[r] - mean;
      ss += d * d;
    }
  }
  return { mean, variance: ss / used };
}

/**
 * Build an include mask and left-out counts from a per-row status (e.g. the status column of a
 * sweep table): rows whose status equals `ok` are usable, the rest are counted by status.
 */
export function includeFromStatus(status: ArrayLike<string | null>, ok = 'ok'): { include: Uint8Array; excludedReasons: Record<string, number> } {
  const include = new Uint8Array(status.length);
  const excludedReasons: Record<string, number> = {};
  for (let r = 0; r < status.length; r++) {
    const s = status[r];
    if (s === ok) include[r] = 1;
    else {
      const key = s ?? 'null';
      excludedReasons[key] = (excludedReasons[key] ?? 0) + 1;
    }
  }
  return { include, excludedReasons };
}
