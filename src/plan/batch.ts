/**
 * Point batches: struct-of-arrays buffers that Plan.fill writes into.
 */
import type { PointBatch } from './types.js';

/**
 * A batch for n points: one Float64Array per input (in the order given, e.g. plan.inputNames)
 * and, when `hasBlocks` (saltelli), a Uint8Array of block tags; block is null otherwise.
 */
export function allocatePointBatch(inputNames: readonly string[], n: number, hasBlocks: boolean): PointBatch {
  if (!Number.isInteger(n) || n < 0) throw new RangeError(`batch size ${n} must be a whole number >= 0`);
  const inputs: Record<string, Float64Array> = {};
  for (const name of inputNames) inputs[name] = new Float64Array(n);
  return { inputs, block: hasBlocks ? new Uint8Array(n) : null };
}
