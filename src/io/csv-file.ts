/**
 * CSV tables: a header line of column names, then one line per row (LF line ends). Numbers are
 * written in JavaScript's shortest round-trip form (String(x), with -0 kept), so parsing a field
 * back gives the same double bit for bit; nulls are empty fields; the status column is its text;
 * text columns (reason) are always quoted, with quotes doubled (RFC 4180). pandas, Polars, R and
 * DuckDB read such files with their defaults.
 *
 * Units and the sweep metadata cannot ride in a CSV header without breaking default readers, so
 * they go into a sidecar `FILE.units.json` (column names, Arrow types, units, descriptions, the
 * schema metadata and the row count), written atomically before the CSV itself is published.
 */
import * as arrow from 'apache-arrow';
import fs from 'node:fs';
import path from 'node:path';
import { crc32, crcHex } from './checksum.js';
import { discardTemporaryFile, openTemporaryFile, publishTemporaryFile, writeAllSync, writeFileAtomic } from './ipc-file.js';

/** The sidecar of a CSV table: `FILE.units.json`. */
export function csvSidecarPath(csvPath: string): string {
  return `${csvPath}.units.json`;
}

/** One column in the sidecar. */
export interface CsvSidecarColumn {
  readonly name: string;
  /** Arrow type of the column in meltsweep's own tables, e.g. "Float64", "Int64", "Dictionary<Int8, Utf8>" */
  readonly arrow_type: string;
  readonly unit: string;
  readonly nullable: boolean;
  readonly description: string;
}

/** The sidecar's content (JSON). */
export interface CsvSidecar {
  /** sidecar layout version */
  readonly meltsweep_csv: 1;
  /** base name of the CSV file it describes */
  readonly file: string;
  readonly rows: number;
  readonly columns: readonly CsvSidecarColumn[];
  /** the table's schema metadata (meltsweep.* keys: sweep, hash, version, rows, shard, ...) */
  readonly metadata: Readonly<Record<string, string>>;
  /** CRC-32 of the CSV file's bytes (8 hex digits); absent in sidecars of older versions */
  readonly data_crc32?: string;
}

