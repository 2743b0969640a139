/**
 * The Arrow IPC file writer meltsweep publishes with: the footer's schema metadata gets
 * meltsweep.data_crc32, the CRC-32 of every byte written before the footer's end-of-stream
 * marker (checked by verifyTableChecksum in table-checksum.ts).
 */
import * as arrow from 'apache-arrow';
import type { ArrayBufferViewInput } from 'apache-arrow/util/buffer';
import { crc32, crcHex } from './checksum.js';

/** The schema metadata key of an Arrow IPC file's data checksum. */
export const DATA_CRC_KEY = 'meltsweep.data_crc32';


/** An Arrow IPC file writer that adds the CRC-32 of the data it wrote to the footer's schema metadata. */
export class ChecksummedFileWriter extends arrow.RecordBatchFileWriter {
  private crc = 0;
  private footerStarted = false;

  protected override _write(chunk: ArrayBufferViewInput): this {
    // the writer hands over byte views (messages, bodies, padding); the footer is excluded
    if (!this.footerStarted && ArrayBuffer.isView(chunk)) {
      this.crc = crc32(new Uint8Array(chunk.buffer, chunk.byteOffset, chunk.byteLength), this.crc);
    }
    return super._write(chunk);
  }

  protected override _writeFooter(schema: arrow.Schema): this {
    this.footerStarted = true;
    const metadata = new Map(schema.metadata);
    metadata.set(DATA_CRC_KEY, crcHex(this.crc));
    return super._writeFooter(new arrow.Schema(schema.fields, metadata, schema.dictionaries));
  }
}

