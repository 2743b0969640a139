/**
 * Column diagram: temperature against depth (depth increasing downward) with the dry solidus, the
 * wet solidus of each water content, the lherzolite liquidus, each scenario's temperature path and
 * the lid and melting-interval bands; beside it, melt fraction against depth on the same depth
 * scale, with pressure on the right-hand axis.
 */
import type { ModelOptions } from '../physics/types.js';
import { profileFieldInfo, axisTitle } from './labels.js';
import { columnDiagramData, DRY_SOLIDUS, LHERZ_LIQUIDUS, type ColumnDiagramData, type DiagramScenario } from './column-diagram-data.js';
import { renderSvg, type PlotSpec, type RenderedSvg } from './render.js';
import { CATEGORICAL, LID_FILL, MAX_DIAGRAM_SCENARIOS, REFERENCE } from './theme.js';

/** Layout options of a column diagram. */
export interface ColumnDiagramOptions {
  /** title above the diagram (default "Melting column") */
  readonly title?: string;
  /** subtitle, one string per line (default: the thermal model, the key to the lines, columns not drawn) */
  readonly subtitle?: string | readonly string[];
  /** width of the temperature panel, px (default 360) */
  readonly width?: number;
  /** height of both panels, px (default 420) */
  readonly height?: number;
}

/** Names of the marks a column diagram draws, as they appear in the SVG's class attributes. */
export const COLUMN_MARKS = {
  curves: 'reference_curves',
  adiabat: 'solid_adiabat',
  conductive: 'conductive_profile',
  melting: 'melting_path',
  meltFraction: 'melt_fraction',
} as const;

/** Dash patterns: dry solidus solid, lherzolite liquidus dotted, wet solidi dashed (one pattern per water content). */
const DRY_DASH: readonly number[] = [1, 0];
const LIQUIDUS_DASH: readonly number[] = [1.5, 3];
const WET_DASHES: readonly (readonly number[])[] = [[7, 3], [3, 2], [10, 3, 2, 3], [12, 4], [5, 2, 1, 2], [8, 5], [4, 4], [14, 3]];

function curveDash(name: string, wetIndex: number): number[] {
  if (name === DRY_SOLIDUS) return [...DRY_DASH];
  if (name === LHERZ_LIQUIDUS) return [...LIQUIDUS_DASH];
  return [...WET_DASHES[wetIndex % WET_DASHES.length]];
}

type Row = Record<string, string | number>;

function rows<T extends object>(xs: readonly T[]): Row[] {
  return xs as unknown as Row[];
}

