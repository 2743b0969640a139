/**
 * The partial-run folder (`OUT.partial/`) that makes runs survive Ctrl-C, kill -9 and disk
 * errors. Finished rows are committed as segments: each a complete Arrow IPC stream holding a
 * contiguous row range, written under a temporary name, fsynced and renamed, then recorded in
 * the journal (`segments.jsonl`: row range, row count, size and CRC-32 of the file). A resumed
 * run trusts a segment only when the journal vouches for it and its bytes still match; any other
 * segment (damaged, truncated, emptied, deleted, or never journalled because of a crash) is
 * named and its rows are computed again. The manifest carries a marker so that meltsweep never
 * deletes a folder it did not create.
 */
import * as arrow from 'apache-arrow';
import fs from 'node:fs';
import path from 'node:path';
import { crc32, crcHex, fileCrc32 } from './checksum.js';
import { fsyncDir, writeFileAtomic, writeFileAtomicAsync } from './ipc-file.js';

/** The marker every partial-run manifest carries. */
const PARTIAL_RUN_KIND = 'meltsweep partial run';

export interface PartialManifest {
  readonly sweepHash: string;
  readonly rowStart: number;
  readonly rowEnd: number;
  readonly chunkSize: number;
  readonly toolVersion: string;
  /** the profile grid "FROM:TO:STEP" (GPa) when the run writes a profile table; absent otherwise */
  readonly profileGrid?: string;
}

/** One file's identity in the journal. */
export interface FileCheck {
  readonly bytes: number;
  /** CRC-32 of the file's bytes, 8 hex digits */
  readonly crc32: string;
}

export interface Segment {
  readonly start: number;
  readonly end: number;
  readonly file: string;
  /** the segment's profile rows (runs with a profile grid), committed before the segment itself */
  readonly profileFile: string;
}

/** A journal line: a committed segment (row count = end - start). */
interface JournalEntry extends FileCheck {
  readonly start: number;
  readonly end: number;
  readonly rows: number;
  readonly profiles?: FileCheck;
}

/** What a resume found in the folder. */
export interface SegmentCheck {
  /** segments whose bytes match the journal, in row order, non-overlapping */
  readonly kept: readonly Segment[];
  /** segments that failed, by file name, with the reason; their rows are computed again */
  readonly dropped: readonly { readonly name: string; readonly why: string }[];
}

const SEGMENT_RE = /^seg-(\d{15})-(\d{15})\.arrows$/;
const PROFILE_RE = /^seg-(\d{15})-(\d{15})\.profiles\.arrows$/;
const JOURNAL = 'segments.jsonl';
const MANIFEST = 'manifest.json';
const pad = (n: number): string => String(n).padStart(15, '0');
const segmentName = (start: number, end: number): string => `seg-${pad(start)}-${pad(end)}.arrows`;
const profileName = (start: number, end: number): string => `seg-${pad(start)}-${pad(end)}.profiles.arrows`;

/** Every name meltsweep itself writes in a partial-run folder. */
function isOwnName(name: string): boolean {
  return SEGMENT_RE.test(name) || PROFILE_RE.test(name) || name === JOURNAL || name === MANIFEST || /\.tmp-\d+$/.test(name);
}

export function partialDirFor(outPath: string): string {
  return `${outPath}.partial`;
}

/**
 * Whether `dir` holds only files meltsweep writes in a partial-run folder (so removing it can
 * lose nothing of the user's); the foreign names found otherwise.
 */
export function foreignEntries(dir: string): string[] {
  return fs.readdirSync(dir).filter((n) => !isOwnName(n));
}

/** Why a manifest's content is not one of ours, or null when it is. */
function manifestProblem(data: unknown): string | null {
  if (typeof data !== 'object' || data === null) return 'not a JSON object';
  const m = data as Record<string, unknown>;
  if (typeof m.sweepHash !== 'string') return 'no sweepHash';
  if (!Number.isSafeInteger(m.rowStart) || !Number.isSafeInteger(m.rowEnd) || (m.rowEnd as number) < (m.rowStart as number)) return 'no valid row range';
  if (!Number.isSafeInteger(m.chunkSize) || (m.chunkSize as number) < 1) return 'no valid chunk size';
  if (typeof m.toolVersion !== 'string') return 'no toolVersion';
  if (m.profileGrid !== undefined && typeof m.profileGrid !== 'string') return 'profileGrid is not text';
  return null;
}

/** The result of opening a partial-run folder. */
export type OpenedPartial =
  | { readonly kind: 'ok'; readonly store: SegmentStore }
  /** no folder, or no manifest and nothing else of value (a crash while the folder was being created) */
  | { readonly kind: 'empty' }
  /** a manifest that cannot be read or is not ours, with the reason */
  | { readonly kind: 'damaged'; readonly why: string };

