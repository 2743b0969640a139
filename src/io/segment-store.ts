/**
 * The partial-run folder (`OUT.partial/`) that makes runs survive Ctrl-C, kill -9 and disk
 * errors. Finished rows are committed as segments: each a complete Arrow IPC stream holding a
 * contiguous row range, written under a temporary name, fsynced and renamed. A segment is
 * therefore either absent or whole, and the folder listing is the journal. When the run is
 * complete the segments are concatenated into the final file (published atomically) and the
 * folder is removed.
 */
import * as arrow from 'apache-arrow';
import fs from 'node:fs';
import path from 'node:path';
import { fsyncDir, writeFileAtomic, writeFileAtomicAsync } from './ipc-file.js';

export interface PartialManifest {
  readonly sweepHash: string;
  readonly rowStart: number;
  readonly rowEnd: number;
  readonly chunkSize: number;
  readonly toolVersion: string;
  /** the profile grid "FROM:TO:STEP" (GPa) when the run writes a profile table; absent otherwise */
  readonly profileGrid?: string;
}

export interface Segment {
  readonly start: number;
  readonly end: number;
  readonly file: string;
  /** the segment's profile rows (runs with a profile grid), committed before the segment itself */
  readonly profileFile: string;
}

const SEGMENT_RE = /^seg-(\d{15})-(\d{15})\.arrows$/;
const PROFILE_RE = /^seg-(\d{15})-(\d{15})\.profiles\.arrows$/;
const pad = (n: number): string => String(n).padStart(15, '0');
const profileName = (start: number, end: number): string => `seg-${pad(start)}-${pad(end)}.profiles.arrows`;

export function partialDirFor(outPath: string): string {
  return `${outPath}.partial`;
}

export class SegmentStore {
  private constructor(
    readonly dir: string,
    readonly manifest: PartialManifest,
  ) {}

  /** Start a new partial run (the folder must not exist). */
  static create(dir: string, manifest: PartialManifest): SegmentStore {
    fs.mkdirSync(dir, { recursive: false });
    writeFileAtomic(path.join(dir, 'manifest.json'), JSON.stringify(manifest, null, 2));
    fsyncDir(path.dirname(dir));
    return new SegmentStore(dir, manifest);
  }

  /** Open an existing partial run; null when the folder has no readable manifest. */
  static open(dir: string): SegmentStore | null {
    try {
      const manifest = JSON.parse(fs.readFileSync(path.join(dir, 'manifest.json'), 'utf8')) as PartialManifest;
      return new SegmentStore(dir, manifest);
    } catch {
      return null;
    }
  }

  /**
   * Committed segments in row order, checked to be contiguous from the start of the run.
   * Leftover temporary files (a crash mid-write) are removed; a segment that does not
   * continue the sequence is an error (the folder was tampered with).
   */
  segments(): Segment[] {
    const found: Segment[] = [];
    const profiles = new Set<string>();
    for (const name of fs.readdirSync(this.dir)) {
      const m = SEGMENT_RE.exec(name);
      if (m) {
        const [start, end] = [Number(m[1]), Number(m[2])];
        found.push({ start, end, file: path.join(this.dir, name), profileFile: path.join(this.dir, profileName(start, end)) });
      } else if (PROFILE_RE.test(name)) profiles.add(name);
      else if (name.includes('.tmp')) fs.rmSync(path.join(this.dir, name), { force: true });
    }
    // profile rows whose segment was never committed (a crash between the two renames) are dropped
    for (const s of found) profiles.delete(path.basename(s.profileFile));
    for (const name of profiles) fs.rmSync(path.join(this.dir, name), { force: true });
    found.sort((a, b) => a.start - b.start);
    let next = this.manifest.rowStart;
    for (const s of found) {
      if (s.start !== next) throw new Error(`partial run ${this.dir}: segment ${path.basename(s.file)} does not continue at row ${next}`);
      next = s.end;
    }
    return found;
  }

  /** First row not yet committed. */
  committedEnd(): number {
    const segs = this.segments();
    return segs.length === 0 ? this.manifest.rowStart : segs[segs.length - 1].end;
  }

  /**
   * Commit rows [start, end) held in `batches` as one segment (atomic). With `profileBatches`
   * (runs with a profile grid) the profile rows are committed first, so a committed segment
   * always has its profile rows and a resume keeps the two tables consistent.
   */
  async commit(start: number, end: number, batches: readonly arrow.RecordBatch[], profileBatches?: readonly arrow.RecordBatch[]): Promise<void> {
    if (profileBatches !== undefined) {
      const profileBytes = arrow.tableToIPC(new arrow.Table(profileBatches as arrow.RecordBatch[]), 'stream');
      await writeFileAtomicAsync(path.join(this.dir, profileName(start, end)), profileBytes);
    }
    const bytes = arrow.tableToIPC(new arrow.Table(batches as arrow.RecordBatch[]), 'stream');
    await writeFileAtomicAsync(path.join(this.dir, `seg-${pad(start)}-${pad(end)}.arrows`), bytes);
  }

  remove(): void {
    fs.rmSync(this.dir, { recursive: true, force: true });
  }
}
