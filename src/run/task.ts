/** The message that crosses the worker boundary: a sweep and a contiguous index range. */
import type { SweepSpec } from '../spec/types.js';
import type { ProfileGrid } from './profile-grid.js';

export interface ChunkTask {
  /** identifies the spec so a worker builds its plan and parameters once */
  readonly specKey: string;
  readonly spec: SweepSpec;
  readonly start: number;
  readonly end: number;
  /** sample every column on this pressure grid (the profile table); absent: no profiles */
  readonly profiles?: ProfileGrid;
  /** modules of processes that are not built in (RunOptions.processModules), registered before computing */
  readonly processModules?: readonly string[];
}
