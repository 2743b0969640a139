/**
 * The numbers behind a column diagram: for each scenario the temperature path (solid adiabat below
 * the onset, the melting path, the conductive profile where the column is conductive) and the melt
 * fraction along the column, plus the reference curves (dry and wet solidus, lherzolite liquidus)
 * and the bands (lid, melting interval). Every number comes from src/physics; nothing is
 * re-derived here: the adiabat below the onset is adiabatTempC, the curves are the melting
 * functions, the path is meltColumn's profile, the conductive profile is conductiveProfile.
 */
import { adiabatTempC } from '../physics/adiabat.js';
import { meltColumn, resolveThermalModel } from '../physics/column.js';
import { conductiveProfile } from '../physics/conductive-column.js';
import { INPUT_NAMES, type InputName } from '../physics/fields.js';
import { drySolidusC, lherzLiquidusC, wetSolidusC } from '../physics/melting.js';
import { MODEL_MAX_P_GPA, type ColumnResult, type ModelOptions, type Scenario, type ThermalModel } from '../physics/types.js';
import { depthKmFromPGpa, pGpaFromDepthKm, wtPctFromPpm } from '../physics/units.js';
import { formatNumber, inputValueLabel, UNIT_SPACE, unitOf } from './labels.js';

/** One scenario to draw, with an optional legend label (default: the inputs that differ between scenarios). */
export interface DiagramScenario {
  readonly scenario: Scenario;
  readonly label?: string;
}

/** A point of a scenario's temperature path. */
export interface PathPoint {
  readonly scenario: string;
  readonly depth_km: number;
  readonly t_c: number;
  /** melt fraction at the point (melting path only) */
  readonly f?: number;
}

/** A point of a reference curve (solidus or liquidus). */
export interface CurvePoint {
  readonly curve: string;
  /** piece of the curve inside the frame (a curve leaving and re-entering the frame has several) */
  readonly part: number;
  readonly depth_km: number;
  readonly t_c: number;
}

/** A point of a scenario's melt fraction profile. */
export interface MeltPoint {
  readonly scenario: string;
  readonly depth_km: number;
  readonly f: number;
}

/** A depth interval of one scenario: its lid or its melting interval. */
export interface DepthBand {
  readonly kind: 'lid' | 'melting';
  readonly scenario: string;
  /** position of the scenario in the diagram, 1-based (its lane and key number) */
  readonly lane: number;
  readonly top_km: number;
  readonly bottom_km: number;
}

/** What was drawn for one scenario. */
export interface DiagramScenarioSummary {
  readonly label: string;
  readonly scenario: Scenario;
  readonly thermal: ThermalModel;
  readonly result: ColumnResult;
}

/** Everything a column diagram shows. Depths in km (positive down), temperatures in degC. */
export interface ColumnDiagramData {
  readonly scenarios: readonly DiagramScenarioSummary[];
  /** deepest depth shown, km */
  readonly depthMaxKm: number;
  /**
   * temperature range shown, degC: every scenario's path (conductive profiles from the surface
   * temperature down) and the solidus curves, with a margin. Reference curves are cut where they
   * leave this range; scenario paths never do.
   */
  readonly temperatureRangeC: readonly [number, number];
  /** pressure at depthMaxKm, GPa */
  readonly pressureMaxGpa: number;
  readonly adiabat: readonly PathPoint[];
  readonly melting: readonly PathPoint[];
  readonly conductive: readonly PathPoint[];
  /** onset of melting of each scenario that melts */
  readonly onsets: readonly PathPoint[];
  /** where the melt fraction stops increasing (top of the melting path) of each scenario that melts */
  readonly stops: readonly PathPoint[];
  /** the inputs shared by every scenario (for titles), in input order */
  readonly held: readonly { readonly name: InputName; readonly value: number }[];
  /** water contents (ppm) of the wet solidus curves drawn */
  readonly wetWaters: readonly number[];
  readonly curves: readonly CurvePoint[];
  /** reference curve names in drawing order */
  readonly curveNames: readonly string[];
  readonly meltFraction: readonly MeltPoint[];
  readonly bands: readonly DepthBand[];
  /** what could not be drawn (failed columns, onset beyond the model range) */
  readonly notes: readonly string[];
}

