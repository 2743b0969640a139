/**
 * Calling Slurm's `sbatch`: found on PATH, run with `--parsable`, its job id read from the
 * answer, its own message passed through when it refuses.
 */
import { spawnSync } from 'node:child_process';
import fs from 'node:fs';
import path from 'node:path';
import { RunError } from '../errors.js';

/** The absolute path of a command on PATH, or null when it is not there. */
export function findOnPath(command: string, env: NodeJS.ProcessEnv = process.env): string | null {
  for (const dir of (env.PATH ?? '').split(path.delimiter)) {
    if (dir === '') continue;
    const file = path.join(dir, command);
    try {
      fs.accessSync(file, fs.constants.X_OK);
      if (fs.statSync(file).isFile()) return file;
    } catch {
      // not here
    }
  }
  return null;
}

/** The error for a machine without sbatch. */
export function sbatchMissing(): RunError {
  return new RunError(
    'sbatch is not on PATH: submit needs the Slurm client commands (run it on the cluster\'s login node, or load its Slurm module); ' +
      '--dry-run shows the job scripts and commands without submitting',
  );
}

/**
 * The job id in sbatch's `--parsable` answer: `ID` or `ID;CLUSTER` on the last line.
 * @throws RunError when the answer holds no job id
 */
export function parseSbatchAnswer(stdout: string): string {
  const lines = stdout.split(/\r?\n/).map((l) => l.trim()).filter((l) => l !== '');
  const last = lines[lines.length - 1] ?? '';
  const m = /^(\d+)(?:;\S+)?$/.exec(last);
  if (m === null) throw new RunError(`sbatch answered ${JSON.stringify(stdout.trim())}, which holds no job id (expected "ID" or "ID;CLUSTER" from --parsable)`);
  return m[1];
}

/**
 * Run `sbatch` with these arguments (the first item of `command` is the word sbatch) and return
 * the job id.
 * @param what names the job in messages ("the shard array")
 * @throws RunError when sbatch is missing or refuses the job (its own message included)
 */
export function runSbatch(command: readonly string[], what: string): string {
  const exe = findOnPath('sbatch');
  if (exe === null) throw sbatchMissing();
  const r = spawnSync(exe, command.slice(1), { encoding: 'utf8' });
  if (r.error !== undefined) throw new RunError(`sbatch could not be run for ${what}: ${r.error.message}`);
  if (r.status !== 0) {
    const said = `${r.stderr ?? ''}${r.stdout ?? ''}`.trim() || `exit status ${r.status ?? r.signal}`;
    throw new RunError(`sbatch refused ${what}: ${said}`);
  }
  return parseSbatchAnswer(r.stdout);
}
