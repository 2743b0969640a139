/** Melting processes as plug-ins: the contract, the registry and the built-in processes. */
export type { AnyProcess, DiagramItem, InputDef, ModelContext, ModelFlag, ProcessDiagram, ProcessDefinition, ProcessModelOptions, ProcessResult, ProfileTableSampler, ResolveOptions, ResultDef } from './types.js';
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
export { flux, FLUX_INPUTS, FLUX_TABLE_INPUTS, FLUX_RESULTS, FLUX_PROFILE_FIELDS, computeFlux, type FluxRuntimeModel } from './flux.js';
