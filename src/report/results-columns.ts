/**
 * A results file read into plain typed columns for the pictures: the process's inputs, the chosen
 * numeric outputs (NaN for null) and the status of every row, batch by batch (memory: 8 bytes per
 * value and column; nothing else is kept).
 */
import type * as arrow from 'apache-arrow';
import fs from 'node:fs';
import { InputError } from '../errors.js';
import { readResultsMeta, type ResultsTableMeta } from '../io/arrow-schema.js';
import { readTableBatches, readTableSchema } from '../io/table-reader.js';
import { COLUMN_STATUSES, type ColumnStatus } from '../physics/types.js';
import type { SweepSpec } from '../spec/types.js';
import { CAPPED_FLAG, type CappedChoice } from '../io/capped-rows.js';

/** Columns of a results file, in row order. */
export interface ResultsColumns {
  readonly rows: number;
  /** every input of the table's process, by name */
  readonly inputs: Readonly<Record<string, Float64Array>>;
  /** the requested outputs; NaN where the value is null */
  readonly outputs: Readonly<Record<string, Float64Array>>;
  /** index into COLUMN_STATUSES of each row */
  readonly status: Uint8Array;
  readonly statusCounts: Readonly<Record<ColumnStatus, number>>;
  /** computed rows flagged onset_capped (null or absent: the table has no such column) */
  readonly cappedRows?: number | null;
}

/** A results file's metadata, with the sweep it was run from. */
export interface ResultsFileInfo {
  readonly meta: ResultsTableMeta;
  readonly spec: SweepSpec;
  /** numeric outputs that hold at least one value */
  readonly outputsWithValues: readonly string[];
}

/** @throws InputError when the file is missing or is not a meltsweep results table */
export async function readResultsInfo(file: string, argName = 'RESULTS'): Promise<ResultsFileInfo> {
  if (!fs.existsSync(file) || !fs.statSync(file).isFile()) throw new InputError(`${argName}: ${file} does not exist or is not a file; give a results file written by meltsweep run or merge`);
  let meta: ResultsTableMeta & { sweep: unknown };
  let schema: arrow.Schema;
  try {
    schema = await readTableSchema(file);
  } catch (err) {
    throw new InputError(`${argName}: ${file} is not a meltsweep results table (${err instanceof Error ? err.message : String(err)})`);
  }
  try {
    meta = readResultsMeta(schema, file);
  } catch (err) {
    // the metadata check names the file, the key and the problem
    if (err instanceof InputError) throw new InputError(err.problems.map((p) => `${argName}: ${p}`));
    throw err;
  }
  const names = meta.results.map((r) => r.name);
  const seen = new Set<string>();
  for await (const batch of readTableBatches(file)) {
    for (const n of names) {
      const col = batch.getChild(n);
      if (col !== null && col.nullCount < col.length) seen.add(n);
    }
    if (seen.size === names.length) break;
  }
  return { meta, spec: meta.sweep as SweepSpec, outputsWithValues: names.filter((n) => seen.has(n)) };
}

function copyFloat(target: Float64Array, offset: number, vector: arrow.Vector | null, n: number): void {
  if (vector === null) {
    target.fill(NaN, offset, offset + n);
    return;
  }
  let at = offset;
  for (const data of vector.data) {
    const values = data.values as Float64Array;
    for (let i = 0; i < data.length; i++) target[at + i] = data.getValid(i) ? values[data.offset + i] : NaN;
    at += data.length;
  }
}

/**
 * Read the inputs, the given outputs and the status column of a results file, batch by batch.
 * @param rows the row count from the file's metadata (rowEnd - rowStart)
 * @throws InputError when the file holds a different number of rows
 */
export async function readResultsColumns(
  file: string,
  outputs: readonly string[],
  rows: number,
  inputNames: readonly string[],
  capped: CappedChoice = 'include',
): Promise<ResultsColumns> {
  let cappedRows: number | null = null;
  const inputs = Object.fromEntries(inputNames.map((n) => [n, new Float64Array(rows)]));
  const outs = Object.fromEntries(outputs.map((n) => [n, new Float64Array(rows)]));
  const status = new Uint8Array(rows);
  const statusCounts = Object.fromEntries(COLUMN_STATUSES.map((s) => [s, 0])) as Record<ColumnStatus, number>;
  let offset = 0;
  for await (const batch of readTableBatches(file)) {
    if (offset + batch.numRows > rows) throw new InputError(`${file}: holds more rows than its metadata says (${rows})`);
    for (const n of inputNames) copyFloat(inputs[n], offset, batch.getChild(n), batch.numRows);
    for (const n of outputs) copyFloat(outs[n], offset, batch.getChild(n), batch.numRows);
    const col = batch.getChild('status');
    for (let i = 0; i < batch.numRows; i++) {
      const s = (col?.get(i) ?? 'failed') as ColumnStatus;
      const code = COLUMN_STATUSES.indexOf(s);
      status[offset + i] = code < 0 ? COLUMN_STATUSES.indexOf('failed') : code;
      statusCounts[COLUMN_STATUSES[status[offset + i]]] += 1;
    }
    // capped rows: counted; with --capped exclude their outputs read as null (grey map cells)
    const flag = batch.getChild(CAPPED_FLAG);
    if (flag !== null) {
      cappedRows ??= 0;
      for (let i = 0; i < batch.numRows; i++) {
        if (flag.get(i) !== 1) continue;
        cappedRows++;
        if (capped === 'exclude') for (const n of outputs) outs[n][offset + i] = NaN;
      }
    }
    offset += batch.numRows;
  }
  if (offset !== rows) throw new InputError(`${file}: holds ${offset} rows, its metadata says ${rows}`);
  return { rows, inputs, outputs: outs, status, statusCounts, cappedRows };
}
