/**
 * The struct-of-arrays contract between the computation (src/run, in worker threads) and the
 * table writers (src/io): the results of a contiguous range of scenarios as typed arrays, one per
 * result field the process declares. It lives beside the process registry so that io and run both
 * depend on it and not on each other.
 */
import type { PointBatch } from '../plan/types.js';

/** Columns sampled on a profile grid: n scenarios x `points` pressures per array, NaN for null. */
export interface ProfileSamples {
  /** grid points per scenario */
  readonly points: number;
  readonly t_c: Float64Array;
  readonly f: Float64Array;
  readonly h2o_melt_wt_pct: Float64Array;
  readonly productivity_pct_per_gpa: Float64Array;
}

/** Results of scenarios [start, end). Numeric arrays hold NaN where the value is null. */
export interface ChunkResult {
  readonly start: number;
  readonly end: number;
  readonly points: PointBatch;
  /** index into COLUMN_STATUSES */
  readonly status: Uint8Array;
  /** one array per result field of the sweep's process, by name */
  readonly numeric: Readonly<Record<string, Float64Array>>;
  /** reasons of failed / out-of-range rows, by offset within the chunk */
  readonly reasons: ReadonlyArray<readonly [number, string]>;
  /** thread CPU time spent on the columns, ms */
  readonly computeMs: number;
  /** the columns sampled on the profile grid (only when the run asks for profiles) */
  readonly profiles?: ProfileSamples;
}
