/**
 * Sensitivity of a results file: read the swept inputs, the numeric outputs and the status
 * column batch by batch into typed arrays, rebuild the design layout from the sweep stored in
 * the file's metadata, analyze, and write `OUT.sensitivity.arrow` (long format).
 */
import * as arrow from 'apache-arrow';
import path from 'node:path';
import { analyzeSensitivity, type SensitivityReport } from '../analyze/index.js';
import { InputError } from '../errors.js';
import { planSweep } from '../plan/index.js';
import { processNamed } from '../process/registry.js';
import { didYouMean } from '../spec/suggest.js';
import type { SweepSpec } from '../spec/types.js';
import { readResultsMeta } from './arrow-schema.js';
import { writeFileAtomic } from './ipc-file.js';
import { formatFromExtension } from './output-format.js';
import { readTableBatches, readTableSchema } from './table-reader.js';
import { TOOL_VERSION } from '../version.js';
import { CAPPED_FLAG, cappedNote, type CappedChoice } from './capped-rows.js';

/**
 * Statuses of rows that were not computed (every number null): left out of the analysis and counted.
 * Every other row (ok, no_melt: crust 0, f_max 0) carries real values and is used; an output that is
 * null in some of them (onset of a no_melt row) leaves those rows out for that output only.
 */
const NOT_COMPUTED_STATUSES: ReadonlySet<string> = new Set(['failed', 'onset_beyond_range']);

/** Beyond this many rows the automatic summary after a run is skipped (memory: 8 bytes per value). */
export const AUTO_SUMMARY_MAX_ROWS = 4_000_000;

export interface SensitivityFileOptions {
  /** outputs to analyze (default: every numeric output with at least one value) */
  readonly outputs?: readonly string[];
  readonly resamples?: number;
  readonly seed?: number;
  /** rows with a capped onset: used (default) or left out, counted either way */
  readonly capped?: CappedChoice;
}

/** `r7.arrow` (or .parquet, .csv, ...) -> `r7.sensitivity.arrow`; the sensitivity table is always Arrow IPC. */
export function sensitivityPathFor(resultsPath: string): string {
  const ext = path.extname(resultsPath);
  const base = ext !== '' && formatFromExtension(resultsPath) !== null ? resultsPath.slice(0, -ext.length) : resultsPath;
  return `${base}.sensitivity.arrow`;
}

interface Columns {
  readonly rows: number;
  readonly inputs: Record<string, Float64Array>;
  readonly outputs: Record<string, Float64Array>;
  readonly include: Uint8Array;
  readonly excludedReasons: Record<string, number>;
  /** computed rows flagged onset_capped; null when the table has no such column */
  readonly cappedRows: number | null;
}

function copyInto(target: Float64Array, offset: number, vector: arrow.Vector): void {
  for (const data of vector.data) {
    const values = data.values as Float64Array;
    const n = data.length;
    for (let i = 0; i < n; i++) {
      target[offset + i] = data.getValid(i) ? values[data.offset + i] : NaN;
    }
    offset += n;
  }
}

async function readColumns(
  file: string,
  inputNames: readonly string[],
  outputNames: readonly string[],
  rows: number,
  capped: CappedChoice,
): Promise<Columns> {
  const inputs = Object.fromEntries(inputNames.map((n) => [n, new Float64Array(rows)]));
  const outputs = Object.fromEntries(outputNames.map((n) => [n, new Float64Array(rows)]));
  const include = new Uint8Array(rows);
  const excludedReasons: Record<string, number> = {};
  let cappedRows: number | null = null;
  let offset = 0;
  for await (const batch of readTableBatches(file)) {
    if (offset + batch.numRows > rows) throw new InputError(`${file}: holds more rows than its metadata says (${rows})`);
    for (const n of inputNames) copyInto(inputs[n], offset, batch.getChild(n)!);
    for (const n of outputNames) copyInto(outputs[n], offset, batch.getChild(n)!);
    const status = batch.getChild('status')!;
    for (let i = 0; i < batch.numRows; i++) {
      const s = status.get(i) as string;
      if (!NOT_COMPUTED_STATUSES.has(s)) include[offset + i] = 1;
      else excludedReasons[s] = (excludedReasons[s] ?? 0) + 1;
    }
    const flag = batch.getChild(CAPPED_FLAG);
    if (flag !== null) {
      cappedRows ??= 0;
      for (let i = 0; i < batch.numRows; i++) {
        if (flag.get(i) !== 1 || include[offset + i] === 0) continue;
        cappedRows++;
        if (capped === 'exclude') {
          include[offset + i] = 0;
          excludedReasons[CAPPED_FLAG] = (excludedReasons[CAPPED_FLAG] ?? 0) + 1;
        }
      }
    }
    offset += batch.numRows;
  }
  if (offset !== rows) throw new InputError(`${file}: holds ${offset} rows, its metadata says ${rows}`);
  return { rows, inputs, outputs, include, excludedReasons, cappedRows };
}

