/**
 * What a planned sweep offers: a point count and lazy generation of any contiguous index
 * range. Nothing proportional to the point count is ever materialised.
 */
import type { InputName } from '../physics/fields.js';
import type { DesignKind } from '../spec/types.js';

/** Struct-of-arrays batch of scenario inputs; upwelling_mm_yr is NaN where not given. */
export interface PointBatch {
  readonly tp_c: Float64Array;
  readonly water_ppm: Float64Array;
  readonly lid_km: Float64Array;
  readonly upwelling_mm_yr: Float64Array;
  /** saltelli block of each row (0 = A, 1 = B, 2 + i = AB_i for swept input i); null for other designs */
  readonly block: Uint8Array | null;
}

/**
 * The layout an analyzer needs, as plain data.
 * - grid: row index is mixed-radix over the axes in order, the last axis fastest;
 * - saltelli (block-major): rows [0, N) are matrix A, [N, 2N) matrix B, and [(2 + i) N, (3 + i) N) matrix
 *   AB_i (A with column i taken from B), i over the swept inputs in spec order; N = base, k inputs,
 *   count = N (k + 2). Row j of every block shares the same base sample j;
 * - latin-hypercube / sobol: independent samples, no structure beyond the count.
 */
export type DesignLayout =
  | { readonly kind: 'grid'; readonly axes: readonly { readonly name: InputName; readonly values: readonly number[] }[] }
  | { readonly kind: 'saltelli'; readonly base: number; readonly inputs: readonly InputName[] }
  | { readonly kind: 'latin-hypercube' | 'sobol'; readonly samples: number; readonly inputs: readonly InputName[] };

/** A planned sweep (from planSweep): frozen, safe to share; build one per worker from the spec. */
export interface Plan {
  /** number of points, 1 to 2^40 */
  readonly count: number;
  readonly design: DesignKind;
  /** the swept inputs, in spec order */
  readonly axisNames: readonly InputName[];
  readonly layout: DesignLayout;
  /** whether rows carry a saltelli block tag */
  readonly hasBlocks: boolean;
  /**
   * Write points [start, end) into rows 0 .. end - start of out (arrays of length >= end - start;
   * out.block required when hasBlocks). Swept columns get the design's values, the others their
   * fixed value or default (NaN for upwelling_mm_yr when not given). The result never depends on
   * how a range is split. Throws RangeError for a range outside [0, count] or a short batch.
   */
  fill(start: number, end: number, out: PointBatch): void;
}
