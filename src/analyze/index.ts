/**
 * Sensitivity analysis of sweep tables (model-agnostic: plain input/output columns and a layout).
 */
export { analyzeSensitivity } from './analyze.js';
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
