/**
 * Fitting a table held in memory: one batch through the accumulator. For files, stream the
 * batches through a FitAccumulator yourself (or use fitResultsFile).
 */
import { FitAccumulator } from './accumulate.js';
import { finishFit } from './fit-result.js';
import type { FitBatch, FitResult, FitSetup } from './types.js';

/**
 * Fit observations to a table: Gaussian likelihood per row, the design as the prior, weights and
 * summaries out.
 *
 * ```ts
 * const fit = fitTable(
 *   { rows: n, inputs: { x }, outputs: { y } },
 *   { observations: [{ output: 'y', value: 3, sd: 0.5 }], prior: { kind: 'grid', axes: [{ name: 'x', values, min: 0, max: 1, scale: 'linear' }] } },
 * );
 * fit.posterior.x.p50; fit.weights; fit.ess;
 * ```
 * @throws InputError for a missing column, no observation, or when no row can be used
 */
export function fitTable(table: FitBatch, setup: FitSetup): FitResult {
  const acc = new FitAccumulator({ ...setup, expectedRows: setup.expectedRows ?? table.rows });
  acc.add(table);
  return finishFit(acc);
}
