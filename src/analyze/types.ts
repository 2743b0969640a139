/**
 * Types of the sensitivity analysis. The analysis works on plain tables (input and output columns
 * as Float64Arrays, in design row order), so it knows nothing about the physics: input and output
 * names are plain strings and the same code analyses a melting sweep or the Ishigami function.
 *
 * {@link AnalysisLayout} is a structural copy of the planner's `DesignLayout`; any plan layout is
 * assignable to it.
 */
import type { AffineCopy } from './copies.js';

/** One grid axis: the input's name and its values in row order. */
export interface GridAxisLayout {
  readonly name: string;
  readonly values: readonly number[];
}

/**
 * How the rows of a table were laid out by the design.
 * - `grid`: row index is mixed-radix over the axes in order, the last axis fastest;
 *   count = product of the axis lengths.
 * - `saltelli` (block-major): rows [0, N) are matrix A, [N, 2N) matrix B and [(2 + i) N, (3 + i) N)
 *   matrix AB_i (A with column i taken from B); N = base, k = inputs.length, count = N (k + 2).
 * - `latin-hypercube` / `sobol`: independent samples, count = samples.
 */
export type AnalysisLayout =
  | { readonly kind: 'grid'; readonly axes: readonly GridAxisLayout[] }
  | { readonly kind: 'saltelli'; readonly base: number; readonly inputs: readonly string[] }
  | { readonly kind: 'latin-hypercube' | 'sobol'; readonly samples: number; readonly inputs: readonly string[] };

export type AnalysisDesignKind = AnalysisLayout['kind'];

/** The table to analyse. Every column has one entry per design row, in design row order. */
export interface SensitivityInput {
  /** input columns by name; every input of the layout must be present (others are ignored) */
  readonly inputs: Readonly<Record<string, Float64Array>>;
  /** output columns by name; NaN (or another non-finite value) marks a null */
  readonly outputs: Readonly<Record<string, Float64Array>>;
  /** 1 = usable row (status ok), 0 = left out; absent = every row usable */
  readonly include?: Uint8Array;
  /** how many rows were left out, by reason (e.g. status); should add up to the zeros of `include` */
  readonly excludedReasons?: Readonly<Record<string, number>>;
  readonly layout: AnalysisLayout;
}

/** How derivatives are taken at grid points without a usable neighbour on each side. */
export type EdgeRule = 'one-sided' | 'skip';

/** What a slope is normalised by: standard deviations (default) or ranges of x and y. */
export type SlopeScale = 'std' | 'range';

export interface SensitivityOptions {
  /** outputs to analyse, in this order; default: every column of `outputs`, in key order */
  readonly outputs?: readonly string[];
  /** bootstrap resamples for saltelli confidence intervals; default 500; 0 turns intervals off */
  readonly resamples?: number;
  /** seed of the bootstrap resampling; default 1 */
  readonly seed?: number;
  /** confidence level of the bootstrap percentile intervals; default 0.95 */
  readonly confidence?: number;
  /**
   * bins of the first-order estimator for latin-hypercube and sobol designs;
   * default round(n^(2/5)) clamped to [2, 200], n = usable rows
   */
  readonly bins?: number;
  /** quantile bins of the main-effect curves of non-grid designs; default 20 */
  readonly curveBins?: number;
  /** grid derivatives at edges and next to left-out points; default 'one-sided' */
  readonly edges?: EdgeRule;
  /** normalisation of slopes; default 'std' */
  readonly slopeScale?: SlopeScale;
  /** compute local derivative measures on grids; default true */
  readonly local?: boolean;
}

/** The settings an analysis actually used (defaults filled in). */
export interface ResolvedSensitivityOptions {
  readonly resamples: number;
  readonly seed: number;
  readonly confidence: number;
  /** null = the default rule round(n^(2/5)) per output */
  readonly bins: number | null;
  readonly curveBins: number;
  readonly edges: EdgeRule;
  readonly slopeScale: SlopeScale;
  readonly local: boolean;
}

/**
 * - `S1`: first-order Sobol index; `ST`: total-effect Sobol index;
 * - `elasticity_*`: percentiles over grid points of d ln y / d ln x;
 * - `slope_norm_*`: percentiles over grid points of dy/dx scaled by sd(x)/sd(y) (or range(x)/range(y)).
 */
export type SensitivityMeasure =
  | 'S1'
  | 'ST'
  | 'elasticity_median'
  | 'elasticity_p10'
  | 'elasticity_p90'
  | 'slope_norm_median'
  | 'slope_norm_p10'
  | 'slope_norm_p90';

/** One long-format result row. */
export interface SensitivityRecord {
  readonly output: string;
  readonly input: string;
  readonly measure: SensitivityMeasure;
  /** null when the measure cannot be computed for this design or data (see the notes) */
  readonly value: number | null;
  /** bootstrap confidence interval (saltelli designs); null elsewhere */
  readonly ci_low: number | null;
  readonly ci_high: number | null;
  /** rows, base samples or grid points behind the value */
  readonly n: number;
}

/**
 * Conditional mean of an output along one input, for plotting. Grids: one point per axis value
 * (mean over every other axis). Other designs: equal-count quantile bins of x, x = mean x in the bin.
 * `mean` is NaN where a group has no usable rows (count 0).
 */
export interface MainEffectCurve {
  readonly output: string;
  readonly input: string;
  readonly binned: boolean;
  readonly x: readonly number[];
  readonly mean: readonly number[];
  readonly count: readonly number[];
}

export interface OutputCounts {
  /** included rows with a finite value of this output */
  readonly used: number;
  /** included rows where this output is null (NaN) */
  readonly nullValues: number;
  /** mean and population variance over the used rows; null without used rows */
  readonly mean: number | null;
  readonly variance: number | null;
  /**
   * saltelli designs: base samples left out of at least one input's estimate because a row of
   * their A, B or AB_i block is not usable (null for other designs)
   */
  readonly droppedBaseSamples: number | null;
}

export interface SensitivityCounts {
  /** rows of the design */
  readonly rows: number;
  /** rows with include = 1 */
  readonly included: number;
  /** rows left out by the mask, by reason ('unspecified' for rows the reasons do not account for) */
  readonly leftOut: Readonly<Record<string, number>>;
  readonly perOutput: Readonly<Record<string, OutputCounts>>;
}

export interface SensitivityReport {
  readonly design: AnalysisDesignKind;
  readonly inputs: readonly string[];
  readonly outputs: readonly string[];
  /** per output, per input (layout order), per measure */
  readonly records: readonly SensitivityRecord[];
  readonly mainEffects: readonly MainEffectCurve[];
  readonly counts: SensitivityCounts;
  /** what was skipped, approximated or cannot be computed, in plain words */
  readonly notes: readonly string[];
  /** notes about the local-derivative measures only (elasticity_*, slope_norm_*) */
  readonly localNotes: readonly string[];
  /** what makes some indices unreliable (e.g. biased by dropped samples), with what to do */
  readonly warnings: readonly string[];
  /** outputs that are affine copies of an earlier output on the usable rows (identical indices) */
  readonly copies: Readonly<Record<string, AffineCopy>>;
  readonly settings: ResolvedSensitivityOptions;
}
