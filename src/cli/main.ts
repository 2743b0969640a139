#!/usr/bin/env node
import { installInterruptHandlers } from './interrupts.js';

// Ctrl-C, SIGTERM, SIGHUP: no command leaves a temporary file or a lock behind (src/cli/interrupts.ts).
// Installed before the commands' modules load (a second or more on a busy machine), so a signal is
// honoured from the first moment.
installInterruptHandlers();
const { reportError, runCli } = await import('./program.js');

// errors that escape every handler (a callback, a stream) still become one message, never a trace
process.on('uncaughtException', (err) => {
  process.exit(reportError(err));
});
process.on('unhandledRejection', (err) => {
  process.exit(reportError(err));
});

const code = await runCli(process.argv.slice(2));
// Exit as soon as the command is done. Left to itself, node takes another second or more to wind
// down after a run whose worker threads were stopped mid-task (measured: 1.3-2 s after Ctrl-C of a
// 10^12-point run on a loaded 2-core machine), and every file, lock and message is finished here;
// stdout and stderr are synchronous for files and pipes on POSIX, so nothing printed is lost.
process.exit(code);
