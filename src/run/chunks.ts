/**
 * Chunk sizing. A chunk is one task for a worker: large enough that the message overhead is
 * negligible, small enough to spread a small sweep over all workers. The size depends only on
 * the sweep and the row range (never on the worker count), so batch boundaries and resumes
 * are the same on any machine.
 */
import type { SweepSpec } from '../spec/types.js';

/** Largest chunk per thermal model: about 0.1-0.3 s of work on one core. */
const MAX_CHUNK_ROWS = { isentropic: 4096, conductive: 256 } as const;
const MIN_CHUNK_ROWS = 16;

/** Profile rows (scenarios x grid points) one chunk may carry: bounds a chunk's memory with --profiles. */
const MAX_CHUNK_PROFILE_ROWS = 1_048_576;

/**
 * Rows per chunk of a sweep range.
 * @param profilePoints points of the profile grid (0 without profiles): a chunk carries at most
 *   MAX_CHUNK_PROFILE_ROWS profile rows
 */
export function defaultChunkSize(spec: SweepSpec, rows: number, profilePoints = 0): number {
  const conductive = spec.model.thermal === 'conductive' || (spec.model.thermal === 'auto' && mayHaveUpwelling(spec));
  let max: number = conductive ? MAX_CHUNK_ROWS.conductive : MAX_CHUNK_ROWS.isentropic;
  if (profilePoints > 0) max = Math.max(MIN_CHUNK_ROWS, Math.min(max, Math.floor(MAX_CHUNK_PROFILE_ROWS / profilePoints)));
  // at least ~32 chunks when the range allows, so small sweeps still use every core
  const spread = Math.ceil(rows / 32);
  return Math.max(MIN_CHUNK_ROWS, Math.min(max, spread));
}

function mayHaveUpwelling(spec: SweepSpec): boolean {
  return spec.axes.some((a) => a.name === 'upwelling_mm_yr') || spec.fixed.upwelling_mm_yr !== undefined;
}
