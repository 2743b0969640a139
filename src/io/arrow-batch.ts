/**
 * Turn a computed chunk (struct-of-arrays typed arrays, NaN = null) into an Arrow record
 * batch without per-value builders: the typed arrays become the column buffers directly.
 */
import * as arrow from 'apache-arrow';
import { REASON_FIELD, STATUS_FIELD } from '../physics/fields.js';
import type { ChunkResult } from '../process/chunk-result.js';
import { BLOCK_FIELD, STATUS_TYPE } from './arrow-schema.js';

/** Validity bitmap of a float column where NaN marks null; undefined when nothing is null. */
export function nanValidity(values: Float64Array): { bitmap: Uint8Array | undefined; nullCount: number } {
  let nullCount = 0;
  for (let i = 0; i < values.length; i++) if (values[i] !== values[i]) nullCount++;
  if (nullCount === 0) return { bitmap: undefined, nullCount: 0 };
  const bitmap = new Uint8Array((values.length + 7) >> 3);
  for (let i = 0; i < values.length; i++) if (values[i] === values[i]) bitmap[i >> 3] |= 1 << (i & 7);
  return { bitmap, nullCount };
}

/** A Float64 column from a typed array (NaN = null). */
export function floatData(values: Float64Array): arrow.Data<arrow.Float64> {
  const { bitmap, nullCount } = nanValidity(values);
  return arrow.makeData({ type: new arrow.Float64(), length: values.length, nullCount, nullBitmap: bitmap, data: values });
}

const encoder = new TextEncoder();

/** A sparse list of (row, text) as a nullable Utf8 column of length n. */
function sparseUtf8Data(n: number, entries: ReadonlyArray<readonly [number, string]>): arrow.Data<arrow.Utf8> {
  const offsets = new Int32Array(n + 1);
  const bitmap = new Uint8Array((n + 7) >> 3);
  const encoded = entries.map(([row, text]) => [row, encoder.encode(text)] as const).sort((a, b) => a[0] - b[0]);
  let total = 0;
  for (const [, bytes] of encoded) total += bytes.length;
  const data = new Uint8Array(total);
  let pos = 0;
  let k = 0;
  let withText = 0;
  for (let i = 0; i < n; i++) {
    offsets[i] = pos;
    // a row keeps the first reason given for it
    if (k < encoded.length && encoded[k][0] === i) {
      data.set(encoded[k][1], pos);
      pos += encoded[k][1].length;
      bitmap[i >> 3] |= 1 << (i & 7);
      withText++;
      while (k < encoded.length && encoded[k][0] === i) k++;
    }
  }
  offsets[n] = pos;
  const nullCount = n - withText;
  return arrow.makeData({
    type: new arrow.Utf8(), length: n, nullCount,
    nullBitmap: nullCount > 0 ? bitmap : undefined, valueOffsets: offsets, data: data.subarray(0, pos),
  });
}

function statusData(codes: Int8Array, dictionary: arrow.Vector<arrow.Utf8>): arrow.Data<arrow.Dictionary<arrow.Utf8, arrow.Int8>> {
  return arrow.makeData({ type: STATUS_TYPE, length: codes.length, nullCount: 0, data: codes, dictionary });
}

/**
 * Int64 scenario ids start, start + 1, ... written through 32-bit words (no BigInt per row).
 * Arrow buffers are little-endian, as is every platform Node supports.
 */
function scenarioIds(start: number, n: number): BigInt64Array {
  const ids = new BigInt64Array(n);
  const words = new Uint32Array(ids.buffer);
  for (let i = 0; i < n; i++) {
    const id = start + i;
    words[2 * i] = id >>> 0;
    words[2 * i + 1] = Math.floor(id / 4294967296);
  }
  return ids;
}

/** Int64 column data from whole numbers held in doubles (exact up to 2^53; no BigInt per row). */
export function int64Data(values: Float64Array): arrow.Data<arrow.Int64> {
  const n = values.length;
  const out = new BigInt64Array(n);
  const words = new Uint32Array(out.buffer);
  for (let i = 0; i < n; i++) {
    const v = values[i];
    const hi = Math.floor(v / 4294967296);
    words[2 * i] = (v - hi * 4294967296) >>> 0;
    words[2 * i + 1] = hi >>> 0;
  }
  return arrow.makeData({ type: new arrow.Int64(), length: n, nullCount: 0, data: out });
}

/**
 * Build the record batch of one chunk. `idOffset` is added to the chunk's start to form
 * scenario_id (0 for whole sweeps: ids are sweep indices).
 */
export function chunkToRecordBatch(
  chunk: ChunkResult,
  schema: arrow.Schema,
  statusDictionary: arrow.Vector<arrow.Utf8>,
): arrow.RecordBatch {
  const n = chunk.end - chunk.start;
  const ids = scenarioIds(chunk.start, n);
  const children: arrow.Data[] = [arrow.makeData({ type: new arrow.Int64(), length: n, nullCount: 0, data: ids })];
  // the inputs are the schema's fields after scenario_id, up to block / status
  for (let f = 1; f < schema.fields.length; f++) {
    const name = schema.fields[f].name;
    if (name === BLOCK_FIELD.name || name === STATUS_FIELD.name) break;
    children.push(floatData(chunk.points.inputs[name]));
  }
  if (chunk.points.block) children.push(arrow.makeData({ type: new arrow.Uint8(), length: n, nullCount: 0, data: chunk.points.block }));
  children.push(statusData(new Int8Array(chunk.status.buffer, chunk.status.byteOffset, n), statusDictionary));
  children.push(sparseUtf8Data(n, chunk.reasons));
  // the results are the schema's fields after reason (resultFieldInfos fixes the order)
  const reasonAt = schema.fields.findIndex((f) => f.name === REASON_FIELD.name);
  for (let f = reasonAt + 1; f < schema.fields.length; f++) children.push(floatData(chunk.numeric[schema.fields[f].name]));
  return new arrow.RecordBatch(schema, arrow.makeData({ type: new arrow.Struct(schema.fields), length: n, nullCount: 0, children }));
}

/**
 * Re-point a batch read from another file at the writer's shared status dictionary, so a
 * single IPC file never carries a dictionary replacement.
 */
export function withSharedDictionary(
  batch: arrow.RecordBatch,
  schema: arrow.Schema,
  statusDictionary: arrow.Vector<arrow.Utf8>,
): arrow.RecordBatch {
  const children = schema.fields.map((field) => {
    const col = batch.getChild(field.name);
    if (col === null) throw new Error(`column ${field.name} is missing from a batch`);
    if (col.data.length !== 1) throw new Error(`column ${field.name} of a batch has ${col.data.length} chunks`);
    const data = col.data[0];
    if (field.name !== 'status') return data;
    // dictionaries read from different files may order their values differently: recode
    const source = data.dictionary as arrow.Vector<arrow.Utf8>;
    const wanted = Array.from({ length: statusDictionary.length }, (_, i) => statusDictionary.get(i) as string);
    const remap = Int8Array.from({ length: source.length }, (_, i) => wanted.indexOf(source.get(i) as string));
    // IPC buffers are padded: take exactly this column's slice
    const codes = (data.values as Int8Array).subarray(data.offset, data.offset + data.length);
    const out = new Int8Array(data.length);
    for (let i = 0; i < data.length; i++) out[i] = remap[codes[i]];
    return statusData(out, statusDictionary);
  });
  return new arrow.RecordBatch(schema, arrow.makeData({ type: new arrow.Struct(schema.fields), length: batch.numRows, nullCount: 0, children }));
}
