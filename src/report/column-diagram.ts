/**
 * Column diagram, meltsweep's own layout for comparing scenarios:
 * - left, temperature against depth (depth increasing downward, temperature on the top axis): the
 *   reference curves in grey (dry solidus solid, one dashed wet solidus per water content,
 *   lherzolite liquidus dotted) and each scenario's path in its colour: thin solid adiabat below the
 *   onset, a melting path whose width grows with the melt fraction, a dashed conductive profile
 *   drawn in full from the surface where the column is conductive; a filled dot where melting
 *   starts, an open dot where the melt fraction stops growing;
 * - middle, one numbered lane per scenario on the same depth scale: a grey bar for its lid and a
 *   bar in its colour for its melting interval (no shading across the panels);
 * - right, melt fraction against depth, with pressure on the right-hand axis;
 * - below, a key whose entries wrap to the figure's width (numbers match the lanes).
 * The default title names every input held constant across the scenarios.
 */
import type { ModelOptions } from '../physics/types.js';
import { axisTitle, fixedValueLabel, profileFieldInfo } from './labels.js';
import { columnDiagramData, DRY_SOLIDUS, LHERZ_LIQUIDUS, type ColumnDiagramData, type DiagramScenario } from './column-diagram-data.js';
import { keyPanel, pressureAxisPanel, renderFigure, wrappedTitle, type FigureLayout, type KeyEntry } from './figure.js';
import type { PlotSpec, RenderedSvg } from './render.js';
import { meltFractionAxisMax } from './ticks.js';
import { CATEGORICAL, LID_BAR, MAX_DIAGRAM_SCENARIOS, REFERENCE } from './theme.js';

/** Layout options of a column diagram. */
export interface ColumnDiagramOptions {
  /** title (default: "Melting column(s)" and the inputs held constant) */
  readonly title?: string;
  /** subtitle, one string per line (default: the thermal model and columns not drawn) */
  readonly subtitle?: string | readonly string[];
  /** width of the temperature panel, px (default 330) */
  readonly width?: number;
  /** height of the panels, px (default: from the width) */
  readonly height?: number;
}

/** Names of the marks a column diagram draws, as they appear in the SVG's class attributes. */
export const COLUMN_MARKS = {
  curves: 'reference_curves',
  adiabat: 'solid_adiabat',
  conductive: 'conductive_profile',
  melting: 'melting_path',
  meltFraction: 'melt_fraction',
  onsets: 'melting_onsets',
  stops: 'melting_stops',
  lanes: 'depth_lanes',
} as const;

/** Marks drawn along the data of the temperature and melt-fraction panels (for frame checks). */
export const COLUMN_DATA_MARKS: readonly string[] = [COLUMN_MARKS.curves, COLUMN_MARKS.adiabat, COLUMN_MARKS.conductive, COLUMN_MARKS.melting, COLUMN_MARKS.meltFraction, COLUMN_MARKS.onsets, COLUMN_MARKS.stops, COLUMN_MARKS.lanes];

/** Dash patterns: dry solidus solid, lherzolite liquidus dotted, wet solidi dashed (one pattern per water content). */
const LIQUIDUS_DASH: readonly number[] = [1.5, 2.5];
const WET_DASHES: readonly (readonly number[])[] = [[6, 3], [10, 3, 2, 3], [3, 2], [12, 4], [5, 2, 1, 2], [8, 5], [4, 4], [14, 3]];

/** Width of the melting path at zero and at the largest melt fraction, px. */
const TRAIL_WIDTH: readonly [number, number] = [1.8, 8];

/** Most half-width (px) a drawn melting path reaches beyond its centre line. */
export const MELTING_PATH_HALF_WIDTH = TRAIL_WIDTH[1] / 2;

function curveDash(name: string, wetIndex: number): number[] {
  if (name === DRY_SOLIDUS) return [];
  if (name === LHERZ_LIQUIDUS) return [...LIQUIDUS_DASH];
  return [...WET_DASHES[wetIndex % WET_DASHES.length]];
}

