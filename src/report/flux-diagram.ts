/**
 * The wedge-column diagram of the process `flux` (meltsweep's own layout):
 * - left, temperature against depth (depth down, temperature on the top axis): the dry solidus in
 *   grey; for each scenario in its colour its geotherm (solid), its wet solidus (dashed), the
 *   melting interval as a tinted band between the two curves where the geotherm is hotter, the
 *   rock temperature while melting (heavier line; heat balanced only) and its slab top (dotted rule);
 * - right, melt fraction against depth on the same depth scale, tinted down to zero, with a dot at
 *   the deepest and an open dot at the shallowest melting, and pressure on the right-hand axis;
 * - below, a key whose entries wrap (scenario numbers, each with its water threshold).
 * Every number comes from the process's own computation (computeFlux with profiles).
 */
import { drySolidusC } from '../physics/melting.js';
import { pGpaFromDepthKm } from '../physics/units.js';
import { computeFlux, flux, FLUX_INPUTS, FLUX_TABLE_INPUTS, type FluxRuntimeModel } from '../process/flux.js';
import type { ProcessDiagram, ProcessResult } from '../process/types.js';
import { keyPanel, pressureAxisPanel, wrappedTitle, type FigureLayout, type KeyEntry } from './figure.js';
import { formatNumber, labelsOfProcess } from './labels.js';
import type { PlotSpec } from './render.js';
import { meltFractionAxisMax } from './ticks.js';
import { CATEGORICAL, MAX_DIAGRAM_SCENARIOS, MUTED, REFERENCE } from './theme.js';

/** One scenario to draw: the process inputs by name, and an optional key label. */
export interface FluxDiagramItem {
  readonly inputs: Readonly<Record<string, number>>;
  readonly label?: string;
}

/** Names of the marks the diagram draws (SVG class names), for frame checks in tests. */
export const FLUX_MARKS = {
  solidus: 'dry_solidus',
  geotherm: 'geotherm',
  wetSolidus: 'wet_solidus',
  band: 'melting_band',
  rock: 'rock_temperature',
  slab: 'slab_top',
  melt: 'melt_fraction',
  meltFill: 'melt_fraction_fill',
  ends: 'melting_ends',
} as const;

/** Short names of the inputs in key labels. */
const SYMBOLS: Readonly<Record<string, string>> = { tp_c: 'Tp', water_ppm: 'water', lid_km: 'plate', slab_depth_km: 'slab' };

type Row = Record<string, string | number | boolean>;

/** The numbers behind a diagram. */
export interface FluxDiagramData {
  readonly labels: readonly string[];
  readonly results: readonly ProcessResult[];
  /** inputs equal in every scenario (for the title) */
  readonly held: readonly { readonly name: string; readonly value: number }[];
  readonly depthMaxKm: number;
  readonly pressureMaxGpa: number;
  readonly temperatureRangeC: readonly [number, number];
  readonly heat: FluxRuntimeModel['heat'];
  readonly tableFile: string | null;
  readonly notes: readonly string[];
  readonly rows: {
    readonly geotherm: Row[];
    readonly wet: Row[];
    readonly band: Row[];
    readonly rock: Row[];
    readonly melt: Row[];
    readonly ends: Row[];
    readonly slab: Row[];
    readonly solidus: Row[];
  };
}



