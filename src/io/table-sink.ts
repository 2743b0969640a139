/**
 * One interface over the table writers: Arrow IPC file, Parquet and CSV. Every sink writes to a
 * temporary name next to the final one and publishes atomically (fsync, rename, fsync folder).
 */
import type * as arrow from 'apache-arrow';
import { CsvFileSink, csvSidecarPath } from './csv-file.js';
import { IpcFileSink } from './ipc-file.js';
import type { OutputFormat } from './output-format.js';
import { ParquetFileSink, type ParquetWriteOptions } from './parquet-file.js';

/** A streaming table writer. */
export interface TableSink {
  readonly finalPath: string;
  readonly tmpPath: string;
  /** rows written so far */
  readonly rows: number;
  /** Write one batch; resolves when it has been handed to the file (bounded memory). */
  write(batch: arrow.RecordBatch): Promise<void>;
  /** Finish the file and rename it to its final name. */
  publish(): Promise<void>;
  /** Abandon the file (the temporary file is removed). */
  abort(): Promise<void>;
}

/** Writer settings per format (not scientific metadata). */
export interface TableSinkOptions {
  readonly parquet?: ParquetWriteOptions;
}

/** The temporary name a sink writes under before publishing `finalPath`. */
function temporaryPathFor(finalPath: string): string {
  return `${finalPath}.tmp-${process.pid}`;
}

/** Open a sink of `format` for `finalPath` (written under temporaryPathFor(finalPath) until published). */
export async function openTableSink(format: OutputFormat, finalPath: string, schema: arrow.Schema, options: TableSinkOptions = {}): Promise<TableSink> {
  const tmp = temporaryPathFor(finalPath);
  switch (format) {
    case 'arrow':
      return new IpcFileSink(finalPath, tmp, schema);
    case 'parquet':
      return ParquetFileSink.open(finalPath, tmp, schema, options.parquet);
    case 'csv':
      return new CsvFileSink(finalPath, tmp, schema);
  }
}

/** Every file a published table of `format` consists of (CSV: the table and its units sidecar). */
export function publishedFiles(format: OutputFormat, finalPath: string): string[] {
  return format === 'csv' ? [finalPath, csvSidecarPath(finalPath)] : [finalPath];
}
