/**
 * Command-line wiring only: parse, call, print. Each command lives in its own file under
 * commands/ and registers itself here.
 */
import { Command, CommanderError } from 'commander';
import { InputError, RunError, EXIT_BAD_INPUT, EXIT_RUN_FAILED } from '../errors.js';
import { TOOL_VERSION } from '../version.js';
import { registerCommands } from './commands/index.js';
import { checkOptionsInOrder } from './option-checks.js';

export function buildProgram(): Command {
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
    if (err instanceof RunError) {
      process.stderr.write(`meltsweep: run failed: ${err.message}\n`);
      return EXIT_RUN_FAILED;
    }
    const msg = err instanceof Error ? (err.stack ?? err.message) : String(err);
    process.stderr.write(`meltsweep: unexpected error: ${msg}\n`);
    return EXIT_RUN_FAILED;
  }
}
