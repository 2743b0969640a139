/**
 * CRC-32 (the IEEE 802.3 / zlib polynomial 0xEDB88320) of bytes, incrementally. Node's zlib.crc32
 * is used where it exists (Node >= 20.15); older Node 20 releases get a small table
 * implementation with the same results (check value of "123456789": 0xCBF43926).
 */
import fs from 'node:fs';
import zlib from 'node:zlib';

type Crc32Fn = (data: Uint8Array, value: number) => number;

let table: Uint32Array | null = null;

function tableCrc32(data: Uint8Array, value: number): number {
  if (table === null) {
    table = new Uint32Array(256);
    for (let n = 0; n < 256; n++) {
      let c = n;
      for (let k = 0; k < 8; k++) c = c & 1 ? 0xedb88320 ^ (c >>> 1) : c >>> 1;
      table[n] = c >>> 0;
    }
  }
  let c = ~value >>> 0;
  for (let i = 0; i < data.length; i++) c = table[(c ^ data[i]) & 0xff] ^ (c >>> 8);
  return ~c >>> 0;
}

const native = (zlib as unknown as { crc32?: Crc32Fn }).crc32;
const crcImpl: Crc32Fn = typeof native === 'function' ? native : tableCrc32;

/** CRC-32 of `data`, continuing from `value` (0 to start). */
export function crc32(data: Uint8Array, value = 0): number {
  return crcImpl(data, value) >>> 0;
}

/** The table implementation (tests compare it with zlib's). */
export const crc32Portable: (data: Uint8Array, value?: number) => number = (data, value = 0) => tableCrc32(data, value);

/** A CRC-32 as 8 lower-case hex digits (the form stored in manifests and seals). */
export function crcHex(value: number): string {
  return (value >>> 0).toString(16).padStart(8, '0');
}

/**
 * CRC-32 of the bytes [from, to) of an open file, continuing from `value`, read in 1 MiB pieces;
 * null when the file ends before `to` (truncated).
 */
export function rangeCrc32(fd: number, from: number, to: number, value = 0): number | null {
  const buf = Buffer.allocUnsafe(Math.min(1 << 20, Math.max(1, to - from)));
  let crc = value;
  for (let pos = from; pos < to; ) {
    const n = fs.readSync(fd, buf, 0, Math.min(buf.length, to - pos), pos);
    if (n <= 0) return null;
    crc = crc32(buf.subarray(0, n), crc);
    pos += n;
  }
  return crc;
}

/** CRC-32 and size of a file, read in 1 MiB pieces (bounded memory). */
export function fileCrc32(file: string): { crc32: string; bytes: number } {
  const fd = fs.openSync(file, 'r');
  const buf = Buffer.allocUnsafe(1 << 20);
  let crc = 0;
  let bytes = 0;
  try {
    for (;;) {
      const n = fs.readSync(fd, buf, 0, buf.length, null);
      if (n <= 0) break;
      crc = crc32(buf.subarray(0, n), crc);
      bytes += n;
    }
  } finally {
    fs.closeSync(fd);
  }
  return { crc32: crcHex(crc), bytes };
}