const NEEDS_QUOTES = /[",\r\n]/;

/** A text field per RFC 4180: quoted, quotes doubled. */
function quoteCsv(text: string): string {
  return `"${text.replace(/"/g, '""')}"`;
}

/** A number in its shortest round-trip form (-0 kept; infinities as inf / -inf). */
function formatCsvNumber(v: number): string {
  if (v === 0) return Object.is(v, -0) ? '-0' : '0';
  if (v === Infinity) return 'inf';
  if (v === -Infinity) return '-inf';
  return String(v);
}

type Formatter = (row: number) => string;

/** A formatter of one column of a batch: row index -> CSV field text. */
function columnFormatter(field: arrow.Field, data: arrow.Data): Formatter {
  const off = data.offset;
  const valid = data.nullCount === 0 ? null : (i: number): boolean => data.getValid(i);
  const t = data.type;
  if (arrow.DataType.isFloat(t)) {
    const values = data.values as Float64Array | Float32Array;
    return (i) => (valid !== null && !valid(i) ? '' : formatCsvNumber(values[off + i]));
  }
  if (arrow.DataType.isInt(t)) {
    const values = data.values as ArrayLike<number | bigint>;
    return (i) => (valid !== null && !valid(i) ? '' : String(values[off + i]));
  }
  if (arrow.DataType.isDictionary(t)) {
    const dict = data.dictionary as arrow.Vector;
    const names = Array.from({ length: dict.length }, (_, k) => {
      const s = String(dict.get(k));
      return NEEDS_QUOTES.test(s) ? quoteCsv(s) : s;
    });
    const codes = data.values as ArrayLike<number>;
    return (i) => (valid !== null && !valid(i) ? '' : names[Number(codes[off + i])]);
  }
  if (arrow.DataType.isUtf8(t)) {
    const vec = arrow.makeVector(data as arrow.Data<arrow.Utf8>);
    return (i) => {
      const s = vec.get(i);
      return s === null ? '' : quoteCsv(s);
    };
  }
  const vec = arrow.makeVector(data);
  return (i) => {
    const v = vec.get(i) as unknown;
    return v === null || v === undefined ? '' : quoteCsv(String(v));
  };
}

/** Rows of one record batch as CSV lines (each ending in \n). */
export function batchToCsv(batch: arrow.RecordBatch): string {
  const formatters = batch.schema.fields.map((f, k) => columnFormatter(f, batch.data.children[k]));
  const lines = new Array<string>(batch.numRows);
  const cells = new Array<string>(formatters.length);
  for (let i = 0; i < batch.numRows; i++) {
    for (let c = 0; c < formatters.length; c++) cells[c] = formatters[c](i);
    lines[i] = cells.join(',');
  }
  return lines.length === 0 ? '' : `${lines.join('\n')}\n`;
}

/** The sidecar describing a CSV table with this schema and row count. */
function csvSidecar(csvPath: string, schema: arrow.Schema, rows: number, dataCrc32?: string): CsvSidecar {
  return {
    meltsweep_csv: 1,
    file: path.basename(csvPath),
    rows,
    columns: schema.fields.map((f) => ({
      name: f.name,
      arrow_type: String(f.type),
      unit: f.metadata.get('unit') ?? '',
      nullable: f.nullable,
      description: f.metadata.get('description') ?? '',
    })),
    metadata: Object.fromEntries(schema.metadata),
    ...(dataCrc32 !== undefined ? { data_crc32: dataCrc32 } : {}),
  };
}

/** Rows per write() call are formatted in blocks of this many (bounds the strings held at once). */
const FORMAT_BLOCK_ROWS = 16_384;

/**
 * Writes a CSV table batch by batch to `tmpPath`; `publish()` writes the sidecar (atomically),
 * then fsyncs the CSV and renames it to its final name.
 */
export class CsvFileSink {
  private readonly fd: number;
  private closed = false;
  private crc = 0;
  rows = 0;

  private writeBytes(bytes: Uint8Array): void {
    writeAllSync(this.fd, bytes);
    this.crc = crc32(bytes, this.crc);
  }

  constructor(
    readonly finalPath: string,
    readonly tmpPath: string,
    private readonly schema: arrow.Schema,
  ) {
    this.fd = openTemporaryFile(tmpPath);
    try {
      this.writeBytes(Buffer.from(`${schema.fields.map((f) => (NEEDS_QUOTES.test(f.name) ? quoteCsv(f.name) : f.name)).join(',')}\n`));
    } catch (err) {
      discardTemporaryFile(this.fd, tmpPath);
      throw err;
    }
  }

  async write(batch: arrow.RecordBatch): Promise<void> {
    for (let s = 0; s < batch.numRows; s += FORMAT_BLOCK_ROWS) {
      const part = s === 0 && batch.numRows <= FORMAT_BLOCK_ROWS ? batch : batch.slice(s, Math.min(batch.numRows, s + FORMAT_BLOCK_ROWS));
      this.writeBytes(Buffer.from(batchToCsv(part)));
    }
    this.rows += batch.numRows;
  }

  async publish(): Promise<void> {
    this.closed = true;
    // the sidecar first: a published CSV always has its units beside it
    writeFileAtomic(csvSidecarPath(this.finalPath), `${JSON.stringify(csvSidecar(this.finalPath, this.schema, this.rows, crcHex(this.crc)), null, 2)}\n`);
    publishTemporaryFile(this.fd, this.tmpPath, this.finalPath);
  }

  async abort(): Promise<void> {
    if (this.closed) return;
    this.closed = true;
    discardTemporaryFile(this.fd, this.tmpPath);
  }
}

// ---- reading back -------------------------------------------------------------------------

/** Read a CSV table's sidecar. @throws Error when it is missing or not a meltsweep sidecar */
export function readCsvSidecar(csvPath: string): CsvSidecar {
  const file = csvSidecarPath(csvPath);
  let parsed: unknown;
  try {
    parsed = JSON.parse(fs.readFileSync(file, 'utf8'));
  } catch (err) {
    throw new Error(`cannot read the units sidecar ${file}: ${err instanceof Error ? err.message : String(err)}`);
  }
  const s = parsed as Partial<CsvSidecar>;
  if (s.meltsweep_csv !== 1 || !Array.isArray(s.columns) || typeof s.metadata !== 'object') {
    throw new Error(`${file} is not a meltsweep CSV sidecar`);
  }
  return s as CsvSidecar;
}

function typeFromName(name: string): arrow.DataType {
  switch (name) {
    case 'Float64': return new arrow.Float64();
    case 'Float32': return new arrow.Float32();
    case 'Int64': return new arrow.Int64();
    case 'Int32': return new arrow.Int32();
    case 'Int16': return new arrow.Int16();
    case 'Int8': return new arrow.Int8();
    case 'Uint8': return new arrow.Uint8();
    case 'Uint16': return new arrow.Uint16();
    case 'Uint32': return new arrow.Uint32();
    case 'Bool': return new arrow.Bool();
    case 'Utf8': return new arrow.Utf8();
    case 'Dictionary<Int8, Utf8>': return new arrow.Dictionary(new arrow.Utf8(), new arrow.Int8(), 0, false);
    default: throw new Error(`unsupported column type ${name} in a CSV sidecar`);
  }
}

/** The Arrow schema a CSV table's sidecar describes (field units, schema metadata). */
export function csvSchema(sidecar: CsvSidecar): arrow.Schema {
  const fields = sidecar.columns.map(
    (c) => new arrow.Field(c.name, typeFromName(c.arrow_type), c.nullable, new Map([['unit', c.unit], ['description', c.description]])),
  );
  return new arrow.Schema(fields, new Map(Object.entries(sidecar.metadata)));
}

/**
 * Incremental RFC 4180 record parser. A field is its text, or null for an empty field that was
 * not quoted (meltsweep's null); `""` is the empty string.
 */
export class CsvRecordParser {
  private field = '';
  private quoted = false;
  private inQuotes = false;
  private quotePending = false;
  private record: Array<string | null> = [];
  private lastWasCr = false;

  /** Feed text; returns the records completed by it. */
  push(text: string): Array<Array<string | null>> {
    const out: Array<Array<string | null>> = [];
    let i = 0;
    const n = text.length;
    while (i < n) {
      const ch = text[i];
      if (this.inQuotes) {
        if (this.quotePending) {
          this.quotePending = false;
          if (ch === '"') {
            this.field += '"';
            i++;
            continue;
          }
          this.inQuotes = false;
          continue; // re-read ch outside quotes
        }
        const q = text.indexOf('"', i);
        if (q < 0) {
          this.field += text.slice(i);
          break;
        }
        this.field += text.slice(i, q);
        this.quotePending = true;
        i = q + 1;
        continue;
      }
      if (ch === '"' && this.field === '' && !this.quoted) {
        this.inQuotes = true;
        this.quoted = true;
        i++;
        continue;
      }
      if (ch === ',') {
        this.endField();
        i++;
        continue;
      }
      if (ch === '\n' || ch === '\r') {
        if (!(ch === '\n' && this.lastWasCr)) {
          this.endField();
          out.push(this.record);
          this.record = [];
        }
        this.lastWasCr = ch === '\r';
        i++;
        continue;
      }
      this.lastWasCr = false;
      // plain text up to the next delimiter
      let j = i;
      while (j < n) {
        const c = text[j];
        if (c === ',' || c === '\n' || c === '\r') break;
        j++;
      }
      this.field += text.slice(i, j);
      i = j;
    }
    return out;
  }

  /** End of input: the last record, if it did not end with a line break. */
  end(): Array<Array<string | null>> {
    if (this.quotePending) {
      this.quotePending = false;
      this.inQuotes = false;
    }
    if (this.field === '' && !this.quoted && this.record.length === 0) return [];
    this.endField();
    const r = this.record;
    this.record = [];
    return [r];
  }

  private endField(): void {
    this.record.push(this.field === '' && !this.quoted ? null : this.field);
    this.field = '';
    this.quoted = false;
    this.lastWasCr = false;
  }
}

function columnValues(type: arrow.DataType, raw: Array<string | null>): unknown[] {
  if (arrow.DataType.isFloat(type)) {
    return raw.map((s) => (s === null ? null : s === 'inf' ? Infinity : s === '-inf' ? -Infinity : Number(s)));
  }
  if (arrow.DataType.isInt(type)) {
    return (type as arrow.Int).bitWidth === 64 ? raw.map((s) => (s === null ? null : BigInt(s))) : raw.map((s) => (s === null ? null : Number(s)));
  }
  if (arrow.DataType.isBool(type)) return raw.map((s) => (s === null ? null : s === 'true'));
  return raw;
}

/**
 * The rows of a CSV table as Arrow record batches typed by its sidecar (at most batchRows rows
 * each). The file is read in chunks; memory is bounded by the batch size.
 */
export async function* readCsvBatches(csvPath: string, batchRows = 65_536): AsyncGenerator<arrow.RecordBatch> {
  const schema = csvSchema(readCsvSidecar(csvPath));
  const width = schema.fields.length;
  const parser = new CsvRecordParser();
  let header: Array<string | null> | null = null;
  let pending: Array<Array<string | null>> = [];
  let record = 0;
  const toBatch = (records: Array<Array<string | null>>): arrow.RecordBatch => {
    const children = schema.fields.map((f, c) => {
      const raw = records.map((r) => r[c]);
      const vec = arrow.vectorFromArray(columnValues(f.type, raw), f.type);
      return vec.data.length === 1 ? vec.data[0] : arrow.makeVector(vec.data).data[0];
    });
    return new arrow.RecordBatch(schema, arrow.makeData({ type: new arrow.Struct(schema.fields), length: records.length, nullCount: 0, children }));
  };
  const take = function* (records: Array<Array<string | null>>): Generator<arrow.RecordBatch> {
    for (const r of records) {
      record++;
      if (header === null) {
        header = r;
        const names = schema.fields.map((f) => f.name);
        if (r.join(',') !== names.join(',')) throw new Error(`${csvPath}: the header does not match ${csvSidecarPath(csvPath)}`);
        continue;
      }
      if (r.length !== width) throw new Error(`${csvPath}: record ${record} (the header is record 1) has ${r.length} fields, expected ${width}`);
      pending.push(r);
      if (pending.length >= batchRows) {
        const b = toBatch(pending);
        pending = [];
        yield b;
      }
    }
  };
  const stream = fs.createReadStream(csvPath, { encoding: 'utf8', highWaterMark: 1 << 20 });
  for await (const chunk of stream) yield* take(parser.push(chunk as string));
  yield* take(parser.end());
  if (pending.length > 0) yield toBatch(pending);
}
