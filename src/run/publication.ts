/**
 * The final table(s) of a run, written while the run goes on: every committed segment is also
 * appended to the output under its temporary name, so finishing a run only writes the footer and
 * renames (no serial re-read of the whole table at the end). A resumed run first replays the
 * segments committed by earlier processes. Interrupted or failed runs abandon the temporary file;
 * the segments stay the source of truth.
 */
import * as arrow from 'apache-arrow';
import { RunError } from '../errors.js';
import { COLUMN_STATUSES, type ColumnStatus } from '../physics/types.js';
import { withSharedDictionary } from '../io/arrow-batch.js';
import { readIpcBatches } from '../io/ipc-file.js';
import type { OutputFormat } from '../io/output-format.js';
import type { SegmentStore } from '../io/segment-store.js';
import { openTableSink, type TableSink, type TableSinkOptions } from '../io/table-sink.js';

export function emptyCounts(): Record<ColumnStatus, number> {
  return Object.fromEntries(COLUMN_STATUSES.map((s) => [s, 0])) as Record<ColumnStatus, number>;
}

/** Add a batch's rows to counts by status. */
export function countStatuses(batch: arrow.RecordBatch, counts: Record<ColumnStatus, number>): void {
  const col = batch.getChild('status');
  if (col === null) return;
  for (const data of col.data) {
    const dict = data.dictionary as arrow.Vector<arrow.Utf8>;
    const names = Array.from({ length: dict.length }, (_, i) => dict.get(i) as ColumnStatus);
    const codes = data.values as Int8Array;
    for (let i = 0; i < data.length; i++) counts[names[codes[data.offset + i]]]++;
  }
}

export interface PublicationTarget {
  readonly path: string;
  readonly schema: arrow.Schema;
}

export class Publication {
  readonly counts = emptyCounts();

  private constructor(
    private readonly results: TableSink,
    private readonly resultsSchema: arrow.Schema,
    private readonly dictionary: arrow.Vector<arrow.Utf8>,
    private readonly profiles: { readonly sink: TableSink; readonly schema: arrow.Schema } | null,
    private readonly partialDir: string,
  ) {}

  /** Open the sinks (temporary names) for the results table and, optionally, the profile table. */
  static async open(
    format: OutputFormat,
    results: PublicationTarget,
    dictionary: arrow.Vector<arrow.Utf8>,
    profiles: PublicationTarget | null,
    partialDir: string,
    writer?: TableSinkOptions,
  ): Promise<Publication> {
    const sink = await openTableSink(format, results.path, results.schema, writer);
    let profileSink: TableSink | null = null;
    try {
      if (profiles !== null) profileSink = await openTableSink(format, profiles.path, profiles.schema, writer);
    } catch (err) {
      await sink.abort();
      throw err;
    }
    return new Publication(
      sink, results.schema, dictionary,
      profileSink === null || profiles === null ? null : { sink: profileSink, schema: profiles.schema },
      partialDir,
    );
  }

  private fail(err: unknown): RunError {
    const why = err instanceof Error ? err.message : String(err);
    return new RunError(`cannot write ${this.results.tmpPath}: ${why}. Every committed row is kept in ${this.partialDir}; fix the problem and rerun the same command with --resume.`);
  }

  /** Append the batches of one committed segment (built with the shared dictionary). */
  async append(batches: readonly arrow.RecordBatch[], profileBatches: readonly arrow.RecordBatch[] | null): Promise<void> {
    try {
      if (this.profiles !== null && profileBatches !== null) for (const b of profileBatches) await this.profiles.sink.write(b);
      for (const b of batches) {
        countStatuses(b, this.counts);
        await this.results.write(b);
      }
    } catch (err) {
      throw this.fail(err);
    }
  }

  /** Feed the segments an earlier process committed (resume), one batch at a time. */
  async replay(store: SegmentStore): Promise<void> {
    try {
      for (const seg of store.segments()) {
        if (this.profiles !== null) {
          for await (const b of readIpcBatches(seg.profileFile)) await this.profiles.sink.write(new arrow.RecordBatch(this.profiles.schema, b.data));
        }
        for await (const b of readIpcBatches(seg.file)) {
          const rebuilt = withSharedDictionary(b, this.resultsSchema, this.dictionary);
          countStatuses(rebuilt, this.counts);
          await this.results.write(rebuilt);
        }
      }
    } catch (err) {
      throw this.fail(err);
    }
  }

  /** Finish both files; the profile table first, so a published results table means a complete run. */
  async publish(): Promise<void> {
    try {
      if (this.profiles !== null) await this.profiles.sink.publish();
      await this.results.publish();
    } catch (err) {
      await this.abort();
      throw this.fail(err);
    }
  }

  /** Abandon the temporary files (interruption or failure). */
  async abort(): Promise<void> {
    await this.results.abort().catch(() => undefined);
    await this.profiles?.sink.abort().catch(() => undefined);
  }
}
