/**
 * meltsweep's library API. Every public export is listed here by name; anything not exported
 * from this file is internal and may change.
 *
 * ```ts
 * import { loadSweepFile, runSweep, meltColumn, defaultModel } from 'meltsweep';
 * ```
 */

// ---- physics: one column ----------------------------------------------------------------
export { meltColumn, defaultModel, resolveThermalModel, THERMAL_MODELS } from './physics/column.js';
export {
  COLUMN_STATUSES,
  MODEL_MAX_P_GPA,
  type ColumnProfile,
  type ColumnResult,
  type ColumnStatus,
  type ModelOptions,
  type Scenario,
  type ThermalModel,
  type WaterMode,
} from './physics/types.js';
export {
  DEFAULT_PARAMS,
  PARAM_INFO,
  PARAM_NAMES,
  ParamError,
  resolveParams,
  type MeltParams,
  type ParamInfo,
  type ParamName,
  type ParamOverrides,
} from './physics/params.js';
export { adiabatTempC, adiabatTempK } from './physics/adiabat.js';
export { depthKmFromPGpa, pGpaFromDepthKm } from './physics/units.js';
export { INPUT_RANGES, type InputRange } from './physics/ranges.js';

// ---- the field registry (names, units, types, descriptions of every column written) --------
export {
  INPUT_FIELDS,
  INPUT_NAMES,
  RESULT_NUMERIC_FIELDS,
  RESULT_NUMERIC_NAMES,
  STATUS_FIELD,
  REASON_FIELD,
  PROFILE_FIELDS,
  PROFILE_TABLE_FIELDS,
  type FieldInfo,
  type FieldKind,
  type InputName,
  type ResultNumericName,
  type ProfileFieldName,
  type ProfileTableFieldName,
} from './physics/fields.js';
export { SCENARIO_ID_FIELD, BLOCK_FIELD, resultFieldInfos, resultsSchema, readResultsMeta, type ResultsTableMeta } from './io/arrow-schema.js';

// ---- sweep files and plans -----------------------------------------------------------------
export {
  validateSweep,
  loadSweepFile,
  parseSweepText,
  parseSweepData,
  sweepHash,
  countPoints,
  sweepJsonSchema,
  sweepJsonSchemaText,
  describeModelValidator,
  type DescribedModelValidator,
  type JsonSchema,
  type ModelSectionValidator,
  type AxisScale,
  type AxisSpec,
  type DesignKind,
  type DesignSpec,
  type ModelSpec,
  type SweepSpec,
} from './spec/index.js';
export { planSweep, shardRange, parseShardArg, describePlan, type DesignLayout, type Plan, type PointBatch, type IndexRange, type ShardSpec } from './plan/index.js';

// ---- running, merging, profiles ------------------------------------------------------------
export { runSweep, type RunOptions, type RunSummary, type ShardSelection } from './run/run-sweep.js';
export { mergeShards, checkShards, type MergeOptions, type MergeSummary } from './run/merge.js';
export { computeChunk, makeChunkContext, type ChunkContext, type ChunkResult } from './run/compute-chunk.js';
export { parseProfileGrid, profileGridPressures, formatProfileGrid, MAX_PROFILE_POINTS, type ProfileGrid } from './run/profile-grid.js';
export { sampleColumnProfile, type ProfileSamples } from './run/profile-sampling.js';
export { estimateRun, type RunEstimate } from './run/estimate.js';
export type { ProgressSink } from './run/progress.js';

// ---- sensitivity ---------------------------------------------------------------------------
export { analyzeSensitivity, formatSensitivitySummary } from './analyze/index.js';
export type { AnalysisLayout, SensitivityInput, SensitivityOptions, SensitivityRecord, SensitivityReport } from './analyze/index.js';
export { analyzeResultsFile, writeSensitivityTable, sensitivityPathFor, type SensitivityFileOptions } from './io/sensitivity-file.js';

// ---- fitting observations ------------------------------------------------------------------
export {
  fitTable,
  FitAccumulator,
  finishFit,
  weightsOf,
  describePrior,
  parseObserveOption,
  parseDiscrepancyOption,
  observationsFromData,
  checkObservations,
  refineAxes,
  refinedSweepData,
  formatFitSummary,
  fitJson,
  type FitAxis,
  type FitBatch,
  type FitBestRow,
  type FitPrior,
  type FitResult,
  type FitSetup,
  type FitSummary,
  type FitWarning,
  type Observation,
} from './fit/index.js';
export { fitResultsFile, fitPathFor, priorOf, type FitFileOptions, type FitFileResult } from './io/fit-file.js';
export { writeFitTable, writeRefinedSweep, refinedSweep } from './io/fit-output.js';

// ---- tables on disk: formats, readers, inspection -----------------------------------------
export { OUTPUT_FORMATS, resolveOutputFormat, parseOutputFormat, formatFromExtension, profilesPathFor, type OutputFormat } from './io/output-format.js';
export { detectTableFormat, readTableSchema, readTableBatches } from './io/table-reader.js';
export { openTableSink, type TableSink, type TableSinkOptions } from './io/table-sink.js';
export { csvSidecarPath, readCsvSidecar, type CsvSidecar, type CsvSidecarColumn } from './io/csv-file.js';
export type { ParquetWriteOptions } from './io/parquet-file.js';
export { inspectTable, formatInspection, type TableInspection, type InspectedColumn, type InspectedValue } from './io/inspect-table.js';

// ---- errors and version --------------------------------------------------------------------
export { InputError, RunError, EXIT_OK, EXIT_RUN_FAILED, EXIT_BAD_INPUT } from './errors.js';
export { TOOL_VERSION } from './version.js';
export * from './process/index.js';