export class SegmentStore {
  private constructor(
    readonly dir: string,
    readonly manifest: PartialManifest,
  ) {}

  /** Start a new partial run (the folder must not exist). */
  static create(dir: string, manifest: PartialManifest): SegmentStore {
    fs.mkdirSync(dir, { recursive: false });
    writeFileAtomic(path.join(dir, MANIFEST), JSON.stringify({ kind: PARTIAL_RUN_KIND, ...manifest }, null, 2));
    fsyncDir(path.dirname(dir));
    return new SegmentStore(dir, manifest);
  }

  /** Open an existing partial run, telling an empty leftover from a damaged manifest. */
  static inspect(dir: string): OpenedPartial {
    const file = path.join(dir, MANIFEST);
    let text: string;
    try {
      text = fs.readFileSync(file, 'utf8');
    } catch (err) {
      const code = (err as NodeJS.ErrnoException).code;
      if (code === 'ENOENT') {
        if (!fs.existsSync(dir)) return { kind: 'empty' };
        const valuable = fs.readdirSync(dir).filter((n) => !/\.tmp-\d+$/.test(n));
        return valuable.length === 0 ? { kind: 'empty' } : { kind: 'damaged', why: `${MANIFEST} is missing` };
      }
      return { kind: 'damaged', why: `${MANIFEST} cannot be read (${code ?? String(err)})` };
    }
    let data: unknown;
    try {
      data = JSON.parse(text);
    } catch (err) {
      return { kind: 'damaged', why: `${MANIFEST} is not valid JSON (${err instanceof Error ? err.message : String(err)})` };
    }
    const problem = manifestProblem(data);
    if (problem !== null) return { kind: 'damaged', why: `${MANIFEST} is not a partial-run manifest (${problem})` };
    const m = data as PartialManifest & { kind?: unknown };
    const manifest: PartialManifest = {
      sweepHash: m.sweepHash, rowStart: m.rowStart, rowEnd: m.rowEnd, chunkSize: m.chunkSize, toolVersion: m.toolVersion,
      ...(m.profileGrid !== undefined ? { profileGrid: m.profileGrid } : {}),
    };
    return { kind: 'ok', store: new SegmentStore(dir, manifest) };
  }

  /** Open an existing partial run; null when the folder has no readable manifest. */
  static open(dir: string): SegmentStore | null {
    const r = SegmentStore.inspect(dir);
    return r.kind === 'ok' ? r.store : null;
  }

  /** The journal's entries; `torn` when some line could not be read (a crash while appending). */
  private journal(): { entries: JournalEntry[]; torn: boolean } {
    let text: string;
    try {
      text = fs.readFileSync(path.join(this.dir, JOURNAL), 'utf8');
    } catch {
      return { entries: [], torn: false };
    }
    const entries: JournalEntry[] = [];
    let torn = text.length > 0 && !text.endsWith('\n');
    for (const line of text.split('\n')) {
      if (line.trim() === '') continue;
      try {
        const e = JSON.parse(line) as JournalEntry;
        if (Number.isSafeInteger(e.start) && Number.isSafeInteger(e.end) && e.rows === e.end - e.start && typeof e.crc32 === 'string') entries.push(e);
        else torn = true;
      } catch {
        // a torn last line (crash while appending): that segment is not vouched for
        torn = true;
      }
    }
    return { entries, torn };
  }

  /**
   * Check every segment against the journal: kept are those whose size and CRC-32 match (and,
   * with `withProfiles`, whose profile file matches too), in row order without overlaps.
   * Everything else is listed in `dropped`, with the reason; with `repair` it is also removed
   * from the folder (with leftover temporary files of a crash mid-write) and the journal is
   * rewritten to list only the kept segments.
   */
  verify(withProfiles: boolean, repair = true): SegmentCheck {
    const onDisk = new Set<string>();
    for (const name of fs.readdirSync(this.dir)) {
      if (SEGMENT_RE.test(name) || PROFILE_RE.test(name)) onDisk.add(name);
      else if (repair && /\.tmp-\d+$/.test(name)) fs.rmSync(path.join(this.dir, name), { force: true });
    }
    const kept: Segment[] = [];
    const dropped: { name: string; why: string }[] = [];
    const { entries: unsorted, torn } = this.journal();
    const entries = unsorted.sort((a, b) => a.start - b.start);
    let covered = this.manifest.rowStart;
    for (const e of entries) {
      const name = segmentName(e.start, e.end);
      const why = this.checkEntry(e, name, covered, withProfiles);
      if (why !== null) {
        dropped.push({ name, why });
        continue;
      }
      kept.push({ start: e.start, end: e.end, file: path.join(this.dir, name), profileFile: path.join(this.dir, profileName(e.start, e.end)) });
      covered = e.end;
      onDisk.delete(name);
      onDisk.delete(profileName(e.start, e.end));
    }
    // segments the journal does not vouch for (a crash between the rename and the journal line)
    for (const name of onDisk) {
      if (SEGMENT_RE.test(name) && !dropped.some((d) => d.name === name)) dropped.push({ name, why: 'not recorded in the journal' });
      if (repair) fs.rmSync(path.join(this.dir, name), { force: true });
    }
    if (repair && (dropped.length > 0 || torn)) this.rewriteJournal(entries.filter((e) => kept.some((k) => k.start === e.start && k.end === e.end)));
    return { kept, dropped };
  }

