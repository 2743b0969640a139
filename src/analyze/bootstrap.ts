/**
 * Bootstrap percentile confidence intervals (Efron 1979, Ann. Statist. 7; percentile interval as
 * in Efron & Tibshirani 1993, An Introduction to the Bootstrap, ch. 13).
 */
import { percentileSorted } from './stats.js';

/**
 * Percentile interval of the finite bootstrap replicates at the given level (e.g. 0.95 -> the
 * 2.5th and 97.5th percentiles). Null when fewer than 2 replicates are finite.
 */
export function percentileInterval(replicates: Float64Array, level: number): [number, number] | null {
  const finite = replicates.filter((v) => Number.isFinite(v)).sort();
  if (finite.length < 2) return null;
  const tail = (1 - level) / 2;
  return [percentileSorted(finite, finite.length, tail), percentileSorted(finite, finite.length, 1 - tail)];
}