/** Compute every scenario (with profiles) and arrange the rows the diagram draws. */
export function fluxDiagramData(items: readonly FluxDiagramItem[], model: FluxRuntimeModel): FluxDiagramData {
  if (items.length === 0 || items.length > MAX_DIAGRAM_SCENARIOS) throw new Error(`report: a flux diagram draws 1 to ${MAX_DIAGRAM_SCENARIOS} scenarios, got ${items.length}`);
  const runtime: FluxRuntimeModel = { ...model, withProfile: true };
  const inputs = model.table === null ? FLUX_INPUTS : FLUX_TABLE_INPUTS;
  const differs = inputs.filter((i) => new Set(items.map((s) => s.inputs[i.name])).size > 1);
  const held = inputs.filter((i) => !differs.includes(i)).map((i) => ({ name: i.name, value: items[0].inputs[i.name] }));
  const shown = differs.length > 0 ? differs : inputs;
  const words = labelsOfProcess(flux);
  const auto = items.map((s) => shown.map((i) => `${SYMBOLS[i.name] ?? i.name} ${words.valueWithUnit(i.name, s.inputs[i.name])}`).join(', '));
  const labels = items.map((s, k) => (s.label === undefined ? auto[k] : `${s.label}: ${auto[k]}`));
  const results = items.map((s) => computeFlux(s.inputs, runtime));
  const p = model.params;
  const deepest = Math.max(...items.map((s) => s.inputs.slab_depth_km));
  const depthMaxKm = Math.ceil((deepest * 1.06) / 10) * 10;
  const pressureMaxGpa = pGpaFromDepthKm(depthMaxKm, p.rho_s, p.g);
  const rows: FluxDiagramData['rows'] = { geotherm: [], wet: [], band: [], rock: [], melt: [], ends: [], slab: [], solidus: [] };
  const notes: string[] = [];
  let tMax = drySolidusC(pressureMaxGpa, p);
  results.forEach((r, k) => {
    const scenario = labels[k];
    const colour = CATEGORICAL[k];
    const prof = r.profile;
    rows.slab.push({ scenario, colour, depth_km: items[k].inputs.slab_depth_km, t_from: 0, t_to: 0 });
    if (prof === undefined) {
      notes.push(`scenario ${k + 1} (${scenario}): ${r.status}${r.reason === null ? '' : `, ${r.reason}`}`);
      return;
    }
    let part = 0;
    let inBand = false;
    const n = prof.p_gpa.length;
    for (let i = 0; i < n; i++) {
      const depth = prof.depth_km[i];
      const tGeo = prof.t_geo_c[i];
      tMax = Math.max(tMax, tGeo);
      rows.geotherm.push({ scenario, colour, depth_km: depth, t_c: tGeo });
      rows.wet.push({ scenario, colour, depth_km: depth, t_c: prof.t_wet_solidus_c[i] });
      const f = prof.f[i];
      rows.melt.push({ scenario, colour, depth_km: depth, f });
      // the interval ends are nodes of the profile (F = 0 there): a band part runs from end to end
      const melting = f > 0 || (i > 0 && prof.f[i - 1] > 0) || (i + 1 < n && prof.f[i + 1] > 0);
      if (melting) {
        if (!inBand) part++;
        inBand = true;
        const key = `${scenario}#${part}`;
        rows.band.push({ scenario, colour, key, depth_km: depth, t_lo: Math.min(prof.t_wet_solidus_c[i], tGeo), t_hi: tGeo });
        if (model.heat === 'balanced') rows.rock.push({ scenario, colour, key, depth_km: depth, t_c: prof.t_c[i] });
      } else {
        inBand = false;
      }
    }
    const onset = r.values.onset_depth_km;
    const top = r.values.top_depth_km;
    const fAt = (d: number): number => {
      const i = prof.depth_km.findIndex((x) => x >= d - 1e-9);
      return i < 0 ? 0 : prof.f[i];
    };
    if (onset !== null && onset !== undefined) rows.ends.push({ scenario, colour, depth_km: onset, f: fAt(onset), which: 'deepest', fill: colour });
    if (top !== null && top !== undefined) rows.ends.push({ scenario, colour, depth_km: top, f: fAt(top), which: 'shallowest', fill: '#ffffff' });
  });
  for (let i = 0; i <= 120; i++) {
    const depth = (depthMaxKm * i) / 120;
    rows.solidus.push({ depth_km: depth, t_c: drySolidusC(pGpaFromDepthKm(depth, p.rho_s, p.g), p) });
  }
  const hi = Math.ceil((tMax + 40) / 100) * 100;
  for (const r of rows.slab) r.t_to = hi;
  return {
    labels, results, held, depthMaxKm, pressureMaxGpa,
    temperatureRangeC: [0, hi], heat: model.heat, tableFile: model.tableFile, notes, rows,
  };
}

/** Layout options. */
export interface FluxDiagramOptions {
  readonly title?: string;
  readonly subtitle?: string | readonly string[];
  /** width of the temperature panel, px (default 330) */
  readonly width?: number;
}

/** The default title: the inputs held constant across the scenarios. */
export function fluxDefaultTitle(data: FluxDiagramData): string {
  const words = labelsOfProcess(flux);
  const held = data.held.map((h) => words.fixedValue(h.name, h.value));
  return `${data.labels.length === 1 ? 'Wedge column' : 'Wedge columns'}${held.length > 0 ? ` at ${held.join(', ')}` : ''}`;
}