/** The numeric outputs that hold at least one value in the file (null-only columns say nothing). */
async function outputsWithValues(file: string, names: readonly string[]): Promise<string[]> {
  const seen = new Set<string>();
  for await (const batch of readTableBatches(file)) {
    for (const n of names) {
      if (seen.has(n)) continue;
      const col = batch.getChild(n);
      if (col !== null && col.nullCount < col.length) seen.add(n);
    }
    if (seen.size === names.length) break;
  }
  return names.filter((n) => seen.has(n));
}

export async function analyzeResultsFile(file: string, options: SensitivityFileOptions = {}): Promise<SensitivityReport> {
  const meta = readResultsMeta(await readTableSchema(file), file);
  if (meta.rowStart !== 0 || meta.rowEnd !== meta.pointCount) {
    throw new InputError(
      `${file}: holds rows ${meta.rowStart}-${meta.rowEnd} of ${meta.pointCount} (shard ${meta.shard}); sensitivity needs the whole sweep: merge the shards first (meltsweep merge)`,
    );
  }
  const spec = meta.sweep as SweepSpec;
  const plan = planSweep(spec);
  // the outputs are the result fields of the table's process (schema metadata meltsweep.process)
  const RESULT_NUMERIC_NAMES = meta.results.map((r) => r.name);
  const available = await outputsWithValues(file, RESULT_NUMERIC_NAMES);
  // by default the process's own results: marks such as onset_capped are analysed only when asked for
  const base = new Set(processNamed(meta.process).results.map((r) => r.name));
  const outputs = options.outputs ?? available.filter((n) => base.has(n));
  for (const o of outputs) {
    if (!RESULT_NUMERIC_NAMES.includes(o)) {
      throw new InputError(`--outputs: ${JSON.stringify(o)} is not an output column; ${didYouMean(o, RESULT_NUMERIC_NAMES)}allowed: ${RESULT_NUMERIC_NAMES.join(', ')}`);
    }
  }
  const capped = options.capped ?? 'include';
  const cols = await readColumns(file, plan.axisNames, outputs, meta.pointCount, capped);
  const report = analyzeSensitivity(
    { inputs: cols.inputs, outputs: cols.outputs, include: cols.include, excludedReasons: cols.excludedReasons, layout: plan.layout },
    { resamples: options.resamples, seed: options.seed },
  );
  const note = cappedNote(cols.cappedRows, capped);
  return note === null ? report : { ...report, notes: [note, ...report.notes] };
}

/** Write the report's records as a long-format Arrow file (atomically). */
export function writeSensitivityTable(report: SensitivityReport, outPath: string, sourceMeta: Record<string, string>): void {
  const r = report.records;
  const table = new arrow.Table({
    output: arrow.vectorFromArray(r.map((x) => x.output), new arrow.Utf8()),
    input: arrow.vectorFromArray(r.map((x) => x.input), new arrow.Utf8()),
    measure: arrow.vectorFromArray(r.map((x) => x.measure), new arrow.Utf8()),
    value: arrow.vectorFromArray(r.map((x) => x.value), new arrow.Float64()),
    ci_low: arrow.vectorFromArray(r.map((x) => x.ci_low), new arrow.Float64()),
    ci_high: arrow.vectorFromArray(r.map((x) => x.ci_high), new arrow.Float64()),
    n: arrow.vectorFromArray(r.map((x) => x.n), new arrow.Int32()),
  });
  const md = new Map<string, string>([
    ['meltsweep.table', 'sensitivity'],
    ['meltsweep.version', TOOL_VERSION],
    ['meltsweep.design', report.design],
    ['meltsweep.counts', JSON.stringify(report.counts)],
    ['meltsweep.notes', JSON.stringify([...report.notes, ...report.localNotes])],
    ['meltsweep.warnings', JSON.stringify(report.warnings)],
    ['meltsweep.copies', JSON.stringify(report.copies)],
    ['meltsweep.measures', 'S1 first-order index; ST total-effect index; elasticity_* d ln y / d ln x percentiles over the grid; slope_norm_* (dy/dx) sd(x)/sd(y) percentiles'],
    ...Object.entries(sourceMeta),
  ]);
  const schema = new arrow.Schema(table.schema.fields, md);
  const withMeta = new arrow.Table(schema, table.batches.map((b) => new arrow.RecordBatch(schema, b.data)));
  writeFileAtomic(outPath, arrow.tableToIPC(withMeta, 'file'));
}