/** Points per reference curve and per adiabat segment. */
const CURVE_POINTS = 81;
const ADIABAT_POINTS = 41;

/** Names of the reference curves (the trade's terms). */
export const DRY_SOLIDUS = 'dry solidus';
export const LHERZ_LIQUIDUS = 'lherzolite liquidus';

/** Name of the wet solidus of a source water content, with the unit from the registry. */
export function wetSolidusName(waterPpm: number): string {
  return `wet solidus, ${formatNumber(waterPpm)}${UNIT_SPACE}${unitOf('water_ppm')}`;
}

/** Inputs with the same value in every scenario (NaN upwelling counts as held only if all are given). */
export function heldInputs(scenarios: readonly Scenario[]): { name: InputName; value: number }[] {
  if (scenarios.length === 0) return [];
  return INPUT_NAMES.filter((n) => Number.isFinite(scenarios[0][n]) && scenarios.every((s) => s[n] === scenarios[0][n])).map((n) => ({ name: n, value: scenarios[0][n] }));
}

/** Legend labels: the inputs that differ between scenarios (all of them for a single scenario). */
export function scenarioLabels(scenarios: readonly Scenario[]): string[] {
  const differs = (name: InputName): boolean => new Set(scenarios.map((s) => String(s[name]))).size > 1;
  let shown = INPUT_NAMES.filter(differs);
  if (shown.length === 0) shown = INPUT_NAMES.filter((n) => n !== 'upwelling_mm_yr' || Number.isFinite(scenarios[0]?.upwelling_mm_yr));
  return scenarios.map((s) =>
    shown.filter((n) => Number.isFinite(s[n])).map((n) => inputValueLabel(n, s[n])).join(', '),
  );
}

function uniqueLabels(labels: readonly string[]): string[] {
  const seen = new Map<string, number>();
  return labels.map((l) => {
    const k = (seen.get(l) ?? 0) + 1;
    seen.set(l, k);
    return k === 1 ? l : `${l} (${k})`;
  });
}

/** Depth (km) shown by the diagram: below every onset and lid with room to spare, within the model range. */
function depthRangeKm(results: readonly ColumnResult[], scenarios: readonly Scenario[], maxKm: number): number {
  let deepest = 60;
  for (const r of results) {
    if (r.onset_depth_km !== null) deepest = Math.max(deepest, r.onset_depth_km);
    if (r.status === 'onset_beyond_range') deepest = maxKm;
  }
  for (const s of scenarios) deepest = Math.max(deepest, s.lid_km);
  return Math.min(maxKm, Math.ceil((deepest * 1.15 + 15) / 20) * 20);
}

/**
 * Rounded range (degC) covering every scenario path and the solidus curves (not the liquidus);
 * a range reaching within 150 degC of 0 starts at 0 (a conductive profile starts at the surface).
 */
function temperatureRange(curves: readonly CurvePoint[], paths: readonly PathPoint[]): [number, number] {
  let lo = Infinity;
  let hi = -Infinity;
  for (const c of curves) if (c.curve !== LHERZ_LIQUIDUS) lo = Math.min(lo, c.t_c);
  for (const q of paths) {
    lo = Math.min(lo, q.t_c);
    hi = Math.max(hi, q.t_c);
  }
  const deepestSolidus = curves.filter((c) => c.curve === DRY_SOLIDUS).reduce((m, c) => Math.max(m, c.t_c), -Infinity);
  hi = Math.max(hi, Math.min(deepestSolidus, hi + 150));
  const low = lo >= 0 && lo < 150 ? 0 : Math.floor((lo - 30) / 100) * 100;
  return [low, Math.ceil((hi + 30) / 100) * 100];
}

/**
 * The pieces of a curve inside [tLo, tHi] x [0, zMax] (depth-ordered points), each cut exactly at
 * the frame's edge by linear interpolation, so that nothing drawn leaves the frame.
 */
