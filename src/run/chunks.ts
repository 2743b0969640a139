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

export function defaultChunkSize(spec: SweepSpec, rows: number): number {
  const conductive = spec.model.thermal === 'conductive' || (spec.model.thermal === 'auto' && mayHaveUpwelling(spec));
  const max = conductive ? MAX_CHUNK_ROWS.conductive : MAX_CHUNK_ROWS.isentropic;
  // at least ~32 chunks when the range allows, so small sweeps still use every core
  const spread = Math.ceil(rows / 32);
  return Math.max(MIN_CHUNK_ROWS, Math.min(max, spread));
}

function mayHaveUpwelling(spec: SweepSpec): boolean {
  return spec.axes.some((a) => a.name === 'upwelling_mm_yr') || spec.fixed.upwelling_mm_yr !== undefined;
}
