/**
 * Arrow IPC files on disk: a streaming file-format writer with bounded memory (every batch
 * reaches the disk before the next is accepted), atomic publication (temporary name, fsync,
 * rename), and batch-by-batch readers.
 */
import * as arrow from 'apache-arrow';
import fs from 'node:fs';
import path from 'node:path';
import { ChecksummedFileWriter } from './checksummed-writer.js';
import { trackTemporary, untrackTemporary } from './exit-cleanup.js';

/**
 * Write all of `bytes` at the file's current position. fs.writeSync may write fewer bytes than
 * asked (a disk filling up does exactly that before it raises ENOSPC): loop until all are
 * written, so a short write can never pass for a complete one.
 */
export function writeAllSync(fd: number, bytes: Uint8Array): void {
  let done = 0;
  while (done < bytes.byteLength) {
    const n = fs.writeSync(fd, bytes, done, bytes.byteLength - done);
    if (n <= 0) throw new Error(`short write: ${done} of ${bytes.byteLength} bytes`);
    done += n;
  }
}

/** Flush pending microtasks so the writer's byte queue is drained into the file. */
function drainTick(): Promise<void> {
  return new Promise((resolve) => setImmediate(resolve));
}

/**
 * Writes an Arrow IPC file (random-access format) batch by batch to `tmpPath`;
 * `publish()` fsyncs it and renames it to its final name, so a reader never sees a
 * half-written file under the final name.
 */
export class IpcFileSink {
  private readonly fd: number;
  private readonly writer: arrow.RecordBatchFileWriter;
  private readonly pump: Promise<void>;
  private writeError: unknown = null;
  private closed = false;
  rows = 0;

  constructor(
    readonly finalPath: string,
    readonly tmpPath: string,
    schema: arrow.Schema,
  ) {
    const fd = openTemporaryFile(tmpPath);
    // the footer's schema metadata gets the CRC-32 of the data (src/io/table-checksum.ts)
    const writer = new ChecksummedFileWriter();
    writer.reset(undefined, schema);
    this.fd = fd;
    this.writer = writer;
    this.pump = (async () => {
      for await (const bytes of writer) {
        if (this.writeError !== null) continue;
        try {
          writeAllSync(fd, bytes as Uint8Array);
        } catch (err) {
          this.writeError = err;
        }
      }
    })();
  }

  private check(): void {
    throwWriteError(this.writeError, this.tmpPath);
  }

  async write(batch: arrow.RecordBatch): Promise<void> {
    this.writer.write(batch);
    this.rows += batch.numRows;
    await drainTick();
    this.check();
  }

  /** Finish the footer, fsync, rename to the final path and fsync the folder. */
  async publish(): Promise<void> {
    this.writer.finish();
    this.writer.close();
    await this.pump;
    this.check();
    this.closed = true;
    publishTemporaryFile(this.fd, this.tmpPath, this.finalPath);
  }

  /** Abandon the file (removes the temporary file). */
  async abort(): Promise<void> {
    if (this.closed) return;
    this.closed = true;
    await abandonTemporaryFile(this.fd, this.tmpPath, async () => {
      this.writer.close();
      await this.pump;
    });
  }
}

/**
 * Create a temporary file for writing (and reading back: the Parquet sink checksums its data);
 * it is removed if the process is interrupted before it is published.
 */
export function openTemporaryFile(tmpPath: string): number {
  trackTemporary(tmpPath);
  try {
    return fs.openSync(tmpPath, 'w+');
  } catch (err) {
    untrackTemporary(tmpPath);
    throw err;
  }
}

/** fsync and close a finished temporary file, rename it to its final name, fsync the folder. */
export function publishTemporaryFile(fd: number, tmpPath: string, finalPath: string): void {
  fs.fsyncSync(fd);
  fs.closeSync(fd);
  fs.renameSync(tmpPath, finalPath);
  untrackTemporary(tmpPath);
  fsyncDir(path.dirname(finalPath));
}

