/**
 * Reading any table meltsweep writes, whatever its format: Arrow IPC (file or stream), Parquet,
 * or CSV with its units sidecar. The format is found from the file's first bytes, not its name.
 */
import type * as arrow from 'apache-arrow';
import fs from 'node:fs';
import { InputError } from '../errors.js';
import { csvSchema, csvSidecarPath, readCsvBatches, readCsvSidecar } from './csv-file.js';
import { readIpcBatches, readIpcSchema } from './ipc-file.js';
import type { OutputFormat } from './output-format.js';
import { readParquetBatches, readParquetInfo } from './parquet-file.js';

/** The format of a table file from its magic bytes (CSV: no magic, but a units sidecar). */
export function detectTableFormat(file: string): OutputFormat {
  if (!fs.existsSync(file)) throw new InputError(`${file} does not exist`);
  if (!fs.statSync(file).isFile()) throw new InputError(`${file} is not a file`);
  const head = Buffer.alloc(8);
  const fd = fs.openSync(file, 'r');
  let n: number;
  try {
    n = fs.readSync(fd, head, 0, 8, 0);
  } finally {
    fs.closeSync(fd);
  }
  if (n >= 6 && head.subarray(0, 6).toString('latin1') === 'ARROW1') return 'arrow';
  // an IPC stream starts with a continuation marker (0xFFFFFFFF) before its schema message
  if (n >= 4 && head.readUInt32LE(0) === 0xffffffff) return 'arrow';
  if (n >= 4 && head.subarray(0, 4).toString('latin1') === 'PAR1') return 'parquet';
  if (fs.existsSync(csvSidecarPath(file))) return 'csv';
  throw new InputError(
    `${file} is not a table meltsweep can read: expected an Arrow IPC file, a Parquet file, or a CSV file with its sidecar ${csvSidecarPath(file)}`,
  );
}

/** The Arrow schema of a table (field units and meltsweep metadata included). */
export async function readTableSchema(file: string): Promise<arrow.Schema> {
  const format = detectTableFormat(file);
  return withContext(file, async () => {
    if (format === 'parquet') return (await readParquetInfo(file)).schema;
    if (format === 'csv') return csvSchema(readCsvSidecar(file));
    return readIpcSchema(file);
  });
}

/**
 * A table's batches, one at a time (bounded memory for every format).
 * @param columns Parquet only: read just these columns (other formats give every column)
 */
export async function* readTableBatches(file: string, columns?: readonly string[]): AsyncGenerator<arrow.RecordBatch> {
  const format = detectTableFormat(file);
  try {
    if (format === 'parquet') yield* readParquetBatches(file, undefined, columns);
    else if (format === 'csv') yield* readCsvBatches(file);
    else yield* readIpcBatches(file);
  } catch (err) {
    // only reading errors arrive here (a consumer's own errors do not pass through the generator)
    if (err instanceof InputError) throw err;
    throw new InputError(`${file}: cannot read its rows (${err instanceof Error ? err.message : String(err)}); the file is truncated or damaged`);
  }
}

async function withContext<T>(file: string, fn: () => Promise<T>): Promise<T> {
  try {
    return await fn();
  } catch (err) {
    if (err instanceof InputError) throw err;
    throw new InputError(`${file}: cannot read its schema (${err instanceof Error ? err.message : String(err)})`);
  }
}
