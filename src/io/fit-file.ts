/**
 * Fitting observations to a results file: the prior from the sweep stored in the file's metadata,
 * the observations checked against the file's columns, then one streaming pass over its record
 * batches (memory: the per-row log-likelihood, id and observed/predicted outputs; nothing else).
 */
import type * as arrow from 'apache-arrow';
import fs from 'node:fs';
import path from 'node:path';
import { InputError } from '../errors.js';
import { checkObservations, FitAccumulator, finishFit, type FitPrior, type FitResult, type Observation } from '../fit/index.js';
import { readResultsMeta, type ResultsTableMeta } from './arrow-schema.js';
import { formatFromExtension } from './output-format.js';
import { canScanIpcFiles, isIpcFile, scanIpcFile } from './ipc-scan.js';
import { readTableBatches, readTableSchema } from './table-reader.js';
import { INPUT_NAMES } from '../physics/fields.js';
import { COLUMN_STATUSES } from '../physics/types.js';
import type { SweepSpec } from '../spec/types.js';
import { CAPPED_FLAG, type CappedChoice } from './capped-rows.js';

/** Statuses of the rows, in code order; anything else is counted as 'unknown' and left out. */
/** Row classes of a fit: the statuses, ok rows with a capped onset (counted apart), unknown. */
const FIT_STATUSES: readonly string[] = [...COLUMN_STATUSES, CAPPED_FLAG, 'unknown'];
const UNKNOWN = FIT_STATUSES.length - 1;
const CAPPED = FIT_STATUSES.indexOf(CAPPED_FLAG);

/** What to fit. */
export interface FitFileOptions {
  readonly observations: readonly Observation[];
  /** model-discrepancy sd per observed output (added in quadrature) */
  readonly discrepancies?: readonly { readonly output: string; readonly sd: number }[];
  /** outputs whose posterior predictive is summarised */
  readonly predict?: readonly string[];
  /**
   * ok rows with a capped onset (deep_onset: cap): used (default) or left out; counted apart as
   * `onset_capped` in the rows used or left out either way
   */
  readonly capped?: CappedChoice;
}

/** A fitted results file. */
export interface FitFileResult {
  readonly file: string;
  readonly fit: FitResult;
  readonly prior: FitPrior;
  readonly spec: SweepSpec;
  readonly meta: ResultsTableMeta;
  /** unit of every column, from the file's field metadata */
  readonly units: Readonly<Record<string, string>>;
  /** the best-fitting row as written in the file (ids as numbers) */
  readonly bestRow: Readonly<Record<string, unknown>>;
}

/** `r7.arrow` (or .parquet, .csv) -> `r7.fit.arrow`; the fit table is always Arrow IPC. */
export function fitPathFor(resultsPath: string, suffix = '.fit.arrow'): string {
  const ext = path.extname(resultsPath);
  const base = ext !== '' && formatFromExtension(resultsPath) !== null ? resultsPath.slice(0, -ext.length) : resultsPath;
  return `${base}${suffix}`;
}

/** The prior of a sweep: its design kind and swept axes. */
export function priorOf(spec: SweepSpec): FitPrior {
  return { kind: spec.design.kind, axes: spec.axes.map((a) => ({ name: a.name, values: [...a.values], min: a.min, max: a.max, scale: a.scale })) };
}

function unitsOf(schema: arrow.Schema): Record<string, string> {
  return Object.fromEntries(schema.fields.map((f) => [f.name, f.metadata.get('unit') ?? '']));
}

/** Numeric output columns of a results schema: float columns that are not inputs. */
function outputColumns(schema: arrow.Schema): string[] {
  const inputs = new Set<string>(INPUT_NAMES);
  return schema.fields.filter((f) => String(f.type) === 'Float64' && !inputs.has(f.name)).map((f) => f.name);
}

/** Outputs among `names` that hold no value anywhere in the file (reads until each has one). */
async function emptyColumns(file: string, names: readonly string[]): Promise<string[]> {
  const pending = new Set(names);
  for await (const batch of readTableBatches(file)) {
    for (const n of [...pending]) {
      const col = batch.getChild(n);
      if (col !== null && col.nullCount < col.length) pending.delete(n);
    }
    if (pending.size === 0) break;
  }
  return [...pending];
}

/** A float column of a batch as a Float64Array (a view when it has no nulls), NaN for null. */
function floatColumn(vector: arrow.Vector | null, n: number, scratch: Float64Array): Float64Array {
  if (vector === null) return scratch.fill(NaN, 0, n);
  if (vector.data.length === 1) {
    const data = vector.data[0];
    if (data.values instanceof Float64Array && data.nullCount === 0) return data.values.subarray(data.offset, data.offset + n);
  }
  let at = 0;
  for (const data of vector.data) {
    if (data.values instanceof Float64Array) {
      // copy the values, then mark the nulls from the validity bitmap a byte at a time
      scratch.set(data.values.subarray(data.offset, data.offset + data.length), at);
      const bitmap = data.nullBitmap;
      if (data.nullCount > 0 && bitmap !== undefined && bitmap.length > 0) {
        for (let i = 0; i < data.length; i++) {
          const bit = data.offset + i;
          const byte = bitmap[bit >> 3];
          if (byte === 0xff && (bit & 7) === 0 && i + 8 <= data.length) {
            i += 7;
            continue;
          }
          if (((byte >> (bit & 7)) & 1) === 0) scratch[at + i] = NaN;
        }
      }
    } else if (data.values instanceof BigInt64Array && data.nullCount === 0) {
      // int64 ids through their 32-bit words (little-endian), no BigInt per row
      const words = new Int32Array(data.values.buffer, data.values.byteOffset + 8 * data.offset, 2 * data.length);
      for (let i = 0; i < data.length; i++) scratch[at + i] = (words[2 * i] >>> 0) + words[2 * i + 1] * 4294967296;
    } else {
      for (let i = 0; i < data.length; i++) {
        const v = vector.get(at + i) as unknown;
        scratch[at + i] = v === null || v === undefined ? NaN : Number(v);
      }
    }
    at += data.length;
  }
  return scratch;
}

