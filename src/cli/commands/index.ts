import type { Command } from 'commander';
import { registerDemo } from './demo.js';
import { registerRun } from './run.js';
import { registerMerge } from './merge.js';
import { registerPlan } from './plan.js';

/** Every command, in the order `meltsweep --help` lists them. */
export function registerCommands(program: Command): void {
  registerDemo(program);
  registerPlan(program);
  registerRun(program);
  registerMerge(program);
}
