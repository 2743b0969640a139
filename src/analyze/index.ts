/**
 * Sensitivity analysis of sweep tables (model-agnostic: plain input/output columns and a layout).
 */
export { analyzeSensitivity, SALTELLI_DROP_WARNING_FRACTION } from './analyze.js';
export { affineCopy, findAffineCopies, type AffineCopy } from './copies.js';
export { decimalsFor, formatIndex, indexPrecision, needsMoreSamples, WIDE_INTERVAL } from './precision.js';
export { formatSensitivitySummary, type SummaryOptions } from './summary.js';
export { includeFromStatus, layoutInputs, layoutRows } from './validate.js';
export type {
  AnalysisDesignKind,
  AnalysisLayout,
  EdgeRule,
  GridAxisLayout,
  MainEffectCurve,
  OutputCounts,
  ResolvedSensitivityOptions,
  SensitivityCounts,
  SensitivityInput,
  SensitivityMeasure,
  SensitivityOptions,
  SensitivityRecord,
  SensitivityReport,
  SlopeScale,
} from './types.js';
