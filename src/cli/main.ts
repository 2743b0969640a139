#!/usr/bin/env node
import { reportError, runCli } from './program.js';

// errors that escape every handler (a callback, a stream) still become one message, never a trace
process.on('uncaughtException', (err) => {
  process.exit(reportError(err));
});
process.on('unhandledRejection', (err) => {
  process.exit(reportError(err));
});

const code = await runCli(process.argv.slice(2));
process.exitCode = code;