/** The Vega-Lite spec of the diagram. */
export function fluxDiagramSpec(data: FluxDiagramData, options: FluxDiagramOptions = {}): PlotSpec {
  const width = Math.round(options.width ?? 330);
  const height = Math.round(Math.min(470, Math.max(250, width * 1.2)));
  const depthScale = { domain: [0, data.depthMaxKm], reverse: true, nice: false, zero: false };
  const words = labelsOfProcess(flux);
  const depthTitle = words.axisTitle('depth_km');
  const y = (title: string | null, axis: Record<string, unknown> = {}) => ({ field: 'depth_km', type: 'quantitative' as const, scale: depthScale, title, axis: { grid: true, ...axis } });
  const colour = { field: 'colour', type: 'nominal' as const, scale: null };
  const tScale = { domain: [...data.temperatureRangeC], nice: false, zero: false };
  const tx = { field: 't_c', type: 'quantitative' as const, scale: tScale };
  const order = { field: 'depth_km', type: 'quantitative' as const };
  const line = (name: string, values: Row[], mark: Record<string, unknown>, detail = 'scenario') => ({
    name,
    data: { values },
    mark: { type: 'line' as const, clip: true, ...mark },
    encoding: { x: tx, y: y(depthTitle), order, color: colour, detail: { field: detail, type: 'nominal' as const } },
  });
  const temperaturePanel = {
    width,
    height,
    encoding: {
      x: { ...tx, title: words.axisTitle('t_c'), axis: { orient: 'top' as const, grid: true, tickCount: Math.max(3, Math.round(width / 70)) } },
      y: y(depthTitle),
    },
    layer: [
      {
        name: FLUX_MARKS.band,
        data: { values: data.rows.band },
        mark: { type: 'area' as const, orient: 'horizontal' as const, opacity: 0.22, clip: true },
        encoding: { y: y(depthTitle), x: { field: 't_lo', type: 'quantitative' as const, scale: tScale, stack: null }, x2: { field: 't_hi' }, color: colour, detail: { field: 'key', type: 'nominal' as const } },
      },
      {
        name: FLUX_MARKS.solidus,
        data: { values: data.rows.solidus },
        mark: { type: 'line' as const, color: REFERENCE, strokeWidth: 1.4, clip: true },
        encoding: { x: tx, y: y(depthTitle), order },
      },
      line(FLUX_MARKS.wetSolidus, data.rows.wet, { strokeWidth: 1.3, strokeDash: [5, 3] }),
      line(FLUX_MARKS.geotherm, data.rows.geotherm, { strokeWidth: 1.7 }),
      ...(data.rows.rock.length > 0 ? [line(FLUX_MARKS.rock, data.rows.rock, { strokeWidth: 3.2 }, 'key')] : []),
      {
        name: FLUX_MARKS.slab,
        data: { values: data.rows.slab },
        mark: { type: 'rule' as const, strokeDash: [1.5, 2.5], strokeWidth: 1.6 },
        encoding: { y: y(depthTitle), x: { field: 't_from', type: 'quantitative' as const, scale: tScale }, x2: { field: 't_to' }, color: colour },
      },
    ],
  };
  const fMax = Math.max(0.01, ...data.rows.melt.map((r) => r.f as number));
  const fDomainMax = meltFractionAxisMax(fMax);
  const meltWidth = Math.round(Math.max(70, width * 0.45));
  const fx = (title: string | null) => ({ field: 'f', type: 'quantitative' as const, title, scale: { domain: [0, fDomainMax], nice: false } });
  const meltPanel = {
    width: meltWidth,
    height,
    layer: [
      {
        name: FLUX_MARKS.meltFill,
        data: { values: data.rows.melt },
        mark: { type: 'area' as const, orient: 'horizontal' as const, opacity: 0.16, clip: true },
        encoding: { y: y(null, { labels: false, ticks: false }), x: { ...fx(words.axisTitle('f')), stack: null }, color: colour, detail: { field: 'scenario', type: 'nominal' as const } },
      },
      {
        name: FLUX_MARKS.melt,
        data: { values: data.rows.melt },
        mark: { type: 'line' as const, clip: true, strokeWidth: 2 },
        encoding: {
          x: { ...fx(words.axisTitle('f')), axis: { orient: 'top' as const, grid: true, tickCount: Math.max(2, Math.round(meltWidth / 45)), labelOverlap: 'greedy' as const, labelFlush: true } },
          y: y(null, { labels: false, ticks: false }),
          order,
          color: colour,
          detail: { field: 'scenario', type: 'nominal' as const },
        },
      },
      {
        name: FLUX_MARKS.ends,
        data: { values: data.rows.ends },
        mark: { type: 'point' as const, shape: 'circle', size: 44, filled: true, strokeWidth: 1.6, opacity: 1, clip: true },
        encoding: { x: fx(null), y: y(null), stroke: colour, fill: { field: 'fill', type: 'nominal' as const, scale: null } },
      },
    ],
  };
  const pressureAxis = pressureAxisPanel(y, words.axisTitle('p_gpa'), data.pressureMaxGpa, data.depthMaxKm, height);

  const keyWidth = width + meltWidth + 60;
  const threshold = (r: ProcessResult): string => {
    const t = r.values.water_threshold_ppm;
    if (t === null || t === undefined) return 'no water content melts it';
    return t === 0 ? 'reaches the dry solidus: melts even dry' : `melts from ${words.valueWithUnit('water_ppm', t)} water`;
  };
  const scenarioEntries: KeyEntry[] = data.labels.map((label, k) => ({
    tag: String(k + 1),
    swatch: { kind: 'line', colour: CATEGORICAL[k], width: 3 },
    label: `${label} (${data.results[k].status === 'ok' ? `melt column ${words.valueWithUnit('melt_column_km', data.results[k].values.melt_column_km ?? 0)}` : data.results[k].status.replace('_', ' ')}; ${threshold(data.results[k])})`,
  }));
  const markEntries: KeyEntry[] = [
    { swatch: { kind: 'line', colour: REFERENCE, width: 1.4 }, label: 'dry solidus' },
    { swatch: { kind: 'line', colour: MUTED, width: 1.7 }, label: 'geotherm' },
    { swatch: { kind: 'line', colour: MUTED, dash: [5, 3], width: 1.3 }, label: 'wet solidus at the scenario\'s water' },
    { swatch: { kind: 'bar', colour: '#c9ced4' }, label: 'melting: geotherm above the wet solidus' },
    ...(data.rows.rock.length > 0 ? [{ swatch: { kind: 'line', colour: MUTED, width: 3.2 }, label: 'rock temperature while melting (latent heat taken from the rock)' } as KeyEntry] : []),
    { swatch: { kind: 'line', colour: MUTED, dash: [1.5, 2.5], width: 1.6 }, label: 'slab top: the bottom of the column' },
    { swatch: { kind: 'point', colour: MUTED, filled: true }, label: 'deepest melting' },
    { swatch: { kind: 'point', colour: MUTED, filled: false }, label: 'shallowest melting' },
  ];
  const key = keyPanel([{ title: data.labels.length === 1 ? 'Scenario' : 'Scenarios', entries: scenarioEntries }, { entries: markEntries }], keyWidth);
  const defaultSubtitle = [
    `flux melting, heat ${data.heat}, geotherm ${data.tableFile === null ? 'plate + adiabat' : `from ${data.tableFile}`}; Katz et al. (2003) melting`,
    ...data.notes.slice(0, 3),
  ];
  const subtitle = options.subtitle === undefined ? defaultSubtitle : typeof options.subtitle === 'string' ? [options.subtitle] : [...options.subtitle];
  const spec = {
    $schema: 'https://vega.github.io/schema/vega-lite/v6.json',
    title: wrappedTitle(options.title ?? fluxDefaultTitle(data), subtitle, keyWidth),
    vconcat: [{ hconcat: [temperaturePanel, { hconcat: [meltPanel, pressureAxis], spacing: 0 }], spacing: 12 }, key.spec],
    spacing: 16,
    resolve: { scale: { y: 'independent' as const, x: 'independent' as const } },
  };
  return spec as unknown as PlotSpec;
}

/** The layout for renderFigure (main panel: the temperature panel). */
export function fluxDiagramLayout(data: FluxDiagramData, options: FluxDiagramOptions = {}): FigureLayout {
  return { build: (w) => fluxDiagramSpec(data, { ...options, width: w }), natural: options.width ?? 330, min: 110 };
}

/** The diagram hook of the process `flux` (ProcessDefinition.diagram). */
export const fluxDiagram: ProcessDiagram<FluxRuntimeModel> = {
  representativeOutput: 'melt_column_km',
  figure(items, model, options) {
    const data = fluxDiagramData(items, model);
    return { layout: fluxDiagramLayout(data, options), notes: data.notes };
  },
};
