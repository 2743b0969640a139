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
 * The key-value metadata also holds meltsweep.data_crc32, the CRC-32 of every byte before the
 * footer, sealed into the footer at publication (checked by verifyTableChecksum).
 */
import * as arrow from 'apache-arrow';
import fs from 'node:fs';
import type * as PQ from 'parquet-wasm';
import { crc32, crcHex, rangeCrc32 } from './checksum.js';
import { DATA_CRC_KEY } from './checksummed-writer.js';
import { abandonTemporaryFile, openTemporaryFile, publishTemporaryFile, throwWriteError, writeAllSync } from './ipc-file.js';

type ParquetWasm = typeof PQ;

/**
 * The library, loaded on first use: compiling its WebAssembly takes about 0.2 s, which commands
 * that never touch Parquet should not pay (node caches the module after the first import).
 */
function loadParquetWasm(): Promise<ParquetWasm> {
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
const DEFAULT_ROW_GROUP_ROWS = 131_072;

/**
 * The value of meltsweep.data_crc32 while the file is written. The writer fixes its key-value
 * metadata before the first row, so the footer carries this stand-in of the same length as a CRC
 * in hex, overwritten in place once the data is complete (sealDataChecksum).
 */
const CRC_PLACEHOLDER = 'pending!';

/** Bytes after the footer: its length (int32 LE) and the magic PAR1. */
const FOOTER_TAIL_BYTES = 8;

/** Parquet key-value metadata: the schema metadata, the units of every column as JSON, the data checksum's place. */
function keyValueMetadata(schema: arrow.Schema): Map<string, string> {
  const kv = new Map<string, string>(schema.metadata);
  const units = Object.fromEntries(schema.fields.map((f) => [f.name, f.metadata.get('unit') ?? '']));
  kv.set('meltsweep.units', JSON.stringify(units));
  kv.set(DATA_CRC_KEY, CRC_PLACEHOLDER);
  return kv;
}

/** The schema without a data checksum it may carry from another file (only the sealed one may be in the footer). */
function withoutDataChecksum(schema: arrow.Schema): arrow.Schema {
  if (!schema.metadata.has(DATA_CRC_KEY)) return schema;
  const metadata = new Map(schema.metadata);
  metadata.delete(DATA_CRC_KEY);
  return new arrow.Schema(schema.fields, metadata, schema.dictionaries);
}

/** Where a Parquet file's footer starts, from its last 8 bytes; null when they are not a footer's tail. */
export function parquetFooterStart(fd: number, size: number): number | null {
  const tail = Buffer.alloc(FOOTER_TAIL_BYTES);
  if (size < 12 || fs.readSync(fd, tail, 0, FOOTER_TAIL_BYTES, size - FOOTER_TAIL_BYTES) !== FOOTER_TAIL_BYTES) return null;
  if (tail.subarray(4).toString('latin1') !== 'PAR1') return null;
  const start = size - FOOTER_TAIL_BYTES - tail.readInt32LE(0);
  return start >= 4 && start < size - FOOTER_TAIL_BYTES ? start : null;
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
  /** bytes written, the CRC-32 of all of them, and (offset, CRC of the bytes before it) at each chunk */
  private written = 0;
  private crc = 0;
  private readonly marks: { readonly offset: number; readonly crc: number }[] = [];
  private readonly schema: arrow.Schema;
  rows = 0;

  /** Open a sink (loads the library first). */
  static async open(finalPath: string, tmpPath: string, schema: arrow.Schema, options: ParquetWriteOptions = {}): Promise<ParquetFileSink> {
    return new ParquetFileSink(await loadParquetWasm(), finalPath, tmpPath, schema, options);
  }

  private constructor(
    private readonly pq: ParquetWasm,
    readonly finalPath: string,
    readonly tmpPath: string,
    schema: arrow.Schema,
    options: ParquetWriteOptions,
  ) {
    this.schema = withoutDataChecksum(schema);
    this.fd = openTemporaryFile(tmpPath);
    this.rowGroupRows = options.rowGroupRows ?? DEFAULT_ROW_GROUP_ROWS;
    this.props = writerProperties(pq, this.schema, options);
    // the library pulls batches from this stream; a high-water mark of 0 on the readable side
    // makes every write wait until the writer has taken the previous batch (backpressure)
    const pipe = new TransformStream<PQ.RecordBatch, PQ.RecordBatch>(undefined, { highWaterMark: 1 }, { highWaterMark: 0 });
    this.input = pipe.writable.getWriter();
    this.readable = pipe.readable;
  }

  /** Write bytes of the file, keeping the running CRC-32 and a mark where the chunk starts. */
  private writeChunk(chunk: Uint8Array): void {
    this.marks.push({ offset: this.written, crc: this.crc });
    writeAllSync(this.fd, chunk);
    this.crc = crc32(chunk, this.crc);
    this.written += chunk.byteLength;
  }

  /**
   * Put the CRC-32 of every byte before the footer (the magic and all column chunks) in place of
   * the footer's stand-in; only the bytes from the last chunk start before the footer are read back.
   */
  private sealDataChecksum(): void {
    const footerStart = parquetFooterStart(this.fd, this.written);
    if (footerStart === null) throw new Error(`cannot write ${this.tmpPath}: the Parquet writer left no footer`);
    let mark = this.marks[0];
    for (const m of this.marks) if (m.offset <= footerStart) mark = m;
    const crc = rangeCrc32(this.fd, mark.offset, footerStart, mark.crc);
    const footer = Buffer.alloc(this.written - FOOTER_TAIL_BYTES - footerStart);
    fs.readSync(this.fd, footer, 0, footer.length, footerStart);
    const key = footer.indexOf(DATA_CRC_KEY, 0, 'latin1');
    const at = key < 0 ? -1 : footer.indexOf(CRC_PLACEHOLDER, key + DATA_CRC_KEY.length, 'latin1');
    if (crc === null || at < 0 || at > key + DATA_CRC_KEY.length + 4) throw new Error(`cannot write ${this.tmpPath}: the data checksum's place is not in the Parquet footer`);
    const hex = Buffer.from(crcHex(crc), 'latin1');
    if (fs.writeSync(this.fd, hex, 0, hex.length, footerStart + at) !== hex.length) throw new Error(`cannot write ${this.tmpPath}: short write of the data checksum`);
  }

  private check(): void {
    throwWriteError(this.writeError, this.tmpPath);
  }

  /** Start the writer on the first batch (it reads the schema from it) and the byte pump to disk. */
  private async start(first: Promise<void>): Promise<void> {
    const bytes = await this.pq.transformParquetStream(this.readable, this.props);
    this.pump = (async () => {
      try {
        for await (const chunk of bytes as unknown as AsyncIterable<Uint8Array>) this.writeChunk(chunk);
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
      this.writeChunk(this.pq.writeParquet(empty, this.props));
    } else {
      await this.input.close();
      await this.pump;
    }
    this.check();
    this.sealDataChecksum();
    this.closed = true;
    publishTemporaryFile(this.fd, this.tmpPath, this.finalPath);
  }

  /** Abandon the file (removes the temporary file). */
  async abort(): Promise<void> {
    if (this.closed) return;
    this.closed = true;
    await abandonTemporaryFile(this.fd, this.tmpPath, async () => {
      await this.input.abort(new Error('aborted'));
      await this.pump;
    });
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
