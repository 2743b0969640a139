/**
 * A fast, read-once scan of an Arrow IPC file for analyses that stream over every batch: record
 * bodies are read into two reused buffers instead of a new allocation per batch, so a scan of a
 * gigabyte table costs a copy from the page cache and no page faults or garbage.
 *
 * The catch: a batch's data are views into a reused buffer, valid until the next-but-one batch is
 * read. Use every value of a batch (or copy it) before asking for the batch after next.
 */
import * as arrow from 'apache-arrow';
import { RandomAccessFile } from 'apache-arrow/io/file';
import fs from 'node:fs';

/** Reads below this size (metadata, dictionaries, footer) get their own fresh buffer. */
const SMALL_READ = 1 << 16;

/** A random-access file over a descriptor whose large reads land in two alternating buffers. */
class ReusingFile extends RandomAccessFile {
  private readonly fd: number;
  private readonly ring: [Uint8Array, Uint8Array] = [new Uint8Array(0), new Uint8Array(0)];
  private slot = 0;

  constructor(fd: number, size: number) {
    super(new Uint8Array(0), size);
    this.fd = fd;
    this.size = size;
  }

  private load(position: number, nBytes: number): Uint8Array {
    const n = Math.max(0, Math.min(this.size - position, nBytes));
    let target: Uint8Array;
    if (n < SMALL_READ) target = new Uint8Array(n);
    else {
      this.slot ^= 1;
      if (this.ring[this.slot].length < n) this.ring[this.slot] = new Uint8Array(Math.ceil(n * 1.25));
      target = this.ring[this.slot].subarray(0, n);
    }
    let done = 0;
    while (done < n) {
      const got = fs.readSync(this.fd, target, done, n - done, position + done);
      if (got <= 0) break;
      done += got;
    }
    return target.subarray(0, done);
  }

  override read(nBytes?: number | null): Uint8Array | null {
    if (this.position >= this.size) return null;
    const want = typeof nBytes === 'number' ? nBytes : this.size - this.position;
    const out = this.load(this.position, want);
    this.position += out.length;
    return out;
  }

  override readAt(position: number, nBytes: number): Uint8Array {
    return this.load(position, nBytes);
  }

  override close(): void {
    // the descriptor is closed by the scan
  }
}

/** Whether a file is an Arrow IPC file (random-access format, "ARROW1" magic). */
export function isIpcFile(file: string): boolean {
  const head = Buffer.alloc(6);
  const fd = fs.openSync(file, 'r');
  try {
    return fs.readSync(fd, head, 0, 6, 0) === 6 && head.toString('latin1') === 'ARROW1';
  } finally {
    fs.closeSync(fd);
  }
}

type FileReaderImpl = new (source: RandomAccessFile) => unknown;

/**
 * apache-arrow builds its synchronous file reader around an internal implementation class that
 * accepts any RandomAccessFile but is not exported; it is found from a reader of a tiny table.
 * Null when this version of the library is built differently (the caller then reads normally).
 */
function fileReaderImpl(): FileReaderImpl | null {
  const tiny = arrow.tableToIPC(arrow.tableFromArrays({ x: Float64Array.of(0) }), 'file');
  const reader = arrow.RecordBatchReader.from(tiny) as unknown as { _impl?: { constructor?: unknown } };
  const impl = reader._impl?.constructor;
  return typeof impl === 'function' ? (impl as FileReaderImpl) : null;
}

/** Whether scanIpcFile can be used with this version of apache-arrow. */
export function canScanIpcFiles(): boolean {
  return fileReaderImpl() !== null;
}

/**
 * The record batches of an Arrow IPC file, in order, read with reused buffers (see the file
 * comment for how long a batch stays valid).
 * @throws Error when this apache-arrow version offers no file reader to build on (canScanIpcFiles)
 */
export function* scanIpcFile(file: string): Generator<arrow.RecordBatch> {
  const Impl = fileReaderImpl();
  if (Impl === null) throw new Error('scanIpcFile: this apache-arrow version has no file reader implementation to build on');
  const fd = fs.openSync(file, 'r');
  try {
    const RecordBatchFileReader = arrow.RecordBatchFileReader as unknown as new (impl: unknown) => arrow.RecordBatchFileReader;
    const reader = new RecordBatchFileReader(new Impl(new ReusingFile(fd, fs.fstatSync(fd).size)));
    reader.open();
    for (let i = 0; i < reader.numRecordBatches; i++) {
      const batch = reader.readRecordBatch(i);
      if (batch === null) throw new Error(`${file}: record batch ${i} of ${reader.numRecordBatches} cannot be read`);
      yield batch;
    }
  } finally {
    fs.closeSync(fd);
  }
}
