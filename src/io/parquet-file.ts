/**
 * Parquet tables through parquet-wasm (a WebAssembly build of the Rust Arrow/Parquet writer and
 * reader; no native binary, no download at install). Writing streams: record batches go into the
 * library's streaming writer one at a time and each row group is flushed to disk when full, so
 * memory is bounded by a row group (about rowGroupRows x columns x 8 bytes, plus the WebAssembly
 * heap, which grows to its peak and does not shrink; measured 0.12 GB for 131,072-row groups of
 * 19 float columns, 0.2-0.3 GB with the library's dictionary encoding on), not by the table.
 *
 * The Arrow schema, with the units in field metadata and the sweep metadata, travels in the
 * Parquet footer's ARROW:schema key (restored by Arrow-based readers: parquet-wasm, pyarrow);
 * the schema metadata is also written as plain Parquet key-value metadata, with the units as
 * meltsweep.units (JSON), for readers that ignore ARROW:schema (DuckDB parquet_kv_metadata).
 */
import * as arrow from 'apache-arrow';
import fs from 'node:fs';
import type * as PQ from 'parquet-wasm';
import { discardTemporaryFile, openTemporaryFile, publishTemporaryFile, writeAllSync } from './ipc-file.js';

type ParquetWasm = typeof PQ;

/**
 * The library, loaded on first use: compiling its WebAssembly takes about 0.2 s, which commands
 * that never touch Parquet should not pay (node caches the module after the first import).
 */
export function loadParquetWasm(): Promise<ParquetWasm> {
  return import('parquet-wasm');
}

/** Writer settings (not scientific metadata). */
export interface ParquetWriteOptions {
  /** default zstd */
  readonly compression?: 'zstd' | 'snappy';
  /** rows per row group (default 131,072) */
  readonly rowGroupRows?: number;
  /** "created by" of the file footer */
  readonly createdBy?: string;
}

/** Rows per Parquet row group unless told otherwise (bounds the writer's memory). */
export const DEFAULT_ROW_GROUP_ROWS = 131_072;

/** Parquet key-value metadata: the schema metadata plus the units of every column as JSON. */
function keyValueMetadata(schema: arrow.Schema): Map<string, string> {
  const kv = new Map<string, string>(schema.metadata);
  const units = Object.fromEntries(schema.fields.map((f) => [f.name, f.metadata.get('unit') ?? '']));
  kv.set('meltsweep.units', JSON.stringify(units));
  return kv;
}

function writerProperties(pq: ParquetWasm, schema: arrow.Schema, o: ParquetWriteOptions): PQ.WriterProperties {
  let b = new pq.WriterPropertiesBuilder()
    .setCompression(o.compression === 'snappy' ? pq.Compression.SNAPPY : pq.Compression.ZSTD)
    .setMaxRowGroupSize(o.rowGroupRows ?? DEFAULT_ROW_GROUP_ROWS)
    // dictionary pages pay off only for text; on measured float columns they cost a third of the speed
    .setDictionaryEnabled(false)
    .setKeyValueMetadata(keyValueMetadata(schema));
  for (const f of schema.fields) {
    if (arrow.DataType.isDictionary(f.type) || arrow.DataType.isUtf8(f.type)) b = b.setColumnDictionaryEnabled(f.name, true);
  }
  if (o.createdBy !== undefined) b = b.setCreatedBy(o.createdBy);
  return b.build();
}

/** Move an Arrow JS batch into WebAssembly memory (through one IPC stream message). */
function toWasmBatches(pq: ParquetWasm, schema: arrow.Schema, batch: arrow.RecordBatch): PQ.RecordBatch[] {
  const table = pq.Table.fromIPCStream(arrow.tableToIPC(new arrow.Table(schema, [batch]), 'stream'));
  try {
    return table.recordBatches();
  } finally {
    table.free();
  }
}

/**
 * Writes a Parquet file batch by batch to `tmpPath`; `publish()` writes the footer, fsyncs and
 * renames to the final name (a reader never sees a half-written file under that name).
 */
export class ParquetFileSink {
  private readonly fd: number;
  private readonly input: WritableStreamDefaultWriter<PQ.RecordBatch>;
  private readonly readable: ReadableStream<PQ.RecordBatch>;
  private readonly props: PQ.WriterProperties;
  private readonly rowGroupRows: number;
  private pump: Promise<void> | null = null;
  private failed: Promise<never> | null = null;
  private writeError: unknown = null;
  private closed = false;
  rows = 0;

  /** Open a sink (loads the library first). */
  static async open(finalPath: string, tmpPath: string, schema: arrow.Schema, options: ParquetWriteOptions = {}): Promise<ParquetFileSink> {
    return new ParquetFileSink(await loadParquetWasm(), finalPath, tmpPath, schema, options);
  }

