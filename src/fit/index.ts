/**
 * Fitting observations to sweep tables (model-agnostic: plain input/output columns and the design).
 */
export { FitAccumulator, DEFAULT_LEAVE_OUT } from './accumulate.js';
export { PAIR_CELLS } from './weighted-sums.js';
export { finishFit, summaryOf, weightsOf, SUMMARY_LEVELS } from './fit-result.js';
export { PredictiveAccumulator, PREDICTIVE_CELLS, PREDICT_PLOT_CELLS } from './predictive.js';
export { fitTable } from './fit-table.js';
export { axisCells, cellQuantile, equalCells, gridCells, SAMPLED_CELLS, type Cells } from './cells.js';
export { describePrior } from './prior.js';
export { fitWarnings, massBelow, MIN_ESS, EDGE_ZONE } from './warnings.js';
export { parseObserveOption, parseDiscrepancyOption, observationsFromData, checkObservations, type ObservableColumns } from './observations.js';
export { refineAxes, refinedSweepData, REFINE_MARGIN, REFINE_EXTEND, type InputLimits, type RefinedAxis } from './refine.js';
export type {
  FitAxis,
  FitBatch,
  FitBestRow,
  FitDesignKind,
  FitHistogram,
  FitPairDensity,
  FitPrior,
  FitResult,
  FitScale,
  FitSetup,
  FitSummary,
  FitWarning,
  Observation,
} from './types.js';
export { formatFitSummary, formatFitNumber, fitJson } from './format.js';
