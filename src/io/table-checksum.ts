/**
 * A checksum carried inside every published table, so that a damaged shard (a bit flip, an edited
 * or dropped line) is caught before it is merged.
 *
 * - Arrow IPC file: the schema lives in the footer, written last; its metadata key
 *   meltsweep.data_crc32 holds the CRC-32 of every byte before the end-of-stream marker that
 *   precedes the footer (magic, dictionaries, record batches).
 * - CSV: the units sidecar, written at publication, holds data_crc32, the CRC-32 of the CSV file.
 * - Parquet: the footer's key-value metadata meltsweep.data_crc32 holds the CRC-32 of every byte
 *   before the footer (the writer fixes its metadata before the first row, so the sink writes a
 *   stand-in and seals the CRC in place at publication; src/io/parquet-file.ts).
 */
import * as arrow from 'apache-arrow';
import fs from 'node:fs';
import { crcHex, fileCrc32, rangeCrc32 } from './checksum.js';
import { DATA_CRC_KEY } from './checksummed-writer.js';
import { csvSidecarPath, readCsvSidecar } from './csv-file.js';
import { readIpcSchema } from './ipc-file.js';
import { parquetFooterStart, readParquetInfo } from './parquet-file.js';

/** Bytes of the end-of-stream marker (continuation 0xFFFFFFFF + length 0) before an IPC file footer. */
const EOS_BYTES = 8;

/** What a table's checksum says. */
export type ChecksumCheck =
  | { readonly status: 'ok' }
  /** the table carries no checksum (written by an older meltsweep) */
  | { readonly status: 'absent' }
  | { readonly status: 'bad'; readonly why: string };

/** Check the checksum a published table carries (format found from its first bytes). */
export async function verifyTableChecksum(file: string): Promise<ChecksumCheck> {
  const fd = fs.openSync(file, 'r');
  let size: number;
  const head = Buffer.alloc(6);
  try {
    size = fs.fstatSync(fd).size;
    fs.readSync(fd, head, 0, 6, 0);
  } finally {
    fs.closeSync(fd);
  }
  if (head.toString('latin1') === 'ARROW1') {
    let schema: arrow.Schema;
    try {
      schema = await readIpcSchema(file);
    } catch {
      return { status: 'bad', why: 'its footer cannot be read (truncated or damaged)' };
    }
    const want = schema.metadata.get(DATA_CRC_KEY);
    return want === undefined ? { status: 'absent' } : verifyIpcFile(file, size, want);
  }
  if (head.subarray(0, 4).toString('latin1') === 'PAR1') return verifyParquetFile(file, size);
  if (fs.existsSync(csvSidecarPath(file))) {
    const want = readCsvSidecar(file).data_crc32;
    if (want === undefined) return { status: 'absent' };
    const got = fileCrc32(file).crc32;
    return got === want ? { status: 'ok' } : { status: 'bad', why: `its CRC-32 is ${got}, the sidecar recorded ${want} (the file was changed after it was written)` };
  }
  return { status: 'absent' };
}

async function verifyParquetFile(file: string, size: number): Promise<ChecksumCheck> {
  let want: string | undefined;
  try {
    want = (await readParquetInfo(file)).schema.metadata.get(DATA_CRC_KEY);
  } catch {
    return { status: 'bad', why: 'its footer cannot be read (truncated or damaged)' };
  }
  if (want === undefined) return { status: 'absent' };
  return verifyDataBefore(file, want, (fd) => {
    const footerStart = parquetFooterStart(fd, size);
    return footerStart === null ? { status: 'bad', why: 'its footer is damaged' } : footerStart;
  });
}

/**
 * Compare `want` with the CRC-32 of the file's bytes before `dataEnd(fd)` (where its footer
 * starts), or return what dataEnd found wrong.
 */
function verifyDataBefore(file: string, want: string, dataEnd: (fd: number) => number | ChecksumCheck): ChecksumCheck {
  const fd = fs.openSync(file, 'r');
  try {
    const end = dataEnd(fd);
    if (typeof end !== 'number') return end;
    const crc = rangeCrc32(fd, 0, end);
    if (crc === null) return { status: 'bad', why: 'it is shorter than its footer says (truncated)' };
    const got = crcHex(crc);
    return got === want ? { status: 'ok' } : { status: 'bad', why: `its data CRC-32 is ${got}, its footer recorded ${want} (damaged after it was written)` };
  } finally {
    fs.closeSync(fd);
  }
}

function verifyIpcFile(file: string, size: number, want: string): ChecksumCheck {
  return verifyDataBefore(file, want, (fd) => {
    const tail = Buffer.alloc(10);
    if (size < 10 + 8 || fs.readSync(fd, tail, 0, 10, size - 10) !== 10 || tail.subarray(4).toString('latin1') !== 'ARROW1') {
      return { status: 'bad', why: 'its end is missing (truncated)' };
    }
    const footerLen = tail.readInt32LE(0);
    const covered = size - 10 - footerLen - EOS_BYTES;
    return footerLen <= 0 || covered < 8 ? { status: 'bad', why: 'its footer is damaged' } : covered;
  });
}
