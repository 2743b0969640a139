/**
 * Types of fitting observations to a sweep table. The fit works on plain columns (inputs and
 * outputs by name, as Float64Arrays) and on the sweep's axes, so it knows nothing about the
 * physics: the same code fits a melting sweep, a flux-melting sweep or y = a x + b.
 */

/** Spacing of a swept input: linear, or log (geometric grid values, log-uniform sampling). */
export type FitScale = 'linear' | 'log';

/** Design kinds whose rows make the prior (each row equally likely). */
export type FitDesignKind = 'grid' | 'latin-hypercube' | 'sobol' | 'saltelli';

/**
 * One swept input of the design, as the sweep file states it (structurally the spec's AxisSpec).
 * Grid designs use `values`; sampled designs the interval [min, max] (log-uniform with scale 'log').
 */
export interface FitAxis {
  readonly name: string;
  readonly values: readonly number[];
  readonly min: number;
  readonly max: number;
  readonly scale: FitScale;
}

/** The prior: the sweep's own design (kind and swept axes, in sweep-file order). */
export interface FitPrior {
  readonly kind: FitDesignKind;
  readonly axes: readonly FitAxis[];
}

/**
 * One observation of an output: value and one standard deviation of a Gaussian error, in the
 * output's unit. `discrepancySd` (default 0) is a model-discrepancy standard deviation added in
 * quadrature: the likelihood uses sqrt(sd^2 + discrepancySd^2).
 */
export interface Observation {
  readonly output: string;
  readonly value: number;
  readonly sd: number;
  readonly discrepancySd?: number;
}

/** What a fit needs besides the rows. */
export interface FitSetup {
  readonly observations: readonly Observation[];
  readonly prior: FitPrior;
  /** outputs whose posterior predictive is summarised (observed outputs are always kept for the plots) */
  readonly predict?: readonly string[];
  /** names of the status codes used in FitBatch.status (default: ['ok']) */
  readonly statuses?: readonly string[];
  /** statuses whose rows are left out whatever their values (default: failed, onset_beyond_range) */
  readonly leaveOut?: readonly string[];
  /** unit of each input by name, for the sentence stating the prior */
  readonly units?: Readonly<Record<string, string>>;
  /** rows expected in all (sizes the per-row arrays once; they grow when more arrive) */
  readonly expectedRows?: number;
}

/** One batch of rows: swept inputs, observed and predicted outputs, optional status codes and ids. */
export interface FitBatch {
  readonly rows: number;
  /** every swept input of the prior, by name; NaN = null */
  readonly inputs: Readonly<Record<string, Float64Array>>;
  /** every observed and predicted output, by name; NaN = null */
  readonly outputs: Readonly<Record<string, Float64Array>>;
  /** index into FitSetup.statuses per row; absent = every row has status statuses[0] */
  readonly status?: Uint8Array;
  /** scenario id per row; absent = the running row number */
  readonly ids?: Float64Array;
}

/** Posterior (or prior) summary of one quantity, in its unit. */
export interface FitSummary {
  readonly mean: number;
  readonly sd: number;
  readonly p2_5: number;
  readonly p16: number;
  readonly p50: number;
  readonly p84: number;
  readonly p97_5: number;
}

/** A one-dimensional mass function on cells: edges in the quantity's unit (length cells + 1). */
export interface FitHistogram {
  readonly name: string;
  readonly edges: Float64Array;
  /** prior mass per cell (sums to 1) */
  readonly prior: Float64Array;
  /** posterior mass per cell (sums to 1) */
  readonly posterior: Float64Array;
}

/** Posterior mass over the cells of two inputs: mass[j * xCells + i] (i along x, j along y). */
export interface FitPairDensity {
  readonly x: string;
  readonly y: string;
  readonly xEdges: Float64Array;
  readonly yEdges: Float64Array;
  readonly mass: Float64Array;
}

/** Why the user should not trust a fit as it stands, and what to do. */
export interface FitWarning {
  readonly kind: 'low-ess' | 'edge' | 'no-fit';
  /** the input concerned (edge warnings) */
  readonly input?: string;
  readonly message: string;
  readonly nextStep: string;
}

/** The best-fitting row: largest log-likelihood (the first such row on ties). */
export interface FitBestRow {
  /** position of the row in the stream (0-based) */
  readonly row: number;
  readonly id: number;
  readonly logLikelihood: number;
  readonly inputs: Readonly<Record<string, number>>;
  readonly outputs: Readonly<Record<string, number>>;
  /** (model - observed) / total sd, per observed output */
  readonly z: Readonly<Record<string, number>>;
}

/** Everything a fit gives. */
export interface FitResult {
  /** rows seen */
  readonly rows: number;
  /** rows with a likelihood (their status counts and every observed output has a value) */
  readonly rowsUsed: number;
  /** rows used, by status */
  readonly usedByStatus: Readonly<Record<string, number>>;
  /** rows left out, by reason (a status, or "<status>: <output> is null") */
  readonly rowsLeftOut: Readonly<Record<string, number>>;
  /** effective sample size (sum w)^2 / sum w^2 of the normalised weights */
  readonly ess: number;
  /** used rows whose every observed output lies within 3 total sd of the observation */
  readonly rowsWithin3Sd: number;
  /** the observations with the total sd the likelihood used */
  readonly observations: readonly (Observation & { readonly totalSd: number })[];
  /** what the prior is, in one sentence */
  readonly priorText: string;
  /** per swept input: the design's own distribution (every row, equal weights) */
  readonly prior: Readonly<Record<string, FitSummary>>;
  /** per swept input: the posterior */
  readonly posterior: Readonly<Record<string, FitSummary>>;
  /** per swept input: the posterior's 0.5 and 99.5 % quantiles (what --refine covers) */
  readonly range99: Readonly<Record<string, readonly [number, number]>>;
  /** per observed or predicted output: the posterior predictive */
  readonly predict: Readonly<Record<string, FitSummary>>;
  readonly best: FitBestRow;
  readonly warnings: readonly FitWarning[];
  /** per swept input: prior and posterior mass for pictures (at most 64 cells) */
  readonly marginals: readonly FitHistogram[];
  /** per pair of swept inputs (x before y in axis order): posterior mass (at most 64 x 64 cells) */
  readonly pairs: readonly FitPairDensity[];
  /** per observed or predicted output: prior and posterior predictive mass (48 cells) */
  readonly predictive: readonly FitHistogram[];
  /**
   * normalised weight per row (sums to 1 over used rows); NaN for left-out rows. Computed on first
   * use (8 bytes per row): exp(logLikelihood[r] - logNormaliser).
   */
  readonly weights: Float64Array;
  /** ln of the sum of the likelihoods of the used rows: weight = exp(log_likelihood - logNormaliser) */
  readonly logNormaliser: number;
  /** Gaussian log-likelihood per row (natural log, constants included); NaN for left-out rows */
  readonly logLikelihood: Float64Array;
  /** scenario id per row; null when the ids run firstId, firstId + 1, ... (see rowId) */
  readonly ids: Float64Array | null;
  /** the id of the first row */
  readonly firstId: number;
}
