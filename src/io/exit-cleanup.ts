/**
 * What to give back when the process is stopped by a signal before a write finishes: temporary
 * files (a table or page being written under OUT.tmp-PID) and output locks. Writers register what
 * they create and unregister it once it is published or removed; the signal handler of the
 * command line (src/cli/interrupts.ts) calls cleanUpNow() before it exits. Everything here is
 * synchronous, so it still runs inside a signal handler that exits right after.
 */
import fs from 'node:fs';

const pending = new Map<string, () => void>();

/** Remove `tmpPath` if the process is interrupted before untrackTemporary(tmpPath). */
export function trackTemporary(tmpPath: string): void {
  pending.set(tmpPath, () => fs.rmSync(tmpPath, { force: true }));
}

/** `tmpPath` was renamed or removed: nothing to clean up any more. */
export function untrackTemporary(tmpPath: string): void {
  pending.delete(tmpPath);
}

/** Run `release` (e.g. give back a lock) if the process is interrupted; returns the function that forgets it. */
export function onInterruptRelease(key: string, release: () => void): () => void {
  pending.set(key, release);
  return () => {
    if (pending.get(key) === release) pending.delete(key);
  };
}

/**
 * Remove every tracked temporary file and release every tracked lock (each at most once; a
 * failing one does not stop the others). Returns how many were cleaned up.
 */
export function cleanUpNow(): number {
  const fns = [...pending.values()];
  pending.clear();
  let n = 0;
  for (const fn of fns) {
    try {
      fn();
      n++;
    } catch {
      // best effort: the next command removes stale temporaries and takes over stale locks
    }
  }
  return n;
}
