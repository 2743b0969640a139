/**
 * The final table(s) of a run, written while the run goes on: every committed segment is also
 * appended to the output under its temporary name, so finishing a run only writes the footer and
 * renames (no serial re-read of the whole table at the end). A resumed run replays the
 * segments committed by earlier processes in their place. Interrupted or failed runs abandon the
 * temporary file; the segments stay the source of truth.
 *
 * Exact cover: every batch must continue the scenario ids where the previous one stopped, and
 * publish() refuses unless the rows cover the run's range exactly once, so a table with a row
 * missing or repeated is never published.
 */
import * as arrow from 'apache-arrow';
import { RunError } from '../errors.js';
import { COLUMN_STATUSES, type ColumnStatus } from '../physics/types.js';
import { withSharedDictionary } from '../io/arrow-batch.js';
import { readIpcBatches } from '../io/ipc-file.js';
import type { OutputFormat } from '../io/output-format.js';
import type { Segment } from '../io/segment-store.js';
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

/**
 * Check that `batch` holds scenario ids next, next+1, ... and return the id after its last row.
 * @throws RunError naming the first row out of place
 */
export function checkScenarioIds(batch: arrow.RecordBatch, next: number, where: string): number {
  const col = batch.getChild('scenario_id');
  if (col === null) throw new RunError(`${where}: the rows carry no scenario_id`);
  let expected = next;
  for (const data of col.data) {
    const values = data.values as BigInt64Array;
    for (let i = 0; i < data.length; i++) {
      const id = Number(values[data.offset + i]);
      if (id !== expected) {
        throw new RunError(`${where}: row of scenario ${id} found where scenario ${expected} belongs (rows missing, repeated or out of order)`);
      }
      expected++;
    }
  }
  return expected;
}

export class Publication {
  readonly counts = emptyCounts();
  /** the scenario id the next batch must start with */
  private nextRow: number;

  private constructor(
    private readonly range: { readonly start: number; readonly end: number },
    private readonly results: TableSink,
    private readonly resultsSchema: arrow.Schema,
    private readonly dictionary: arrow.Vector<arrow.Utf8>,
    private readonly profiles: { readonly sink: TableSink; readonly schema: arrow.Schema } | null,
    private readonly partialDir: string,
  ) {
    this.nextRow = range.start;
  }

  /** Open the sinks (temporary names) for the results table and, optionally, the profile table. */
  static async open(
    range: { readonly start: number; readonly end: number },
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
      range, sink, results.schema, dictionary,
      profileSink === null || profiles === null ? null : { sink: profileSink, schema: profiles.schema },
      partialDir,
    );
  }

  private fail(err: unknown): RunError {
    if (err instanceof RunError) return err;
    const why = err instanceof Error ? err.message : String(err);
    // the sinks already name the file they could not write
    const what = why.startsWith('cannot write') ? why : `cannot write ${this.results.tmpPath}: ${why}`;
    return new RunError(`${what}. Every committed row is kept in ${this.partialDir}; fix the problem and rerun the same command with --resume.`);
  }

  /** Append the batches of one committed segment (built with the shared dictionary). */
  async append(batches: readonly arrow.RecordBatch[], profileBatches: readonly arrow.RecordBatch[] | null): Promise<void> {
    try {
      if (this.profiles !== null && profileBatches !== null) for (const b of profileBatches) await this.profiles.sink.write(b);
      for (const b of batches) await this.writeResults(b, 'computed rows');
    } catch (err) {
      throw this.fail(err);
    }
  }

  private async writeResults(b: arrow.RecordBatch, where: string): Promise<void> {
    this.nextRow = checkScenarioIds(b, this.nextRow, where);
    countStatuses(b, this.counts);
    await this.results.write(b);
  }

  /** Feed one segment an earlier process committed (resume), one batch at a time. */
  async replay(seg: Segment): Promise<void> {
    try {
      if (this.profiles !== null) {
        for await (const b of readIpcBatches(seg.profileFile)) await this.profiles.sink.write(new arrow.RecordBatch(this.profiles.schema, b.data));
      }
      for await (const b of readIpcBatches(seg.file)) {
        await this.writeResults(withSharedDictionary(b, this.resultsSchema, this.dictionary), `segment ${seg.file}`);
      }
      if (this.nextRow !== seg.end) throw new RunError(`segment ${seg.file}: holds rows up to ${this.nextRow}, its name says ${seg.end}`);
    } catch (err) {
      throw this.fail(err);
    }
  }

  /** Finish both files; the profile table first, so a published results table means a complete run. */
  async publish(): Promise<void> {
    if (this.nextRow !== this.range.end) {
      await this.abort();
      throw new RunError(
        `refusing to publish ${this.results.finalPath}: it would hold rows ${this.range.start}-${this.nextRow} of ${this.range.start}-${this.range.end}. ` +
          `Every committed row is kept in ${this.partialDir}; rerun the same command with --resume.`,
      );
    }
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
