/**
 * One writer per output: `OUT.lock` beside the output, created atomically (O_EXCL) with the
 * owner's pid, host and start time, before anything else is touched on disk. A lock whose owner
 * is gone (same host, pid no longer running) is stale and taken over; a live owner, or an owner
 * on another host (a shared cluster folder, where the pid cannot be checked), refuses the run.
 */
import fs from 'node:fs';
import os from 'node:os';
import { InputError } from '../errors.js';
import { onInterruptRelease } from '../io/exit-cleanup.js';

/** The lock file guarding `outPath`. */
export function lockPathFor(outPath: string): string {
  return `${outPath}.lock`;
}

interface LockOwner {
  readonly kind: 'meltsweep output lock';
  readonly pid: number;
  readonly host: string;
  readonly since: string;
  readonly command: string;
}

export interface OutputLock {
  readonly path: string;
  /** Give the lock back (only if it is still ours). */
  release(): void;
}

function readOwner(file: string): LockOwner | null {
  try {
    const data = JSON.parse(fs.readFileSync(file, 'utf8')) as Partial<LockOwner>;
    if (data.kind !== 'meltsweep output lock' || !Number.isSafeInteger(data.pid) || typeof data.host !== 'string') return null;
    return data as LockOwner;
  } catch {
    return null;
  }
}

/** Whether process `pid` runs on this host (EPERM: it exists but belongs to someone else). */
function alive(pid: number): boolean {
  try {
    process.kill(pid, 0);
    return true;
  } catch (err) {
    return (err as NodeJS.ErrnoException).code === 'EPERM';
  }
}

/**
 * Take the lock of `outPath` or refuse (InputError, exit 2) naming the owner. Nothing else on
 * disk is changed by a refused call.
 * @param what the command taking it, recorded for the message another invocation would print
 * @param note told when a stale lock (its owner gone) is taken over, with who held it
 */
export function lockOutput(outPath: string, what: string, note?: (message: string) => void): OutputLock {
  const file = lockPathFor(outPath);
  const me: LockOwner = { kind: 'meltsweep output lock', pid: process.pid, host: os.hostname(), since: new Date().toISOString(), command: what };
  const text = `${JSON.stringify(me)}\n`;
  for (let attempt = 0; attempt < 3; attempt++) {
    try {
      const fd = fs.openSync(file, 'wx');
      try {
        fs.writeSync(fd, text);
        fs.fsyncSync(fd);
      } finally {
        fs.closeSync(fd);
      }
      const giveBack = (): void => {
        // only our own lock: a stale-lock takeover by another process must not be undone
        const owner = readOwner(file);
        if (owner?.pid === me.pid && owner.since === me.since) fs.rmSync(file, { force: true });
      };
      // a command stopped by a signal gives the lock back too (src/cli/interrupts.ts)
      const forget = onInterruptRelease(file, giveBack);
      return {
        path: file,
        release: () => {
          forget();
          giveBack();
        },
      };
    } catch (err) {
      const code = (err as NodeJS.ErrnoException).code;
      if (code !== 'EEXIST') {
        throw new InputError(`--output: cannot create the lock file ${file} (${code ?? String(err)}); choose a writable folder`);
      }
    }
    const owner = readOwner(file);
    if (owner === null) {
      // a lock file being written this very moment reads as empty: look again before judging
      const age = Date.now() - (fs.statSync(file, { throwIfNoEntry: false })?.mtimeMs ?? 0);
      if (age < 2000) {
        Atomics.wait(new Int32Array(new SharedArrayBuffer(4)), 0, 0, 100);
        if (readOwner(file) === null && attempt < 2) continue;
      }
      throw new InputError(`--output: ${file} exists but is not a meltsweep lock; remove it if no meltsweep command is writing ${outPath}`);
    }
    if (owner.host === os.hostname() && !alive(owner.pid)) {
      // stale: its owner is gone. Remove it only if it is still the same stale lock.
      const again = readOwner(file);
      if (again !== null && again.pid === owner.pid && again.since === owner.since) {
        fs.rmSync(file, { force: true });
        note?.(`took over the lock ${file} of process ${owner.pid} (${owner.command}, since ${owner.since}), which is no longer running`);
      }
      continue;
    }
    const where = owner.host === os.hostname() ? `process ${owner.pid}` : `process ${owner.pid} on host ${owner.host}`;
    throw new InputError(
      `--output: ${outPath} is being written by another meltsweep command (${where}, ${owner.command}, since ${owner.since}); ` +
        `wait for it to finish${owner.host === os.hostname() ? '' : `, or delete ${file} if that process is gone`}`,
    );
  }
  throw new InputError(`--output: could not take the lock ${file}; another meltsweep command keeps taking it`);
}
