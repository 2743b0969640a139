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

/**
 * Refuse, before any work, outputs that cannot be written or would be overwritten: a missing or
 * unwritable folder, a folder as the output, an input file as the output (even with --force), and
 * an existing file or symbolic link (a dangling one too) without --force or --resume.
 * @param option the option naming the path in messages
 * @param inputs files the command reads (the sweep file): never overwritten
 */
export function checkOutput(outPath: string, force: boolean, resume: boolean, option = '--output', inputs: readonly string[] = []): void {
  if (outPath.trim() === '') throw new InputError(`${option}: the output name is empty; give a file name, e.g. ${option} results.arrow`);
  const dir = path.dirname(path.resolve(outPath));
  if (!fs.existsSync(dir)) throw new InputError(`${option}: folder ${dir} does not exist`);
  const st = fs.statSync(outPath, { throwIfNoEntry: false });
  if (st?.isDirectory() === true) throw new InputError(`${option}: ${outPath} is a folder; give a file name inside it, e.g. ${path.join(outPath, 'results.arrow')}`);
  for (const input of inputs) {
    if (sameFile(outPath, input)) throw new InputError(`${option}: ${outPath} is the input file ${input}; writing there would destroy it, choose another name`);
  }
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
  const link = fs.lstatSync(outPath, { throwIfNoEntry: false });
  if (link !== undefined && st === undefined && !force) {
    throw new InputError(`${option}: ${outPath} is a symbolic link to a missing file (${fs.readlinkSync(outPath)}); use --force to replace the link`);
  }
  if (link !== undefined && !force && !resume) {
    throw new InputError(`${option}: ${outPath} already exists; use --force to replace it${option === '--output' ? ' (or --resume to finish a partial run)' : ''}`);
  }
}

/** Refuse a file meltsweep writes beside an output (profile table, seal) that exists, unless forced. */
export function checkCompanion(file: string, what: string, force: boolean, option = '--output'): void {
  if (force) return;
  if (fs.lstatSync(file, { throwIfNoEntry: false }) !== undefined) {
    throw new InputError(`${option}: ${file} (${what}) already exists; use --force to replace it`);
  }
}

/** Whether two paths name the same existing file (through links and relative names). */
function sameFile(a: string, b: string): boolean {
  const sa = fs.statSync(a, { throwIfNoEntry: false });
  const sb = fs.statSync(b, { throwIfNoEntry: false });
  if (sa !== undefined && sb !== undefined) return sa.dev === sb.dev && sa.ino === sb.ino;
  return path.resolve(a) === path.resolve(b);
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
