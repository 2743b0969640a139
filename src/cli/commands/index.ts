import type { Command } from 'commander';
import { registerDemo } from './demo.js';
import { registerRun } from './run.js';
import { registerMerge } from './merge.js';
import { registerSubmit } from './submit.js';
import { registerPlan } from './plan.js';
import { registerColumn } from './column.js';
import { registerSensitivity } from './sensitivity.js';
import { registerPlot } from './plot.js';
import { registerReport } from './report.js';
import { registerInspect } from './inspect.js';
import { registerFit } from './fit.js';
import { registerSchema } from './schema.js';

/** Every command, in the order `meltsweep --help` lists them. */
export function registerCommands(program: Command): void {
  registerDemo(program);
  registerPlan(program);
  registerRun(program);
  registerMerge(program);
  registerSubmit(program);
  registerColumn(program);
  registerSensitivity(program);
  registerFit(program);
  registerPlot(program);
  registerReport(program);
  registerInspect(program);
  registerSchema(program);
}