/** Rethrow what a sink's writer failed with (null: nothing failed), naming the file. */
export function throwWriteError(error: unknown, tmpPath: string): void {
  if (error !== null) throw new Error(`cannot write ${tmpPath}: ${error instanceof Error ? error.message : String(error)}`);
}

/** Stop a sink's writer (it may be failing already: its error is of no use here) and remove its temporary file. */
export async function abandonTemporaryFile(fd: number, tmpPath: string, stopWriter: () => Promise<void>): Promise<void> {
  try {
    await stopWriter();
  } catch {
    // already failing
  }
  discardTemporaryFile(fd, tmpPath);
}

/** Close (if still open) and remove an abandoned temporary file. */
export function discardTemporaryFile(fd: number, tmpPath: string): void {
  try {
    fs.closeSync(fd);
  } catch {
    // already closed
  }
  fs.rmSync(tmpPath, { force: true });
  untrackTemporary(tmpPath);
}

/** fsync a folder so a rename inside it survives a crash (best effort where unsupported). */
export function fsyncDir(dir: string): void {
  let fd: number | null = null;
  try {
    fd = fs.openSync(dir, 'r');
    fs.fsyncSync(fd);
  } catch {
    // some file systems refuse fsync on folders; the rename is still atomic
  } finally {
    if (fd !== null) fs.closeSync(fd);
  }
}

/** Write bytes to `finalPath` atomically: temporary file, fsync, rename, fsync folder. */
export function writeFileAtomic(finalPath: string, bytes: Uint8Array | string): void {
  const tmp = `${finalPath}.tmp-${process.pid}`;
  const fd = openTemporaryFile(tmp);
  try {
    writeAllSync(fd, typeof bytes === 'string' ? Buffer.from(bytes) : bytes);
  } catch (err) {
    discardTemporaryFile(fd, tmp); // give the space back; the old file (if any) is untouched
    throw err;
  }
  publishTemporaryFile(fd, tmp, finalPath);
}

/**
 * writeFileAtomic without blocking the event loop: the write and the fsync run on libuv's thread
 * pool, so the main thread keeps handing tasks to workers meanwhile.
 */
export async function writeFileAtomicAsync(finalPath: string, bytes: Uint8Array): Promise<void> {
  const tmp = `${finalPath}.tmp-${process.pid}`;
  trackTemporary(tmp);
  const fh = await fs.promises.open(tmp, 'w').catch((err: unknown) => {
    untrackTemporary(tmp);
    throw err;
  });
  try {
    let done = 0;
    while (done < bytes.byteLength) {
      const { bytesWritten } = await fh.write(bytes, done, bytes.byteLength - done);
      if (bytesWritten <= 0) throw new Error(`short write: ${done} of ${bytes.byteLength} bytes`);
      done += bytesWritten;
    }
    await fh.sync();
  } catch (err) {
    await fh.close().catch(() => undefined);
    await fs.promises.rm(tmp, { force: true });
    untrackTemporary(tmp);
    throw err;
  }
  await fh.close();
  await fs.promises.rename(tmp, finalPath);
  untrackTemporary(tmp);
  fsyncDir(path.dirname(finalPath));
}

/** The schema of an Arrow IPC file or stream, read without loading its batches. */
export async function readIpcSchema(filePath: string): Promise<arrow.Schema> {
  const handle = await fs.promises.open(filePath, 'r');
  try {
    const reader = await arrow.RecordBatchReader.from(handle);
    await reader.open();
    return reader.schema;
  } finally {
    await handle.close().catch(() => undefined);
  }
}

/** Batches of an IPC file or stream, one at a time, read from disk as they are needed. */
export async function* readIpcBatches(filePath: string): AsyncGenerator<arrow.RecordBatch> {
  const handle = await fs.promises.open(filePath, 'r');
  try {
    const reader = await arrow.RecordBatchReader.from(handle);
    for await (const batch of reader) yield batch;
  } finally {
    await handle.close().catch(() => undefined);
  }
}