/** Status codes (index into FIT_STATUSES) of a batch's status column. */
function statusCodes(vector: arrow.Vector | null, n: number, out: Uint8Array): Uint8Array {
  if (vector === null) return out.fill(UNKNOWN, 0, n);
  const code = (s: unknown): number => {
    const i = typeof s === 'string' ? FIT_STATUSES.indexOf(s) : -1;
    return i < 0 ? UNKNOWN : i;
  };
  let at = 0;
  for (const data of vector.data) {
    const dict = data.dictionary;
    if (dict !== undefined && data.nullCount === 0) {
      const lut = Uint8Array.from({ length: dict.length }, (_, i) => code(dict.get(i)));
      const idx = data.values as Int8Array;
      for (let i = 0; i < data.length; i++) out[at + i] = lut[idx[data.offset + i]];
    } else {
      for (let i = 0; i < data.length; i++) out[at + i] = code(vector.get(at + i));
    }
    at += data.length;
  }
  return out;
}

/** Ok rows flagged onset_capped = 1 get their own code (CAPPED). */
function markCapped(codes: Uint8Array, flag: Float64Array | null, n: number): Uint8Array {
  if (flag === null) return codes;
  for (let i = 0; i < n; i++) if (flag[i] === 1 && codes[i] === 0) codes[i] = CAPPED;
  return codes;
}

/** A row of a batch as plain JSON values (int64 as numbers). */
function plainRow(batch: arrow.RecordBatch, r: number): Record<string, unknown> {
  const out: Record<string, unknown> = {};
  for (const f of batch.schema.fields) {
    const v = batch.getChild(f.name)?.get(r) as unknown;
    out[f.name] = typeof v === 'bigint' ? Number(v) : v ?? null;
  }
  return out;
}

/**
 * Fit observations to a results file written by meltsweep run or merge (any format).
 * @throws InputError for a file that is not a results table, bad observations (names checked
 *   against the file's columns), or a fit with no usable row
 */
export async function fitResultsFile(file: string, options: FitFileOptions): Promise<FitFileResult> {
  if (!fs.existsSync(file) || !fs.statSync(file).isFile()) throw new InputError(`RESULTS: ${file} does not exist or is not a file; give a results file written by meltsweep run or merge`);
  const schema = await readTableSchema(file);
  let meta: ResultsTableMeta & { sweep: unknown };
  try {
    meta = readResultsMeta(schema, file);
  } catch (err) {
    if (err instanceof InputError) throw new InputError(err.problems.map((p) => `RESULTS: ${p}`));
    throw new InputError(`RESULTS: ${file} is not a meltsweep results table (${err instanceof Error ? err.message : String(err)})`);
  }
  const spec = meta.sweep as SweepSpec;
  const prior = priorOf(spec);
  const units = unitsOf(schema);
  const outputs = outputColumns(schema);
  const asked = [...options.observations.map((o) => o.output), ...(options.predict ?? [])].filter((n) => outputs.includes(n));
  const empty = await emptyColumns(file, asked);
  const checked = checkObservations(options.observations, options.discrepancies ?? [], options.predict ?? [], {
    outputs: Object.fromEntries(outputs.map((n) => [n, units[n] ?? ''])),
    inputs: schema.fields.map((f) => f.name).filter((n) => (INPUT_NAMES as readonly string[]).includes(n)),
    empty,
    source: path.basename(file),
  });
  const acc = new FitAccumulator({
    observations: checked.observations,
    prior,
    predict: checked.predict,
    units,
    statuses: FIT_STATUSES,
    leaveOut: ['failed', 'onset_beyond_range', 'unknown', ...(options.capped === 'exclude' ? [CAPPED_FLAG] : [])],
    expectedRows: meta.rowEnd - meta.rowStart,
  });
  const inputNames = prior.axes.map((a) => a.name);
  const scratch = new Map<string, Float64Array>();
  const buffer = (name: string, n: number): Float64Array => {
    let b = scratch.get(name);
    if (b === undefined || b.length < n) {
      b = new Float64Array(Math.max(n, 65_536));
      scratch.set(name, b);
    }
    return b;
  };
  let status = new Uint8Array(65_536);
  let bestRow: Record<string, unknown> = {};
  // Arrow IPC files are scanned with reused buffers (every value of a batch is used or copied
  // before the next one is read); other formats through the general reader
  const batches = isIpcFile(file) && canScanIpcFiles() ? scanIpcFile(file) : readTableBatches(file);
  for await (const batch of batches) {
    const n = batch.numRows;
    if (status.length < n) status = new Uint8Array(n);
    const col = (name: string): Float64Array => floatColumn(batch.getChild(name), n, buffer(name, n));
    const best = acc.add({
      rows: n,
      inputs: Object.fromEntries(inputNames.map((name) => [name, col(name)])),
      outputs: Object.fromEntries(acc.stored.map((name) => [name, col(name)])),
      status: markCapped(statusCodes(batch.getChild('status'), n, status), batch.getChild(CAPPED_FLAG) === null ? null : col(CAPPED_FLAG), n),
      ids: col('scenario_id'),
    });
    if (best >= 0) bestRow = plainRow(batch, best);
  }
  return { file, fit: finishFit(acc), prior, spec, meta, units, bestRow };
}