/** The Vega-Lite spec of a column diagram for data computed by columnDiagramData. */
export function columnDiagramSpec(data: ColumnDiagramData, options: ColumnDiagramOptions = {}): PlotSpec {
  const width = options.width ?? 360;
  const height = options.height ?? 420;
  const labels = data.scenarios.map((s) => s.label);
  if (labels.length > MAX_DIAGRAM_SCENARIOS) throw new Error(`report: a column diagram draws at most ${MAX_DIAGRAM_SCENARIOS} scenarios, got ${labels.length}`);
  const depthTitle = axisTitle(profileFieldInfo('depth_km'));
  const depthScale = { domain: [0, data.depthMaxKm], reverse: true, nice: false, zero: true };
  const colour = {
    field: 'scenario',
    type: 'nominal' as const,
    title: 'Scenario',
    scale: { domain: labels, range: CATEGORICAL.slice(0, labels.length) },
    legend: { orient: 'bottom' as const, direction: 'vertical' as const, columns: 1, symbolType: 'stroke', symbolOpacity: 1, symbolStrokeWidth: 3 },
  };
  const y = (field: string) => ({ field, type: 'quantitative' as const, scale: depthScale, title: depthTitle, axis: { grid: true } });
  const lidBands = rows(dedupeLid(data));
  const meltBands = rows(data.bands.filter((b) => b.kind === 'melting'));
  // bands span the whole panel width (explicit pixel extents; no temperature scale involved)
  const meltWidth = Math.round(width * 0.48);
  const bandLayers = (panelWidth: number) => [
    {
      data: { values: lidBands },
      mark: { type: 'rect' as const, fill: LID_FILL, opacity: 0.22 },
      encoding: { x: { value: 0 }, x2: { value: panelWidth }, y: y('top_km'), y2: { field: 'bottom_km' } },
    },
    {
      data: { values: meltBands },
      mark: { type: 'rect' as const, opacity: 0.07 },
      encoding: { x: { value: 0 }, x2: { value: panelWidth }, y: y('top_km'), y2: { field: 'bottom_km' }, color: colour },
    },
  ];
  const lineLayer = (name: string, values: Row[], mark: Record<string, unknown>, xField: string) => ({
    name,
    data: { values },
    mark: { type: 'line' as const, clip: true, ...mark },
    encoding: {
      x: { field: xField, type: 'quantitative' as const },
      y: y('depth_km'),
      order: { field: 'depth_km', type: 'quantitative' as const },
      color: colour,
      detail: { field: 'scenario', type: 'nominal' as const },
    },
  });
  const tTitle = axisTitle(profileFieldInfo('t_c'));
  const temperaturePanel = {
    width,
    height,
    title: { text: 'Temperature path', fontSize: 12, fontWeight: 500 as const },
    encoding: {
      x: { field: 't_c', type: 'quantitative' as const, title: tTitle, scale: { domain: [...data.temperatureRangeC], nice: false, zero: false }, axis: { orient: 'top' as const, grid: true } },
    },
    layer: [
      ...bandLayers(width),
      {
        name: COLUMN_MARKS.curves,
        data: { values: rows(data.curves) },
        mark: { type: 'line' as const, strokeWidth: 1.3, color: REFERENCE, clip: true },
        encoding: {
          x: { field: 't_c', type: 'quantitative' as const },
          y: y('depth_km'),
          order: { field: 'depth_km', type: 'quantitative' as const },
          strokeDash: {
            field: 'curve',
            type: 'nominal' as const,
            title: 'Reference curves',
            scale: { domain: [...data.curveNames], range: data.curveNames.map((n, i) => curveDash(n, i - 1)) },
            legend: { orient: 'bottom' as const, direction: 'vertical' as const, symbolStrokeColor: REFERENCE, symbolStrokeWidth: 1.5 },
          },
        },
      },
      lineLayer(COLUMN_MARKS.adiabat, rows(data.adiabat), { strokeWidth: 1.3, opacity: 0.9 }, 't_c'),
      lineLayer(COLUMN_MARKS.conductive, rows(data.conductive), { strokeWidth: 1.5, strokeDash: [5, 3] }, 't_c'),
      lineLayer(COLUMN_MARKS.melting, rows(data.melting), { strokeWidth: 3.2 }, 't_c'),
      {
        data: { values: rows(data.onsets) },
        mark: { type: 'point' as const, shape: 'circle', size: 46, filled: true, stroke: '#ffffff', strokeWidth: 1.2, opacity: 1 },
        encoding: { x: { field: 't_c', type: 'quantitative' as const }, y: y('depth_km'), color: colour },
      },
    ],
  };
  const fInfo = profileFieldInfo('f');
  // an explicit domain: with no melting anywhere the melt fraction layer has no data
  const fMax = Math.max(0.01, ...data.meltFraction.map((q) => q.f));
  const pInfo = profileFieldInfo('p_gpa');
  const gpaPerKm = data.pressureMaxGpa / data.depthMaxKm;
  const pressureTicks = niceTicks(data.pressureMaxGpa).map((pGpa) => ({ pGpa, depthKm: pGpa / gpaPerKm }));
  const meltPanel = {
    width: meltWidth,
    height,
    title: { text: 'Melt fraction', fontSize: 12, fontWeight: 500 as const },
    layer: [
      ...bandLayers(meltWidth),
      {
        ...lineLayer(COLUMN_MARKS.meltFraction, rows(data.meltFraction), { strokeWidth: 2.6 }, 'f'),
        encoding: {
          ...lineLayer(COLUMN_MARKS.meltFraction, [], {}, 'f').encoding,
          x: { field: 'f', type: 'quantitative' as const, title: axisTitle(fInfo), scale: { domain: [0, fMax], nice: true }, axis: { orient: 'top' as const, grid: true, format: '~g', tickCount: 4, labelOverlap: 'greedy' as const } },
          y: { ...y('depth_km'), axis: { grid: true, labels: false, title: null, ticks: false } },
        },
      },
    ],
  };
  // pressure as a right-hand axis of the same depth scale (z = P / (rho_s g)): an empty, one pixel
  // wide panel whose axis has ticks at round pressures, placed at their depths
  const pressureAxis = {
    width: 1,
    height,
    data: { values: [{ depth_km: 0 }] },
    mark: { type: 'tick' as const, opacity: 0 },
    encoding: {
      y: {
        ...y('depth_km'),
        axis: {
          orient: 'right' as const,
          grid: false,
          title: axisTitle(pInfo),
          values: pressureTicks.map((t) => t.depthKm),
          labelExpr: `format(datum.value * ${gpaPerKm}, '.1f')`,
        },
      },
    },
  };
  const spec = {
    $schema: 'https://vega.github.io/schema/vega-lite/v6.json',
    title: { text: options.title ?? 'Melting column', subtitle: options.subtitle ?? defaultSubtitle(data) },
    hconcat: [temperaturePanel, { hconcat: [meltPanel, pressureAxis], spacing: 0 }],
    resolve: { scale: { y: 'independent' as const, color: 'shared' as const }, legend: { color: 'shared' as const } },
  };
  return spec as unknown as PlotSpec;
}