type Row = Record<string, string | number | number[]>;

/** The default title: "Melting columns at water 100 ppm, lid thickness 20 km" (the inputs held constant). */
export function defaultTitle(data: ColumnDiagramData): string {
  const n = data.scenarios.length;
  const held = data.held.map((h) => fixedValueLabel(h.name, h.value));
  return `${n === 1 ? 'Melting column' : 'Melting columns'}${held.length > 0 ? ` at ${held.join(', ')}` : ''}`;
}

function defaultSubtitle(data: ColumnDiagramData): string[] {
  const thermal = [...new Set(data.scenarios.map((s) => s.thermal))].join(' and ');
  const lines = [`${thermal} ${data.scenarios.length === 1 ? 'column' : 'columns'}, Katz et al. (2003) melting`];
  const missing = data.scenarios.filter((s) => s.result.status === 'failed' || s.result.status === 'onset_beyond_range');
  for (const s of missing.slice(0, 3)) lines.push(`no melting path for ${s.label}: ${s.result.status === 'failed' ? 'the column failed' : 'melting starts deeper than the model range'}`);
  if (missing.length > 3) lines.push(`... and ${missing.length - 3} more scenarios without a melting path`);
  return lines;
}



/** The Vega-Lite spec of a column diagram for data computed by columnDiagramData. */
export function columnDiagramSpec(data: ColumnDiagramData, options: ColumnDiagramOptions = {}): PlotSpec {
  const width = Math.round(options.width ?? 330);
  const height = Math.round(options.height ?? Math.min(470, Math.max(250, width * 1.2)));
  const n = data.scenarios.length;
  if (n > MAX_DIAGRAM_SCENARIOS) throw new Error(`report: a column diagram draws at most ${MAX_DIAGRAM_SCENARIOS} scenarios, got ${n}`);
  const colourOf = new Map(data.scenarios.map((s, k) => [s.label, CATEGORICAL[k]]));
  const withColour = <T extends { scenario: string }>(xs: readonly T[]): Row[] => xs.map((q) => ({ ...(q as unknown as Row), colour: colourOf.get(q.scenario) as string }));
  const depthScale = { domain: [0, data.depthMaxKm], reverse: true, nice: false, zero: false };
  const y = (title: string | null, axis: Record<string, unknown> = {}) => ({ field: 'depth_km', type: 'quantitative' as const, scale: depthScale, title, axis: { grid: true, ...axis } });
  const colour = { field: 'colour', type: 'nominal' as const, scale: null };
  const tScale = { domain: [...data.temperatureRangeC], nice: false, zero: false };
  const depthTitle = axisTitle(profileFieldInfo('depth_km'));
  const tx = { field: 't_c', type: 'quantitative' as const, scale: tScale };
  const line = (name: string, values: Row[], mark: Record<string, unknown>) => ({
    name,
    data: { values },
    mark: { type: 'line' as const, clip: true, ...mark },
    encoding: { x: tx, y: y(depthTitle), order: { field: 'depth_km', type: 'quantitative' as const }, color: colour, detail: { field: 'scenario', type: 'nominal' as const } },
  });
  const fMaxAll = Math.max(0.01, ...data.meltFraction.map((q) => q.f));
  const wetNames = data.curveNames.filter((c) => c !== DRY_SOLIDUS && c !== LHERZ_LIQUIDUS);
  const dashOf = new Map(data.curveNames.map((c) => [c, curveDash(c, wetNames.indexOf(c))]));
  const curveRows: Row[] = data.curves.map((c) => ({ ...c, key: `${c.curve}#${c.part}`, dash: dashOf.get(c.curve) as number[] }));

  const temperaturePanel = {
    width,
    height,
    encoding: {
      x: { ...tx, title: axisTitle(profileFieldInfo('t_c')), axis: { orient: 'top' as const, grid: true, tickCount: Math.max(3, Math.round(width / 70)) } },
      y: y(depthTitle),
    },
    layer: [
      {
        name: COLUMN_MARKS.curves,
        data: { values: curveRows },
        mark: { type: 'line' as const, strokeWidth: 1.3, color: REFERENCE, clip: true },
        encoding: { x: tx, y: y(depthTitle), order: { field: 'depth_km', type: 'quantitative' as const }, detail: { field: 'key', type: 'nominal' as const }, strokeDash: { field: 'dash', type: 'nominal' as const, scale: null } },
      },
      line(COLUMN_MARKS.adiabat, withColour(data.adiabat), { strokeWidth: 1.2 }),
      line(COLUMN_MARKS.conductive, withColour(data.conductive), { strokeWidth: 1.6, strokeDash: [5, 3] }),
      {
        name: COLUMN_MARKS.melting,
        data: { values: withColour(data.melting) },
        mark: { type: 'trail' as const, clip: true, opacity: 0.9 },
        encoding: {
          x: tx,
          y: y(depthTitle),
          order: { field: 'depth_km', type: 'quantitative' as const },
          color: colour,
          detail: { field: 'scenario', type: 'nominal' as const },
          size: { field: 'f', type: 'quantitative' as const, scale: { domain: [0, fMaxAll], range: [...TRAIL_WIDTH] }, legend: null },
        },
      },
      {
        name: COLUMN_MARKS.stops,
        data: { values: withColour(data.stops) },
        mark: { type: 'point' as const, shape: 'circle', size: 40, filled: true, fill: '#ffffff', strokeWidth: 1.8, opacity: 1 },
        encoding: { x: tx, y: y(depthTitle), stroke: colour },
      },
      {
        name: COLUMN_MARKS.onsets,
        data: { values: withColour(data.onsets) },
        mark: { type: 'point' as const, shape: 'circle', size: 48, filled: true, stroke: '#ffffff', strokeWidth: 1.2, opacity: 1 },
        encoding: { x: tx, y: y(depthTitle), color: colour },
      },
    ],
  };

  // one lane per scenario: its lid (grey) and its melting interval (its colour), numbered
  const laneWidth = 13;
  const laneRows: Row[] = data.bands.map((b) => ({ ...b, laneName: String(b.lane), colour: b.kind === 'lid' ? LID_BAR : (colourOf.get(b.scenario) as string) }));
  const lanePanel = {
    width: laneWidth * n + 4,
    height,
    data: { values: laneRows },
    name: COLUMN_MARKS.lanes,
    mark: { type: 'bar' as const, width: 7, cornerRadiusEnd: 0 },
    encoding: {
      x: { field: 'laneName', type: 'ordinal' as const, scale: { domain: data.scenarios.map((_, k) => String(k + 1)), paddingInner: 0.2, paddingOuter: 0.1 }, title: null, axis: { orient: 'top' as const, ticks: false, domain: false, labelAngle: 0, labelFontWeight: 700, labelColor: '#1d2733', labelPadding: 4 } },
      y: { field: 'top_km', type: 'quantitative' as const, scale: depthScale, title: null, axis: { grid: true, labels: false, ticks: false, domain: false } },
      y2: { field: 'bottom_km' },
      color: colour,
    },
  };

  const fDomainMax = meltFractionAxisMax(fMaxAll);
  const meltWidth = Math.round(Math.max(60, width * 0.42));
  const meltPanel = {
    width: meltWidth,
    height,
    layer: [
      {
        name: COLUMN_MARKS.meltFraction,
        data: { values: withColour(data.meltFraction) },
        mark: { type: 'line' as const, clip: true, strokeWidth: 2 },
        encoding: {
          x: { field: 'f', type: 'quantitative' as const, title: axisTitle(profileFieldInfo('f')), scale: { domain: [0, fDomainMax], nice: false }, axis: { orient: 'top' as const, grid: true, tickCount: Math.max(2, Math.round(meltWidth / 45)), labelOverlap: 'greedy' as const, labelFlush: true } },
          y: y(null, { labels: false, ticks: false }),
          order: { field: 'depth_km', type: 'quantitative' as const },
          color: colour,
          detail: { field: 'scenario', type: 'nominal' as const },
        },
      },
    ],
  };
  const pressureAxis = pressureAxisPanel(y, axisTitle(profileFieldInfo('p_gpa')), data.pressureMaxGpa, data.depthMaxKm, height);


  // the key: scenarios (numbered as their lanes), then the reference curves and the marks
  const keyWidth = width + lanePanel.width + meltWidth + 70;
  const scenarioEntries: KeyEntry[] = data.scenarios.map((s, k) => ({ tag: String(k + 1), swatch: { kind: 'line', colour: CATEGORICAL[k], width: 3 }, label: s.label }));
  const markEntries: KeyEntry[] = [
    ...data.curveNames.map((c): KeyEntry => ({ swatch: { kind: 'line', colour: REFERENCE, dash: dashOf.get(c), width: 1.4 }, label: c })),
    { swatch: { kind: 'line', colour: '#5a6573', width: 1.2 }, label: 'solid adiabat' },
    { swatch: { kind: 'line', colour: '#5a6573', width: 5 }, label: 'melting path, wider with more melt' },
    ...(data.conductive.length > 0 ? [{ swatch: { kind: 'line', colour: '#5a6573', dash: [5, 3], width: 1.6 }, label: 'conductive profile, from the surface' } as KeyEntry] : []),
    { swatch: { kind: 'point', colour: '#5a6573', filled: true }, label: 'melting starts' },
    { swatch: { kind: 'point', colour: '#5a6573', filled: false }, label: 'melt fraction stops growing' },
    { swatch: { kind: 'bar', colour: LID_BAR }, label: 'lanes: lid (grey) and melting interval (colour)' },
  ];
  const wetNote = data.wetWaters.length > 0 ? 'Near the surface the wet solidus rejoins the dry one: water saturation falls to zero as pressure goes to zero.' : undefined;
  const key = keyPanel([{ title: n === 1 ? 'Scenario' : 'Scenarios', entries: scenarioEntries }, { entries: markEntries, note: wetNote }], keyWidth);

  const subtitle = options.subtitle === undefined ? defaultSubtitle(data) : typeof options.subtitle === 'string' ? [options.subtitle] : [...options.subtitle];
  const spec = {
    $schema: 'https://vega.github.io/schema/vega-lite/v6.json',
    title: wrappedTitle(options.title ?? defaultTitle(data), subtitle, keyWidth),
    vconcat: [{ hconcat: [temperaturePanel, lanePanel, { hconcat: [meltPanel, pressureAxis], spacing: 0 }], spacing: 10 }, key.spec],
    spacing: 16,
    resolve: { scale: { y: 'independent' as const, x: 'independent' as const } },
  };
  return spec as unknown as PlotSpec;
}

/** The layout of a column diagram for renderFigure (main panel: the temperature panel). */
export function columnDiagramLayout(data: ColumnDiagramData, options: ColumnDiagramOptions = {}): FigureLayout {
  return { build: (w) => columnDiagramSpec(data, { ...options, width: w }), natural: options.width ?? 330, min: 110 };
}

/**
 * Compute and render a column diagram to SVG.
 * @param items up to MAX_DIAGRAM_SCENARIOS scenarios (8)
 * @param model thermal model, water mode and parameters (the profile is always computed)
 * @param options layout; `targetWidth` lays the whole figure out to that width (px)
 */
export async function renderColumnDiagram(
  items: readonly DiagramScenario[],
  model: ModelOptions,
  options: ColumnDiagramOptions & { readonly idPrefix?: string; readonly targetWidth?: number } = {},
): Promise<RenderedSvg & { readonly data: ColumnDiagramData }> {
  const data = columnDiagramData(items, model);
  const rendered = await renderFigure(columnDiagramLayout(data, options), options.targetWidth, options.idPrefix);
  return { svg: rendered.svg, warnings: rendered.warnings, data };
}
