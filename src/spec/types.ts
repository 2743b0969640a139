/**
 * The validated, normalized sweep specification: parsed once at the edge (sweep file ->
 * SweepSpec), frozen, and passed everywhere else (planner, workers, writers, analyzers).
 * It is plain data (structured-clone safe, JSON-serialisable: no NaN, no Infinity, no
 * undefined values) so it can be sent to worker threads and stored as JSON in the output's
 * schema metadata. Build one with `validateSweep` / `parseSweepText` / `loadSweepFile`.
 */
import type { ParamOverrides } from '../physics/params.js';

/** Spacing of a swept input: linear, or log (geometric grid values, log-uniform sampling). */
export type AxisScale = 'linear' | 'log';

/**
 * One swept input after normalization.
 * - grid designs use `values` (explicit list, in file order; ranges are expanded to their
 *   values, endpoints included);
 * - random designs (latin-hypercube, sobol, saltelli) sample the interval [min, max] uniformly
 *   (log-uniformly with scale 'log'); a `values` axis contributes the span of its values,
 *   and the step or count of a range axis is not used. A range axis given only by `from`/`to`
 *   (allowed in random designs only) has `values` = [from, to].
 */
export interface AxisSpec {
  readonly name: string;
  /** the grid values of this axis (for ranges: from..to by step or count), in the input's unit */
  readonly values: readonly number[];
  /** interval sampled by random designs (min <= max) */
  readonly min: number;
  readonly max: number;
  readonly scale: AxisScale;
}

/**
 * The sampling design.
 * - `seed` of latin-hypercube: any whole number 0 to 2^53 - 1 (default 0); the same seed gives
 *   the same points on every machine.
 * - `seed` of sobol / saltelli (optional): absent means the published, unscrambled Sobol
 *   sequence (Joe & Kuo 2008 direction numbers); present means a random digital shift: every
 *   dimension is XORed with a 32-bit value derived from the seed, which keeps the net
 *   properties of the sequence and gives independent replicates for error estimates.
 * - `skip`: number of leading Sobol points dropped (default 0: keep the first point, which
 *   keeps the balance of the first 2^m points).
 */
export type DesignSpec =
  | { readonly kind: 'grid' }
  | { readonly kind: 'latin-hypercube'; readonly samples: number; readonly seed: number }
  | { readonly kind: 'sobol'; readonly samples: number; readonly skip: number; readonly seed?: number }
  | { readonly kind: 'saltelli'; readonly base: number; readonly skip: number; readonly seed?: number };

/** The name of a design: grid, latin-hypercube, sobol or saltelli. */
export type DesignKind = DesignSpec['kind'];

/**
 * The `model` section: which process computes the columns and its options. The keys besides
 * `process` and `params` belong to the process (src/process/: decompression has thermal, water,
 * step_gpa; see DecompressionModelSpec in validate-model.ts).
 */
export interface ModelSpec {
  /**
   * the process (src/process/registry.ts); absent = 'decompression'. Normalized specs leave the
   * default out, so sweeps stored before processes existed keep their JSON and hash: read it
   * with processOfSpec / processNameOf, never directly.
   */
  readonly process?: string;
  /** overrides of the published parameter values (keys in the paper's notation), shared by all processes */
  readonly params: ParamOverrides;
  /** the process's own options (validated by the process) */
  readonly [option: string]: unknown;
}

/** A validated, normalized sweep: everything needed to reproduce its points and columns. */
export interface SweepSpec {
  readonly name: string;
  /** swept inputs in file order (in a grid the last varies fastest) */
  readonly axes: readonly AxisSpec[];
  /**
   * Inputs of the process held constant. After normalization this also holds the finite
   * defaults of inputs that are neither swept nor fixed (decompression: water_ppm 0, lid_km 0),
   * so it states every constant used; an input whose default is NaN ("not given", e.g.
   * upwelling_mm_yr) is absent when not given (the points carry NaN).
   */
  readonly fixed: Readonly<Record<string, number>>;
  readonly design: DesignSpec;
  readonly model: ModelSpec;
}
