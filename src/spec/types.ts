/**
 * The validated, normalized sweep specification: parsed once at the edge (sweep file ->
 * SweepSpec), frozen, and passed everywhere else (planner, workers, writers, analyzers).
 * It is plain data (structured-clone safe) so it can be sent to worker threads and stored as
 * JSON in the output's schema metadata.
 */
import type { InputName } from '../physics/fields.js';
import type { ParamOverrides } from '../physics/params.js';

export type AxisScale = 'linear' | 'log';

/**
 * One swept input after normalization.
 * - grid designs use `values` (explicit list, in file order; ranges are expanded to their values);
 * - random designs (latin-hypercube, sobol, saltelli) sample the interval [min, max] uniformly
 *   (log-uniformly with scale 'log').
 */
export interface AxisSpec {
  readonly name: InputName;
  /** the grid values of this axis (for ranges: from..to by step or count) */
  readonly values: readonly number[];
  /** interval sampled by random designs */
  readonly min: number;
  readonly max: number;
  readonly scale: AxisScale;
}

export type DesignSpec =
  | { readonly kind: 'grid' }
  | { readonly kind: 'latin-hypercube'; readonly samples: number; readonly seed: number }
  | { readonly kind: 'sobol'; readonly samples: number; readonly skip: number }
  | { readonly kind: 'saltelli'; readonly base: number; readonly skip: number };

export type DesignKind = DesignSpec['kind'];

export interface ModelSpec {
  readonly thermal: 'isentropic' | 'conductive' | 'auto';
  readonly water: 'batch' | 'fractional';
  /** overrides of the published parameter values (keys in the paper's notation) */
  readonly params: ParamOverrides;
  /** isentropic pressure step, GPa */
  readonly step_gpa: number;
}

export interface SweepSpec {
  readonly name: string;
  /** swept inputs in file order (in a grid the last varies fastest) */
  readonly axes: readonly AxisSpec[];
  /** inputs held constant; every input not swept and not fixed takes its default */
  readonly fixed: Readonly<Partial<Record<InputName, number>>>;
  readonly design: DesignSpec;
  readonly model: ModelSpec;
}
