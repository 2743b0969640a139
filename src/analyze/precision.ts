/**
 * How precisely an index is known, and when it needs more samples. Used to print indices rounded to
 * what the estimator supports instead of to a fixed number of digits.
 */
import type { AnalysisDesignKind, SensitivityRecord } from './types.js';

/** A confidence interval wider than this says the index is not yet known to a useful precision. */
export const WIDE_INTERVAL = 0.25;

/**
 * Uncertainty of an index (absolute, same scale as the index):
 * - with a bootstrap interval: its half-width;
 * - grid designs: the indices of the grid's discrete distribution are exact, 5e-4 (three decimals);
 * - binned first-order estimates (latin-hypercube, sobol): 1 / sqrt(n), the order of the standard
 *   error of a correlation ratio from n rows (common practice; no interval is computed).
 */
export function indexPrecision(r: SensitivityRecord, design: AnalysisDesignKind): number {
  if (r.ci_low !== null && r.ci_high !== null) return Math.max(5e-4, (r.ci_high - r.ci_low) / 2);
  if (design === 'grid') return 5e-4;
  return 1 / Math.sqrt(Math.max(1, r.n));
}

/** Decimals that show an index of this precision: 1 to 3. */
export function decimalsFor(precision: number): number {
  return Math.min(3, Math.max(1, Math.ceil(-Math.log10(precision))));
}

/** The index rounded to its precision; values within the precision of 0 print as 0. */
export function formatIndex(r: SensitivityRecord, design: AnalysisDesignKind): string {
  if (r.value === null) return '-';
  const precision = indexPrecision(r, design);
  const v = Math.abs(r.value) < precision ? 0 : r.value;
  return v.toFixed(decimalsFor(precision));
}

/**
 * Why an index cannot be trusted yet, or null: its value rounded to its precision (formatIndex)
 * lies outside [0, 1] (estimator noise: a Sobol index cannot), or its confidence interval is wider
 * than WIDE_INTERVAL.
 */
export function needsMoreSamples(r: SensitivityRecord, design: AnalysisDesignKind): string | null {
  if (r.value === null) return null;
  const shown = Number(formatIndex(r, design));
  const why: string[] = [];
  if (shown < 0 || shown > 1) why.push('outside [0, 1]');
  if (r.ci_low !== null && r.ci_high !== null && r.ci_high - r.ci_low > WIDE_INTERVAL) {
    why.push(`interval ${r.ci_low.toFixed(2)}-${r.ci_high.toFixed(2)} wider than ${WIDE_INTERVAL}`);
  }
  return why.length === 0 ? null : why.join(', ');
}
