import type { Command } from 'commander';

/** Every command, in the order `meltsweep --help` lists them. */
export function registerCommands(program: Command): void {
  void program;
}
