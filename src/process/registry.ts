/**
 * The one table of melting processes. Adding a process = its own file(s) in src/process/ + one
 * line in BUILTIN below + tests + docs; nothing in run/, io/ or analyze/ changes.
 *
 * Code outside the tree (tests, plug-ins) adds a process with `registerProcess`: the explicit,
 * documented extension point. A worker thread learns of such a process through the module path
 * given in RunOptions.processModules (the module's default export is the ProcessDefinition).
 */
import { InputError } from '../errors.js';
import type { SweepSpec } from '../spec/types.js';
import { decompression } from './decompression.js';
import { flux } from './flux.js';
import type { AnyProcess, InputDef, ProcessDefinition, ResultDef } from './types.js';

/** Name of the process used when a sweep file or command names none. */
export const DEFAULT_PROCESS = 'decompression';

/**
 * Erase a process's runtime-model type for the table. Safe: a process's `resolveModel` output is
 * only ever handed back to the same process's `compute` and `profileTable`.
 */
export function defineProcess<M>(p: ProcessDefinition<M>): AnyProcess {
  return p as unknown as AnyProcess;
}

/** The processes built into meltsweep, in the order they are listed (one line per process). */
export const PROCESSES: readonly AnyProcess[] = Object.freeze([
  defineProcess(decompression),
  defineProcess(flux),
]);

/** Processes added at run time with registerProcess (tests, plug-ins), by name. */
const registered = new Map<string, AnyProcess>();

/**
 * Add a process that is not built in (a test fixture, a plug-in). Registering the same
 * definition again is a no-op; another definition under a taken name is an error.
 * Workers do not see it: pass its module path in RunOptions.processModules.
 */
export function registerProcess<M>(p: ProcessDefinition<M>): void {
  const def = defineProcess(p);
  const taken = PROCESSES.find((x) => x.name === p.name) ?? registered.get(p.name);
  if (taken === def) return;
  if (taken !== undefined) throw new Error(`registerProcess: a process named ${p.name} is already registered`);
  registered.set(p.name, def);
}

/** Every process known here: the built-in ones, then the registered ones. */
export function allProcesses(): readonly AnyProcess[] {
  return [...PROCESSES, ...registered.values()];
}

/** The names of every known process. */
export function processNames(): string[] {
  return allProcesses().map((p) => p.name);
}

/**
 * The process of that name.
 * @throws InputError "unknown process X; known processes: a, b" (with `what` as the prefix, e.g. "--process" or "model.process")
 */
export function processNamed(name: string, what = 'process'): AnyProcess {
  const p = allProcesses().find((x) => x.name === name);
  if (p === undefined) throw new InputError(`${what}: unknown process ${JSON.stringify(name)}; known processes: ${processNames().join(', ')}`);
  return p;
}

/** The process name of a spec (or of a spec stored in a table): model.process, else the default. */
export function processNameOf(spec: SweepSpec): string {
  const p = spec.model.process;
  return typeof p === 'string' ? p : DEFAULT_PROCESS;
}

/** The process of a spec. */
export function processOfSpec(spec: SweepSpec): AnyProcess {
  return processNamed(processNameOf(spec), 'model.process');
}

/** The inputs of a spec's process under the spec's model options, in table order. */
export function inputsOfSpec(spec: SweepSpec): readonly InputDef[] {
  return processOfSpec(spec).inputsFor(spec.model);
}

/** The result fields of a process under a model section, in table order. */
export function resultsOf(process: AnyProcess, model: SweepSpec['model']): readonly ResultDef[] {
  return process.resultsFor?.(model) ?? process.results;
}

/** The result fields of a spec's process under the spec's model options, in table order. */
export function resultsOfSpec(spec: SweepSpec): readonly ResultDef[] {
  return resultsOf(processOfSpec(spec), spec.model);
}

/** Every result field a process can write: `results`, then the optional ones. */
export function everyResultOf(process: AnyProcess): readonly ResultDef[] {
  return [...process.results, ...(process.optionalResults ?? [])];
}

/**
 * Load process modules (file paths or URLs; default export = ProcessDefinition) and register
 * them: what a worker does with RunOptions.processModules.
 */
export async function loadProcessModules(modules: readonly string[]): Promise<void> {
  for (const m of modules) {
    const mod = (await import(m)) as { default?: ProcessDefinition<unknown> };
    if (mod.default === undefined || typeof mod.default.compute !== 'function') {
      throw new Error(`process module ${m} has no default export of a process definition`);
    }
    registerProcess(mod.default);
  }
}
