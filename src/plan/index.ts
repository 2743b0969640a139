/** Spec -> lazy plan of points, point batches, shards and the plan summary. */
export type { DesignLayout, Plan, PointBatch } from './types.js';
export { planSweep, PLANNERS } from './plan-sweep.js';
export { allocatePointBatch } from './batch.js';
export { shardRange, parseShardArg, MAX_SHARDS, type IndexRange, type ShardSpec } from './shards.js';
export { describePlan, formatValue } from './describe.js';
export { planGrid } from './grid.js';
export { planLatinHypercube } from './latin-hypercube.js';
export { planSobol, makeSobolTable, sobolUnit, type SobolTable } from './sobol.js';
export { planSaltelli, saltelliDimension, SALTELLI_BLOCK_A, SALTELLI_BLOCK_B, SALTELLI_BLOCK_AB0 } from './saltelli.js';
export { sobolDirectionNumbers, SOBOL_MAX_DIMENSIONS } from './sobol-directions.js';
