/** Melting processes as plug-ins: the contract, the registry and the built-in processes. */
export type { AnyProcess, InputDef, ProcessDefinition, ProcessModelOptions, ProcessResult, ProfileTableSampler, ResolveOptions, ResultDef } from './types.js';
export {
  DEFAULT_PROCESS,
  PROCESSES,
  allProcesses,
  defineProcess,
  inputsOfSpec,
  loadProcessModules,
  processNameOf,
  processNamed,
  processNames,
  processOfSpec,
  registerProcess,
} from './registry.js';
export { decompression, DECOMPRESSION_INPUTS, DECOMPRESSION_RESULTS } from './decompression.js';
