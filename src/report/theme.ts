/**
 * The look of meltsweep's pictures: one place for colours, type and the Vega-Lite configuration.
 *
 * Colour choices are readable by colour-blind readers: categorical series use the Okabe & Ito
 * (2008) palette (reordered so the low-contrast yellow comes last), continuous maps use viridis
 * (perceptually uniform, monotone in lightness, legible in greyscale).
 */
import type { Config } from 'vega-lite';
import { FONT } from './font.js';

export { FONT };

/** Text and line colours of the house style. */
export const INK = '#1d2733';
export const MUTED = '#5a6573';
export const HAIRLINE = '#a7b0ba';
export const GRID = '#e8ecf0';
export const PAPER = '#ffffff';
/** Reference curves (solidus, liquidus): neutral so the scenarios carry the colour. */
export const REFERENCE = '#4a4f57';
/** The conductive lid band. */
export const LID_FILL = '#9aa3ad';
/** A lid drawn as a bar (column diagram lanes). */
export const LID_BAR = '#7d8791';
/** Cells or bins without a value. */
export const NO_VALUE_FILL = '#eef0f2';

/** Okabe-Ito categorical palette: blue, vermillion, bluish green, reddish purple, orange, sky blue, black, yellow. */
export const CATEGORICAL: readonly string[] = ['#0072B2', '#D55E00', '#009E73', '#CC79A7', '#E69F00', '#56B4E9', '#000000', '#F0E442'];

/** Most scenarios one column diagram draws (one palette colour each). */
export const MAX_DIAGRAM_SCENARIOS = CATEGORICAL.length;

/** First-order and total Sobol indices: blue and orange of the same palette. */
export const MEASURE_COLOURS: Readonly<Record<'S1' | 'ST', string>> = { S1: '#0072B2', ST: '#E69F00' };

/** Sequential scheme of the heat maps. */
export const HEATMAP_SCHEME = 'viridis';

/**
 * Number format of axis and legend labels: plain digits, no thousands separator ("1300", not
 * "1,300"), trailing zeros dropped.
 */
export const NUMBER_FORMAT = '.6~r';

/** The Vega-Lite configuration every picture is rendered with. */
export function plotConfig(): Config {
  return {
    background: PAPER,
    padding: { left: 10, right: 14, top: 10, bottom: 10 },
    font: FONT,
    view: { stroke: null, continuousWidth: 320, continuousHeight: 240 },
    title: {
      anchor: 'start',
      fontSize: 14,
      fontWeight: 600,
      color: INK,
      subtitleColor: MUTED,
      subtitleFontSize: 11.5,
      subtitlePadding: 4,
      offset: 12,
    },
    axis: {
      domainColor: HAIRLINE,
      tickColor: HAIRLINE,
      tickSize: 4,
      labelColor: MUTED,
      labelFontSize: 10.5,
      titleColor: INK,
      titleFontSize: 11.5,
      titleFontWeight: 500,
      titlePadding: 9,
      gridColor: GRID,
      gridWidth: 1,
      labelPadding: 3,
    },
    // numbers only: a number format on a category axis turns its labels into "NaN"
    axisQuantitative: { format: NUMBER_FORMAT },
    header: { labelColor: INK, labelFontSize: 11.5, labelFontWeight: 500, titleFontSize: 12 },
    legend: {
      labelColor: MUTED,
      labelFontSize: 10.5,
      titleColor: INK,
      titleFontSize: 11,
      titleFontWeight: 500,
      symbolStrokeWidth: 2.4,
      symbolSize: 160,
      labelLimit: 420,
      rowPadding: 5,
      columnPadding: 14,
      padding: 2,
    },
    range: { category: [...CATEGORICAL], heatmap: { scheme: HEATMAP_SCHEME }, ramp: { scheme: HEATMAP_SCHEME } },
    line: { strokeWidth: 2, strokeCap: 'round', strokeJoin: 'round' },
    point: { filled: true, size: 26 },
    bar: { cornerRadiusEnd: 2 },
    text: { font: FONT, color: MUTED, fontSize: 10.5 },
    concat: { spacing: 26 },
  };
}