export function clipCurve(points: readonly { depth_km: number; t_c: number }[], tLo: number, tHi: number, zMax: number): { depth_km: number; t_c: number }[][] {
  const inside = (q: { depth_km: number; t_c: number }): boolean => q.t_c >= tLo && q.t_c <= tHi && q.depth_km >= 0 && q.depth_km <= zMax;
  const edge = (a: { depth_km: number; t_c: number }, b: { depth_km: number; t_c: number }): { depth_km: number; t_c: number } => {
    // largest s in [0, 1] with a + s (b - a) inside, a inside
    let s = 1;
    const cut = (va: number, vb: number, limit: number): void => {
      if (vb === va) return;
      const t = (limit - va) / (vb - va);
      if (t >= 0 && t < s) s = t;
    };
    if (b.t_c > tHi) cut(a.t_c, b.t_c, tHi);
    if (b.t_c < tLo) cut(a.t_c, b.t_c, tLo);
    if (b.depth_km > zMax) cut(a.depth_km, b.depth_km, zMax);
    if (b.depth_km < 0) cut(a.depth_km, b.depth_km, 0);
    return { depth_km: a.depth_km + s * (b.depth_km - a.depth_km), t_c: a.t_c + s * (b.t_c - a.t_c) };
  };
  const parts: { depth_km: number; t_c: number }[][] = [];
  let cur: { depth_km: number; t_c: number }[] = [];
  for (let i = 0; i < points.length; i++) {
    const q = points[i];
    const prev = i > 0 ? points[i - 1] : null;
    if (inside(q)) {
      if (cur.length === 0 && prev !== null) cur.push(edge(q, prev));
      cur.push(q);
    } else if (cur.length > 0 && prev !== null) {
      cur.push(edge(prev, q));
      parts.push(cur);
      cur = [];
    }
  }
  if (cur.length > 0) parts.push(cur);
  return parts.filter((p) => p.length > 1);
}

/** Index (onset = 0) where the melt fraction first reaches its largest value along the path. */
export function meltStopIndex(f: ArrayLike<number>): number {
  let max = 0;
  for (let i = 0; i < f.length; i++) if (f[i] > max) max = f[i];
  const tol = 1e-9 * Math.max(1, max);
  for (let i = 0; i < f.length; i++) if (f[i] >= max - tol) return i;
  return f.length - 1;
}

function linspace(a: number, b: number, n: number): number[] {
  return Array.from({ length: n }, (_, i) => a + ((b - a) * i) / (n - 1));
}

/**
 * Compute every column and the curves of a column diagram.
 *
 * @param items scenarios (tp_c degC, water_ppm ppm, lid_km km, upwelling_mm_yr mm/yr or NaN), with
 *   optional labels
 * @param model thermal model, water mode and parameters; the profile is always requested
 */
