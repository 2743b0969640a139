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
import { fieldInfo, formatNumber, inputValueLabel } from './labels.js';

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
}

/** A point of a reference curve (solidus or liquidus). */
export interface CurvePoint {
  readonly curve: string;
  readonly depth_km: number;
  readonly t_c: number;
}

/** A point of a scenario's melt fraction profile. */
export interface MeltPoint {
  readonly scenario: string;
  readonly depth_km: number;
  readonly f: number;
}

/** A horizontal band of one scenario: its lid or its melting interval. */
export interface DepthBand {
  readonly kind: 'lid' | 'melting';
  readonly scenario: string;
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
   * temperature range shown, degC: the paths and the solidus curves with a margin. The liquidus and
   * a conductive lid's cold top may leave the frame (they are clipped).
   */
  readonly temperatureRangeC: readonly [number, number];
  /** pressure at depthMaxKm, GPa */
  readonly pressureMaxGpa: number;
  readonly adiabat: readonly PathPoint[];
  readonly melting: readonly PathPoint[];
  readonly conductive: readonly PathPoint[];
  /** onset of melting of each scenario that melts */
  readonly onsets: readonly PathPoint[];
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
  return `wet solidus, ${formatNumber(waterPpm)} ${fieldInfo('water_ppm').unit}`;
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

/** Rounded range (degC) covering the scenario paths and the solidus curves (not the liquidus). */
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
  return [Math.floor((lo - 30) / 100) * 100, Math.ceil((hi + 30) / 100) * 100];
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

  const curves: CurvePoint[] = [];
  const curveNames: string[] = [DRY_SOLIDUS];
  for (const z of depths) curves.push({ curve: DRY_SOLIDUS, depth_km: z, t_c: drySolidusC(pAt(z), p) });
  const waters = [...new Set(items.map((i) => i.scenario.water_ppm).filter((w) => w > 0))].sort((a, b) => a - b);
  for (const w of waters) {
    const name = wetSolidusName(w);
    curveNames.push(name);
    for (const z of depths) curves.push({ curve: name, depth_km: z, t_c: wetSolidusC(pAt(z), wtPctFromPpm(w), p) });
  }
  curveNames.push(LHERZ_LIQUIDUS);
  for (const z of depths) curves.push({ curve: LHERZ_LIQUIDUS, depth_km: z, t_c: lherzLiquidusC(pAt(z), p) });

  const adiabat: PathPoint[] = [];
  const melting: PathPoint[] = [];
  const conductive: PathPoint[] = [];
  const onsets: PathPoint[] = [];
  const meltFraction: MeltPoint[] = [];
  const bands: DepthBand[] = [];
  const notes: string[] = [];
  const summaries: DiagramScenarioSummary[] = [];

  items.forEach((it, k) => {
    const s = it.scenario;
    const label = labels[k];
    const r = results[k];
    const thermal = resolveThermalModel(s, model);
    summaries.push({ label, scenario: s, thermal, result: r });
    if (s.lid_km > 0) bands.push({ kind: 'lid', scenario: label, top_km: 0, bottom_km: Math.min(s.lid_km, depthMaxKm) });
    if (r.status === 'failed' || r.status === 'onset_beyond_range') notes.push(`${label}: ${r.status}${r.reason === null ? '' : ` (${r.reason})`}`);

    // solid adiabat: from the bottom of the diagram up to the onset (isentropic), or up to the lid
    // base as a reference for a conductive column and for a column that does not melt
    const prof = r.profile;
    const adiabatTopKm = thermal === 'isentropic' && prof !== undefined && prof.depth_km.length > 0 ? prof.depth_km[0] : Math.min(s.lid_km, depthMaxKm);
    for (const z of linspace(depthMaxKm, adiabatTopKm, ADIABAT_POINTS)) adiabat.push({ scenario: label, depth_km: z, t_c: adiabatTempC(s.tp_c, pAt(z), p) });

    if (thermal === 'conductive') {
      const out = conductiveProfile(s, model);
      if (out.kind === 'solved') {
        const st = out.state;
        if (st.lidM > 0) {
          for (const z of linspace(0, st.lidM / 1000, 11)) {
            conductive.push({ scenario: label, depth_km: z, t_c: p.T_surface + ((st.tC[0] - p.T_surface) * z) / (st.lidM / 1000) });
          }
        }
        for (let i = 0; i < st.zM.length; i++) {
          const z = st.zM[i] / 1000;
          conductive.push({ scenario: label, depth_km: z, t_c: st.tC[i] });
          if (z > depthMaxKm) break;
        }
      }
    }

    if (prof !== undefined && prof.depth_km.length > 0) {
      // a conductive melting path ends where the melt fraction stops increasing: above it the
      // extracted melt fraction stays constant while the rock cools towards the lid, which the
      // conductive profile shows (an isentropic path is drawn whole, to the lid base)
      const stop = thermal === 'conductive' ? meltStopIndex(prof.f) : prof.f.length - 1;
      for (let i = 0; i < prof.depth_km.length; i++) {
        if (i <= stop) melting.push({ scenario: label, depth_km: prof.depth_km[i], t_c: prof.t_c[i] });
        meltFraction.push({ scenario: label, depth_km: prof.depth_km[i], f: prof.f[i] });
      }
      onsets.push({ scenario: label, depth_km: prof.depth_km[0], t_c: prof.t_c[0] });
      bands.push({ kind: 'melting', scenario: label, top_km: prof.depth_km[stop], bottom_km: prof.depth_km[0] });
    }
  });

  return {
    scenarios: summaries,
    depthMaxKm,
    temperatureRangeC: temperatureRange(curves, [...adiabat, ...melting]),
    pressureMaxGpa: pAt(depthMaxKm),
    adiabat,
    melting,
    conductive,
    onsets,
    curves,
    curveNames,
    meltFraction,
    bands,
    notes,
  };
}
