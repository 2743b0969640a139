/**
 * Command-line wiring only: parse, call, print. Each command lives in its own file under
 * commands/ and registers itself here.
 */
import { Command, CommanderError } from 'commander';
import { InputError, RunError, EXIT_BAD_INPUT, EXIT_RUN_FAILED } from '../errors.js';
import { TOOL_VERSION } from '../version.js';
import { registerCommands } from './commands/index.js';
import { checkOptionsInOrder } from './option-checks.js';

function buildProgram(): Command {
  const program = new Command('meltsweep')
    .description('Scenario sweeps of mantle decompression melting: plan, run on all cores, write Arrow tables, rank inputs by influence.')
    .version(TOOL_VERSION)
    .showHelpAfterError('(run meltsweep --help for the list of commands and options)')
    .showSuggestionAfterError(true)
    .exitOverride();
  registerCommands(program);
  program.commands.forEach((c) => checkOptionsInOrder(c.exitOverride()));
  return program;
}

/** Run the CLI on argv; resolves to the process exit code. */
export async function runCli(argv: readonly string[]): Promise<number> {
  const program = buildProgram();
  try {
    await program.parseAsync(argv as string[], { from: 'user' });
    return process.exitCode === undefined ? 0 : Number(process.exitCode);
  } catch (err) {
    if (err instanceof CommanderError) {
      // help and version exit 0; every parse problem (unknown command/option, missing argument) exits 2
      if (err.exitCode === 0) return 0;
      return EXIT_BAD_INPUT;
    }
    if (err instanceof InputError) {
      process.stderr.write(`meltsweep: invalid input\n${err.problems.map((p) => `  ${p}`).join('\n')}\n`);
      return EXIT_BAD_INPUT;
    }
    return reportError(err);
  }
}

/** Words for the file-system errors a user meets (the code stays in the message). */
const ERRNO_WORDS: Readonly<Record<string, string>> = {
  EACCES: 'permission denied', EPERM: 'operation not permitted', EROFS: 'read-only file system', ENOENT: 'no such file or folder',
  ENOTDIR: 'a part of the path is not a folder', EISDIR: 'it is a folder', EEXIST: 'it already exists', ENAMETOOLONG: 'the name is too long',
  ENOSPC: 'no space left on the device', EDQUOT: 'disk quota exceeded', EIO: 'input/output error', EMFILE: 'too many open files',
};
/** File-system errors that come from the path given (exit 2), not from the run (exit 1). */
const PATH_ERRNOS = new Set(['EACCES', 'EPERM', 'EROFS', 'ENOENT', 'ENOTDIR', 'EISDIR', 'EEXIST', 'ENAMETOOLONG']);

/**
 * The one place every error becomes a message and an exit code: InputError and path problems 2,
 * RunError and other failures 1. Never a stack trace (MELTSWEEP_DEBUG=1 adds it, for bug reports).
 */
export function reportError(err: unknown): number {
  if (err instanceof InputError) {
    process.stderr.write(`meltsweep: invalid input\n${err.problems.map((p) => `  ${p}`).join('\n')}\n`);
    return EXIT_BAD_INPUT;
  }
  if (err instanceof RunError) {
    process.stderr.write(`meltsweep: run failed: ${err.message}\n`);
    return EXIT_RUN_FAILED;
  }
  const debug = process.env.MELTSWEEP_DEBUG === '1' && err instanceof Error && err.stack !== undefined ? `\n${err.stack}` : '';
  const e = err as NodeJS.ErrnoException;
  if (err instanceof Error && typeof e.code === 'string' && typeof e.syscall === 'string') {
    const words = ERRNO_WORDS[e.code] ?? e.message;
    const where = e.path !== undefined ? ` ${e.path}` : '';
    const verb = /open|write|rename|mkdir|copy|unlink|rm|symlink|link|utime|chmod/.test(e.syscall) ? 'cannot write' : 'cannot read';
    const hint = e.code === 'ENOSPC' || e.code === 'EDQUOT' ? '; free some space and run the command again' : PATH_ERRNOS.has(e.code) ? '; check the path and its permissions' : '';
    process.stderr.write(`meltsweep: ${e.syscall === 'open' ? 'cannot open' : verb}${where}: ${words} (${e.code})${hint}${debug}\n`);
    return PATH_ERRNOS.has(e.code) ? EXIT_BAD_INPUT : EXIT_RUN_FAILED;
  }
  const msg = err instanceof Error ? err.message : String(err);
  process.stderr.write(`meltsweep: unexpected error: ${msg.split('\n')[0]}${debug}\n(this is a bug; MELTSWEEP_DEBUG=1 shows where it happened)\n`);
  return EXIT_RUN_FAILED;
}