export function columnDiagramData(items: readonly DiagramScenario[], model: ModelOptions): ColumnDiagramData {
  const p = model.params;
  const withProfile: ModelOptions = { ...model, withProfile: true };
  const auto = scenarioLabels(items.map((i) => i.scenario));
  const labels = uniqueLabels(items.map((it, k) => it.label ?? auto[k]));
  const results = items.map((it) => meltColumn(it.scenario, withProfile));
  const maxKm = depthKmFromPGpa(MODEL_MAX_P_GPA, p.rho_s, p.g);
  const depthMaxKm = depthRangeKm(results, items.map((i) => i.scenario), maxKm);
  const depths = linspace(0, depthMaxKm, CURVE_POINTS);
  const pAt = (z: number): number => pGpaFromDepthKm(z, p.rho_s, p.g);

  const rawCurves: { name: string; points: { depth_km: number; t_c: number }[] }[] = [];
  rawCurves.push({ name: DRY_SOLIDUS, points: depths.map((z) => ({ depth_km: z, t_c: drySolidusC(pAt(z), p) })) });
  const waters = [...new Set(items.map((i) => i.scenario.water_ppm).filter((w) => w > 0))].sort((a, b) => a - b);
  for (const w of waters) rawCurves.push({ name: wetSolidusName(w), points: depths.map((z) => ({ depth_km: z, t_c: wetSolidusC(pAt(z), wtPctFromPpm(w), p) })) });
  rawCurves.push({ name: LHERZ_LIQUIDUS, points: depths.map((z) => ({ depth_km: z, t_c: lherzLiquidusC(pAt(z), p) })) });

  const adiabat: PathPoint[] = [];
  const melting: PathPoint[] = [];
  const conductive: PathPoint[] = [];
  const onsets: PathPoint[] = [];
  const stops: PathPoint[] = [];
  const meltFraction: MeltPoint[] = [];
  const bands: DepthBand[] = [];
  const notes: string[] = [];
  const summaries: DiagramScenarioSummary[] = [];

  items.forEach((it, k) => {
    const s = it.scenario;
    const label = labels[k];
    const lane = k + 1;
    const r = results[k];
    const thermal = resolveThermalModel(s, model);
    summaries.push({ label, scenario: s, thermal, result: r });
    if (s.lid_km > 0) bands.push({ kind: 'lid', scenario: label, lane, top_km: 0, bottom_km: Math.min(s.lid_km, depthMaxKm) });
    if (r.status === 'failed' || r.status === 'onset_beyond_range') notes.push(`${label}: ${r.status}${r.reason === null ? '' : ` (${r.reason})`}`);

    // solid adiabat: from the bottom of the diagram up to the onset (isentropic), or up to the lid
    // base as a reference for a conductive column and for a column that does not melt
    const prof = r.profile;
    const adiabatTopKm = thermal === 'isentropic' && prof !== undefined && prof.depth_km.length > 0 ? prof.depth_km[0] : Math.min(s.lid_km, depthMaxKm);
    for (const z of linspace(depthMaxKm, adiabatTopKm, ADIABAT_POINTS)) adiabat.push({ scenario: label, depth_km: z, t_c: adiabatTempC(s.tp_c, pAt(z), p) });

    if (thermal === 'conductive') {
      const out = conductiveProfile(s, model);
      if (out.kind === 'solved') {
        // the whole profile: linear through the lid from the surface temperature, then the solved
        // nodes, cut at the bottom of the diagram
        const st = out.state;
        const pts: { depth_km: number; t_c: number }[] = [];
        if (st.lidM > 0) for (const z of linspace(0, st.lidM / 1000, 11)) pts.push({ depth_km: z, t_c: p.T_surface + ((st.tC[0] - p.T_surface) * z) / (st.lidM / 1000) });
        for (let i = 0; i < st.zM.length; i++) if (pts.length === 0 || st.zM[i] / 1000 > pts[pts.length - 1].depth_km) pts.push({ depth_km: st.zM[i] / 1000, t_c: st.tC[i] });
        for (const part of clipCurve(pts, -Infinity, Infinity, depthMaxKm)) for (const q of part) conductive.push({ scenario: label, ...q });
      }
    }

    if (prof !== undefined && prof.depth_km.length > 0) {
      // a conductive melting path ends where the melt fraction stops increasing: above it the
      // extracted melt fraction stays constant while the rock cools towards the lid, which the
      // conductive profile shows (an isentropic path is drawn whole, to the lid base)
      const stop = thermal === 'conductive' ? meltStopIndex(prof.f) : prof.f.length - 1;
      for (let i = 0; i < prof.depth_km.length; i++) {
        if (i <= stop) melting.push({ scenario: label, depth_km: prof.depth_km[i], t_c: prof.t_c[i], f: prof.f[i] });
        meltFraction.push({ scenario: label, depth_km: prof.depth_km[i], f: prof.f[i] });
      }
      onsets.push({ scenario: label, depth_km: prof.depth_km[0], t_c: prof.t_c[0] });
      stops.push({ scenario: label, depth_km: prof.depth_km[stop], t_c: prof.t_c[stop] });
      bands.push({ kind: 'melting', scenario: label, lane, top_km: prof.depth_km[stop], bottom_km: prof.depth_km[0] });
    }
  });

  const temperatureRangeC = temperatureRange(rawCurves.flatMap((c) => c.points.map((q) => ({ curve: c.name, part: 0, ...q }))), [...adiabat, ...melting, ...conductive]);
  const curves: CurvePoint[] = [];
  for (const c of rawCurves) {
    clipCurve(c.points, temperatureRangeC[0], temperatureRangeC[1], depthMaxKm).forEach((part, k) => {
      for (const q of part) curves.push({ curve: c.name, part: k, ...q });
    });
  }
  return {
    scenarios: summaries,
    depthMaxKm,
    temperatureRangeC,
    pressureMaxGpa: pAt(depthMaxKm),
    adiabat,
    melting,
    conductive,
    onsets,
    stops,
    held: heldInputs(items.map((i) => i.scenario)),
    wetWaters: waters,
    curves,
    curveNames: rawCurves.map((c) => c.name),
    meltFraction,
    bands,
    notes,
  };
}