  private checkEntry(e: JournalEntry, name: string, covered: number, withProfiles: boolean): string | null {
    if (e.start < covered || e.end > this.manifest.rowEnd || e.end <= e.start) return `rows ${e.start}-${e.end} overlap another segment or lie outside the run`;
    const why = checkFile(path.join(this.dir, name), e);
    if (why !== null) return why;
    if (withProfiles) {
      if (e.profiles === undefined) return 'its profile rows are not recorded in the journal';
      const pwhy = checkFile(path.join(this.dir, profileName(e.start, e.end)), e.profiles);
      if (pwhy !== null) return `its profile file ${pwhy}`;
    }
    return null;
  }

  private rewriteJournal(entries: readonly JournalEntry[]): void {
    writeFileAtomic(path.join(this.dir, JOURNAL), entries.map((e) => `${JSON.stringify(e)}\n`).join(''));
  }

  /** Committed segments in row order that pass verification (read only: the folder is not changed). */
  segments(): Segment[] {
    return [...this.verify(false, false).kept];
  }

  /** First row of the first gap: the rows from rowStart up to it are committed and verified. */
  committedEnd(): number {
    let next = this.manifest.rowStart;
    for (const s of this.segments()) {
      if (s.start !== next) break;
      next = s.end;
    }
    return next;
  }

  /** Rows committed and verified (in any order). */
  committedRows(): number {
    return this.segments().reduce((n, s) => n + (s.end - s.start), 0);
  }

  /**
   * Commit rows [start, end) held in `batches` as one segment (atomic), then record it in the
   * journal. With `profileBatches` (runs with a profile grid) the profile rows are written
   * first, so a journalled segment always has its profile rows.
   */
  async commit(start: number, end: number, batches: readonly arrow.RecordBatch[], profileBatches?: readonly arrow.RecordBatch[]): Promise<void> {
    let profiles: FileCheck | undefined;
    if (profileBatches !== undefined) {
      const profileBytes = arrow.tableToIPC(new arrow.Table(profileBatches as arrow.RecordBatch[]), 'stream');
      await writeFileAtomicAsync(path.join(this.dir, profileName(start, end)), profileBytes);
      profiles = { bytes: profileBytes.byteLength, crc32: crcHex(crc32(profileBytes)) };
    }
    const bytes = arrow.tableToIPC(new arrow.Table(batches as arrow.RecordBatch[]), 'stream');
    await writeFileAtomicAsync(path.join(this.dir, segmentName(start, end)), bytes);
    const entry: JournalEntry = { start, end, rows: end - start, bytes: bytes.byteLength, crc32: crcHex(crc32(bytes)), ...(profiles ? { profiles } : {}) };
    const fh = await fs.promises.open(path.join(this.dir, JOURNAL), 'a');
    try {
      await fh.write(`${JSON.stringify(entry)}\n`);
      await fh.sync();
    } finally {
      await fh.close();
    }
  }

  /**
   * Remove the folder: only the files meltsweep writes are deleted, so anything else a user
   * put there survives (the folder then stays).
   */
  remove(): void {
    removePartialDir(this.dir);
  }
}

/** Delete meltsweep's own files in a partial-run folder, then the folder if it is empty. */
export function removePartialDir(dir: string): void {
  if (!fs.existsSync(dir)) return;
  for (const name of fs.readdirSync(dir)) if (isOwnName(name)) fs.rmSync(path.join(dir, name), { force: true });
  try {
    fs.rmdirSync(dir);
  } catch {
    // something that is not ours is left inside: keep it
  }
}

/** Why a file does not match its journal record, or null when it does. */
function checkFile(file: string, want: FileCheck): string | null {
  let size: number;
  try {
    size = fs.statSync(file).size;
  } catch {
    return 'is missing';
  }
  if (size !== want.bytes) return size === 0 ? 'is empty' : `has ${size} bytes, ${want.bytes} were committed (truncated or altered)`;
  const got = fileCrc32(file);
  if (got.crc32 !== want.crc32) return `fails its checksum (CRC-32 ${got.crc32}, committed ${want.crc32})`;
  return null;
}
