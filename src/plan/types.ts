/**
 * What a planned sweep offers: a point count and lazy generation of any contiguous index
 * range. Nothing proportional to the point count is ever materialised.
 */
import type { DesignKind } from '../spec/types.js';

/**
 * Struct-of-arrays batch of scenario inputs: one Float64Array per input of the sweep's process,
 * keyed by input name in the process's input order (NaN where an input is "not given", e.g.
 * upwelling_mm_yr of decompression).
 */
export interface PointBatch {
  readonly inputs: Readonly<Record<string, Float64Array>>;
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
  | { readonly kind: 'grid'; readonly axes: readonly { readonly name: string; readonly values: readonly number[] }[] }
  | { readonly kind: 'saltelli'; readonly base: number; readonly inputs: readonly string[] }
  | { readonly kind: 'latin-hypercube' | 'sobol'; readonly samples: number; readonly inputs: readonly string[] };

/** A planned sweep (from planSweep): frozen, safe to share; build one per worker from the spec. */
export interface Plan {
  /** number of points, 1 to 2^40 */
  readonly count: number;
  readonly design: DesignKind;
  /** the swept inputs, in spec order */
  readonly axisNames: readonly string[];
  /** every input of the sweep's process, in table order (the keys of PointBatch.inputs) */
  readonly inputNames: readonly string[];
  readonly layout: DesignLayout;
  /** whether rows carry a saltelli block tag */
  readonly hasBlocks: boolean;
  /**
   * Write points [start, end) into rows 0 .. end - start of out (arrays of length >= end - start;
   * out.block required when hasBlocks). Swept columns get the design's values, the others their
   * fixed value or default (NaN for an input "not given"). The result never depends on
   * how a range is split. Throws RangeError for a range outside [0, count] or a short batch.
   */
  fill(start: number, end: number, out: PointBatch): void;
}
