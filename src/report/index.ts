/**
 * Pictures of melting results: column diagrams, sweep maps, sensitivity bars and curves, and the
 * self-contained HTML report. Every picture is a Vega-Lite spec rendered to SVG in Node.
 */
export { renderColumnDiagram, columnDiagramSpec, COLUMN_MARKS, type ColumnDiagramOptions } from './column-diagram.js';
export {
  columnDiagramData,
  scenarioLabels,
  wetSolidusName,
  meltStopIndex,
  DRY_SOLIDUS,
  LHERZ_LIQUIDUS,
  type ColumnDiagramData,
  type CurvePoint,
  type DepthBand,
  type DiagramScenario,
  type DiagramScenarioSummary,
  type MeltPoint,
  type PathPoint,
} from './column-diagram-data.js';
export { gridSliceMap, binnedMap, mapSubtitle, cellEdges, defaultBins, middleValue, nearestValue, type MapCell, type SweepMapData } from './sweep-map.js';
export { sweepMapSpec, mapFigureLayout, mapContourLines, MAP_MARKS, type MapFigureOptions } from './map-figure.js';
export { contourLevels, contourSegments, type ContourLevel, type ContourSegment, type NodeGrid } from './map-contours.js';
export { sensitivityBarsSpec, sensitivityBarsLayout, mainEffectsSpec, indexBars, type IndexBar } from './sensitivity-bars.js';
export { buildHtmlReport, writeHtmlReport, representativeRows, type HtmlReport, type ReportPlotKind } from './html-report.js';
export { resolveReportOptions, parseAtOption, DEFAULT_REPORT_OUTPUTS, type ReportOptions, type ResolvedReportOptions } from './report-options.js';
export { readResultsColumns, readResultsInfo, type ResultsColumns, type ResultsFileInfo } from './results-columns.js';
export { renderSvg, prefixSvgIds, type PlotSpec, type RenderedSvg, type RenderOptions } from './render.js';
export { estimateTextWidth, installTextMetrics } from './text-metrics.js';
export { axisTitle, axisTitleOf, displayLabel, displayUnit, fieldInfo, labelOf, unitOf, shortDescription } from './labels.js';
export { FONT, FONT_FAMILY, fontFiles, textWidthPx, wrapText } from './font.js';
export { plotConfig, CATEGORICAL, MEASURE_COLOURS, HEATMAP_SCHEME, MAX_DIAGRAM_SCENARIOS } from './theme.js';