/** Round tick values from 0 to max (steps of 1, 2 or 5 times a power of ten, about 8 ticks). */
function niceTicks(max: number): number[] {
  if (!(max > 0)) return [0];
  const raw = max / 8;
  const mag = 10 ** Math.floor(Math.log10(raw));
  const step = [1, 2, 5, 10].map((m) => m * mag).find((s) => s >= raw) ?? 10 * mag;
  const out: number[] = [];
  for (let v = 0; v <= max * (1 + 1e-9); v += step) out.push(Number(v.toPrecision(12)));
  return out;
}

/** One lid band per distinct lid thickness (scenarios with the same lid share a band). */
function dedupeLid(data: ColumnDiagramData): { top_km: number; bottom_km: number }[] {
  const depths = [...new Set(data.bands.filter((b) => b.kind === 'lid').map((b) => b.bottom_km))];
  return depths.map((d) => ({ top_km: 0, bottom_km: d }));
}

function defaultSubtitle(data: ColumnDiagramData): string[] {
  const thermal = [...new Set(data.scenarios.map((s) => s.thermal))].join(' and ');
  const key = ['thin line: solid adiabat', 'thick: melting path', ...(data.conductive.length > 0 ? ['dashed: conductive profile'] : [])].join(', ');
  const plural = data.scenarios.length === 1 ? 'column' : 'columns';
  const lines = [`${thermal} ${plural}; ${key}; shaded: lid (grey) and melting interval`];
  const missing = data.scenarios.filter((s) => s.result.status === 'failed' || s.result.status === 'onset_beyond_range');
  for (const s of missing.slice(0, 3)) lines.push(`no melting path for ${s.label}: ${s.result.status === 'failed' ? 'the column failed' : 'melting starts deeper than the model range'}`);
  if (missing.length > 3) lines.push(`... and ${missing.length - 3} more scenarios without a melting path`);
  return lines;
}

/**
 * Compute and render a column diagram to SVG.
 * @param items up to MAX_DIAGRAM_SCENARIOS scenarios (8)
 * @param model thermal model, water mode and parameters (the profile is always computed)
 */
export async function renderColumnDiagram(
  items: readonly DiagramScenario[],
  model: ModelOptions,
  options: ColumnDiagramOptions & { readonly idPrefix?: string } = {},
): Promise<RenderedSvg & { readonly data: ColumnDiagramData }> {
  const data = columnDiagramData(items, model);
  const rendered = await renderSvg(columnDiagramSpec(data, options), { idPrefix: options.idPrefix });
  return { ...rendered, data };
}
