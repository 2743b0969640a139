/**
 * Point batches: struct-of-arrays buffers that Plan.fill writes into.
 */
import type { PointBatch } from './types.js';

/**
 * A batch for n points: four Float64Array input columns and, when `hasBlocks` (saltelli),
 * a Uint8Array of block tags; block is null otherwise.
 */
export function allocatePointBatch(n: number, hasBlocks: boolean): PointBatch {
  if (!Number.isInteger(n) || n < 0) throw new RangeError(`batch size ${n} must be a whole number >= 0`);
  return {
    tp_c: new Float64Array(n),
    water_ppm: new Float64Array(n),
    lid_km: new Float64Array(n),
    upwelling_mm_yr: new Float64Array(n),
    block: hasBlocks ? new Uint8Array(n) : null,
  };
}
