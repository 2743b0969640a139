/**
 * Checks on a run's output before any work: the folder is really writable, nothing is overwritten
 * by accident, leftovers of a killed process are cleared, and a finished table is recognised so
 * that --resume of a complete run does nothing.
 */
import fs from 'node:fs';
import path from 'node:path';
import { InputError } from '../errors.js';
import type { PartialManifest } from '../io/segment-store.js';
import { readTableSchema } from '../io/table-reader.js';

/** Refuse, before any work, outputs that cannot be written or would be overwritten. */
export function checkOutput(outPath: string, force: boolean, resume: boolean): void {
  const dir = path.dirname(path.resolve(outPath));
  if (!fs.existsSync(dir)) throw new InputError(`--output: folder ${dir} does not exist`);
  // a real probe: permission bits say nothing for root, read-only mounts or full disks
  const probe = path.join(dir, `.meltsweep-probe-${process.pid}`);
  try {
    fs.writeFileSync(probe, 'probe');
  } catch (err) {
    const code = (err as NodeJS.ErrnoException).code ?? String(err);
    throw new InputError(`--output: cannot write in folder ${dir} (${code}); choose a writable folder`);
  } finally {
    fs.rmSync(probe, { force: true });
  }
  if (fs.existsSync(outPath) && !force && !resume) {
    throw new InputError(`--output: ${outPath} already exists; use --force to replace it (or --resume to finish a partial run)`);
  }
}

/** Remove temporary files left by a process killed while publishing. */
export function removeStaleTemporaries(outPath: string): void {
  const dir = path.dirname(path.resolve(outPath));
  const prefix = `${path.basename(outPath)}.tmp-`;
  for (const name of fs.readdirSync(dir)) if (name.startsWith(prefix)) fs.rmSync(path.join(dir, name), { force: true });
}

/** Whether the published table(s) are a finished run of this sweep, rows and profile grid. */
export async function existingOutputMatches(outPath: string, manifest: PartialManifest, profilesPath: string | null): Promise<boolean> {
  const matches = async (file: string, grid: string | undefined): Promise<boolean> => {
    const md = (await readTableSchema(file)).metadata;
    return (
      md.get('meltsweep.sweep_hash') === manifest.sweepHash &&
      md.get('meltsweep.row_range') === `${manifest.rowStart}-${manifest.rowEnd}` &&
      md.get('meltsweep.profile_grid') === grid
    );
  };
  try {
    return (await matches(outPath, undefined)) && (profilesPath === null || (await matches(profilesPath, manifest.profileGrid)));
  } catch {
    return false;
  }
}