  private constructor(
    private readonly pq: ParquetWasm,
    readonly finalPath: string,
    readonly tmpPath: string,
    private readonly schema: arrow.Schema,
    options: ParquetWriteOptions,
  ) {
    this.fd = openTemporaryFile(tmpPath);
    this.rowGroupRows = options.rowGroupRows ?? DEFAULT_ROW_GROUP_ROWS;
    this.props = writerProperties(pq, schema, options);
    // the library pulls batches from this stream; a high-water mark of 0 on the readable side
    // makes every write wait until the writer has taken the previous batch (backpressure)
    const pipe = new TransformStream<PQ.RecordBatch, PQ.RecordBatch>(undefined, { highWaterMark: 1 }, { highWaterMark: 0 });
    this.input = pipe.writable.getWriter();
    this.readable = pipe.readable;
  }

  private check(): void {
    if (this.writeError !== null) {
      const e = this.writeError;
      throw new Error(`cannot write ${this.tmpPath}: ${e instanceof Error ? e.message : String(e)}`);
    }
  }

  /** Start the writer on the first batch (it reads the schema from it) and the byte pump to disk. */
  private async start(first: Promise<void>): Promise<void> {
    const bytes = await this.pq.transformParquetStream(this.readable, this.props);
    this.pump = (async () => {
      try {
        for await (const chunk of bytes as unknown as AsyncIterable<Uint8Array>) writeAllSync(this.fd, chunk);
      } catch (err) {
        this.writeError = err;
      }
    })();
    this.failed = this.pump.then(() => {
      throw this.writeError ?? new Error('the Parquet writer stopped early');
    });
    this.failed.catch(() => undefined);
    await Promise.race([first, this.failed]);
  }

  async write(batch: arrow.RecordBatch): Promise<void> {
    for (let s = 0; s < batch.numRows; s += this.rowGroupRows) {
      const part = s === 0 && batch.numRows <= this.rowGroupRows ? batch : batch.slice(s, Math.min(batch.numRows, s + this.rowGroupRows));
      for (const wb of toWasmBatches(this.pq, this.schema, part)) {
        const accepted = this.input.write(wb);
        if (this.pump === null) await this.start(accepted);
        else await Promise.race([accepted, this.failed as Promise<never>]);
        this.check();
      }
    }
    this.rows += batch.numRows;
  }

  /** Finish the footer, fsync, rename to the final path and fsync the folder. */
  async publish(): Promise<void> {
    if (this.pump === null) {
      // no rows: write an empty table in one go (the streaming writer needs a first batch)
      this.input.close().catch(() => undefined);
      const empty = this.pq.Table.fromIPCStream(arrow.tableToIPC(new arrow.Table(this.schema), 'stream'));
      writeAllSync(this.fd, this.pq.writeParquet(empty, this.props));
    } else {
      await this.input.close();
      await this.pump;
    }
    this.check();
    this.closed = true;
    publishTemporaryFile(this.fd, this.tmpPath, this.finalPath);
  }

  /** Abandon the file (removes the temporary file). */
  async abort(): Promise<void> {
    if (this.closed) return;
    this.closed = true;
    try {
      await this.input.abort(new Error('aborted'));
      await this.pump;
    } catch {
      // already failing
    }
    discardTemporaryFile(this.fd, this.tmpPath);
  }
}

// ---- reading ------------------------------------------------------------------------------

/** Open a Parquet file for lazy reading (only the byte ranges needed are read). */
async function openParquet(file: string): Promise<PQ.ParquetFile> {
  const pq = await loadParquetWasm();
  return pq.ParquetFile.fromFile(await fs.openAsBlob(file));
}

/** The Arrow schema stored in a Parquet file (units and meltsweep metadata included) and its row count. */
export async function readParquetInfo(file: string): Promise<{ schema: arrow.Schema; rows: number }> {
  const pf = await openParquet(file);
  try {
    const schema = arrow.tableFromIPC(pf.schema().intoIPCStream()).schema;
    const rows = pf.metadata().fileMetadata().numRows();
    return { schema, rows };
  } finally {
    pf.free();
  }
}

/** Batches of a Parquet file, read row group by row group as Arrow JS record batches. */
export async function* readParquetBatches(file: string, batchRows = 65_536, columns?: readonly string[]): AsyncGenerator<arrow.RecordBatch> {
  const pf = await openParquet(file);
  try {
    const stream = await pf.stream(columns === undefined ? { batchSize: batchRows } : { batchSize: batchRows, columns: [...columns] });
    for await (const wb of stream as unknown as AsyncIterable<PQ.RecordBatch>) {
      const table = arrow.tableFromIPC(wb.intoIPCStream());
      for (const b of table.batches) yield b;
    }
  } finally {
    pf.free();
  }
}
