/**
 * Ctrl-C (SIGINT), SIGTERM and SIGHUP for every command. By default a signal stops the command at
 * once, after removing the temporary files it was writing and giving back its output lock
 * (src/io/exit-cleanup.ts), so no command leaves a half-written file or a lock behind. A command
 * that can stop more gracefully (run: commit the finished rows first) installs its own handler for
 * the time it runs with handleInterrupts; a second signal still stops at once.
 */
import os from 'node:os';
import { cleanUpNow } from '../io/exit-cleanup.js';

const SIGNALS = ['SIGINT', 'SIGTERM', 'SIGHUP'] as const;

/** Exit code of a command stopped by `signal`: 128 + the signal number (130 for Ctrl-C), the shell convention. */
function interruptedExitCode(signal: NodeJS.Signals): number {
  return 128 + (os.constants.signals[signal] ?? os.constants.signals.SIGINT);
}

let graceful: ((signal: NodeJS.Signals) => void) | null = null;
let installed = false;

/** Stop now: clean up what is being written, say so, and exit with 128 + the signal number. */
export function stopAtOnce(signal: NodeJS.Signals): never {
  const cleaned = cleanUpNow();
  process.stderr.write(`\nmeltsweep: stopped by ${signal}${cleaned > 0 ? '; unfinished output removed, lock released' : ''}\n`);
  process.exit(interruptedExitCode(signal));
}

function onSignal(signal: NodeJS.Signals): void {
  if (graceful !== null) graceful(signal);
  else stopAtOnce(signal);
}

/** Listen for the stop signals (once per process; the command line calls it first thing). */
export function installInterruptHandlers(): void {
  if (installed) return;
  installed = true;
  for (const s of SIGNALS) process.on(s, onSignal);
}

/**
 * Let `handler` take the stop signals until the returned function is called (the default,
 * stopAtOnce, is restored then). Installs the listeners if nobody has.
 */
export function handleInterrupts(handler: (signal: NodeJS.Signals) => void): () => void {
  installInterruptHandlers();
  const previous = graceful;
  graceful = handler;
  return () => {
    graceful = previous;
  };
}
