/**
 * The process `flux`: melting of a vertical column through the mantle wedge above a subducting
 * slab, at a prescribed geotherm, by the water the wedge holds (project physics reference, "Flux
 * melting of a wedge column at a prescribed geotherm"; src/physics/flux-column.ts).
 */
import { fluxColumn, type FluxColumnResult } from '../physics/flux-column.js';
import { geothermTableFromDepths, lidAdiabatGeotherm, tableGeotherm, type GeothermTable } from '../physics/flux-geotherm.js';
import type { FluxHeat } from '../physics/flux-point.js';
import type { FieldInfo } from '../physics/fields.js';
import { resolveParams, type MeltParams } from '../physics/params.js';
import { INPUT_RANGES } from '../physics/ranges.js';
import type { ModelSpec } from '../spec/types.js';
import { FLUX_MODEL_KEYS, normalizeFluxModel, validateFluxModel, type FluxModelSpec } from './flux-model.js';
import type { InputDef, ProcessDefinition, ProcessResult, ResultDef } from './types.js';

/** Runtime model of a flux column (built once per thread). */
export interface FluxRuntimeModel {
  readonly heat: FluxHeat;
  readonly params: MeltParams;
  /** the geotherm table on pressure, or null for the lid-adiabat geotherm */
  readonly table: GeothermTable | null;
  readonly tableFile: string | null;
  readonly withProfile: boolean;
}

/** A required input on the scenario range shared with decompression (INPUT_RANGES), no default. */
function sharedRangeInput(name: 'tp_c' | 'water_ppm' | 'lid_km', unit: string, displayUnit: string, label: string, description: string, cliFlag: string): InputDef {
  const { min, max } = INPUT_RANGES[name];
  return Object.freeze({ name, unit, kind: 'float64', nullable: false, label, displayUnit, description, cliFlag, min, max, minExclusive: false, default: null });
}

const TP = sharedRangeInput('tp_c', 'degC', '°C', 'wedge potential temperature', 'potential temperature of the wedge core (its solid adiabat below the plate)', 'tp');
const WATER = sharedRangeInput('water_ppm', 'ppm', 'ppm', 'wedge water', 'bulk water of the wedge (ug/g)', 'water');
const LID = sharedRangeInput('lid_km', 'km', 'km', 'plate thickness', 'thickness of the overriding plate (conductive, linear temperature)', 'lid');
const SLAB: InputDef = Object.freeze({
  name: 'slab_depth_km', unit: 'km', kind: 'float64', nullable: false, label: 'slab depth', displayUnit: 'km',
  description: 'depth of the slab top under the column: the bottom of the column',
  cliFlag: 'slab-depth', min: 20, max: 300, minExclusive: false, default: 100,
});

/** Inputs with the lid-adiabat geotherm, and with a geotherm table (which sets the temperatures). */
export const FLUX_INPUTS: readonly InputDef[] = Object.freeze([TP, WATER, LID, SLAB]);
export const FLUX_TABLE_INPUTS: readonly InputDef[] = Object.freeze([WATER, SLAB]);

const result = (name: string, unit: string, label: string, displayUnit: string, description: string): ResultDef =>
  Object.freeze({ name, unit, kind: 'float64', nullable: true, label, displayUnit, description });

/** The result fields in table order. */
export const FLUX_RESULTS: readonly ResultDef[] = Object.freeze([
  result('onset_p_gpa', 'GPa', 'onset pressure', 'GPa', 'pressure of the deepest melting (the slab top when the column melts down to it)'),
  result('onset_depth_km', 'km', 'onset depth', 'km', 'depth of the deepest melting, z = P / (rho_s g)'),
  result('top_p_gpa', 'GPa', 'pressure at the top of melting', 'GPa', 'pressure of the shallowest melting'),
  result('top_depth_km', 'km', 'depth at the top of melting', 'km', 'depth of the shallowest melting'),
  result('f_max', 'fraction', 'largest melt fraction', '', 'largest melt fraction in the column (mass fraction, 0-1; 0 for no_melt)'),
  result('f_mean', 'fraction', 'mean melt fraction', '', 'mean melt fraction between the deepest and shallowest melting, integral F dz / (z_onset - z_top)'),
  result('melt_column_km', 'km', 'melt column', 'km', 'integral F dz over the column: the melt thickness if all its melt were extracted (0 for no_melt)'),
  result('h2o_melt_wt_pct', 'wt%', 'water in the pooled melt', 'wt%', 'water in the pooled melt, integral F X_melt dz / integral F dz'),
  result('water_threshold_ppm', 'ppm', 'water threshold', 'ppm', 'least bulk water for which the column melts anywhere above the slab (0 where the geotherm reaches the dry solidus; null where no water content melts it)'),
]);

const profileField = (name: string, unit: string, label: string, displayUnit: string, description: string): FieldInfo =>
  Object.freeze({ name, unit, kind: 'float64', nullable: false, label, displayUnit, description });

/** Profile arrays along the whole column (surface to slab). */
export const FLUX_PROFILE_FIELDS: readonly FieldInfo[] = Object.freeze([
  profileField('p_gpa', 'GPa', 'pressure', 'GPa', 'pressure'),
  profileField('depth_km', 'km', 'depth', 'km', 'depth, z = P / (rho_s g)'),
  profileField('t_geo_c', 'degC', 'geotherm', '°C', 'temperature of the prescribed geotherm'),
  profileField('t_c', 'degC', 'temperature', '°C', 'temperature of the rock (the geotherm for heat fixed; lower where melting took latent heat for heat balanced)'),
  profileField('f', 'fraction', 'melt fraction', '', 'melt fraction (mass fraction, 0-1)'),
  profileField('h2o_melt_wt_pct', 'wt%', 'water in the melt', 'wt%', 'water in the melt (NaN where there is no melt)'),
  profileField('t_dry_solidus_c', 'degC', 'dry solidus', '°C', 'anhydrous solidus'),
  profileField('t_wet_solidus_c', 'degC', 'wet solidus', '°C', 'solidus of the wedge with its bulk water (first melt, X_melt = min(X_b / D, X_sat))'),
]);

function toResult(r: FluxColumnResult): ProcessResult {
  const values: Record<string, number | null> = {};
  for (const f of FLUX_RESULTS) values[f.name] = r[f.name as keyof FluxColumnResult] as number | null;
  const profile = r.profile as unknown as Readonly<Record<string, Float64Array>> | undefined;
  return profile === undefined ? { status: r.status, reason: r.reason, values } : { status: r.status, reason: r.reason, values, profile };
}

function failed(reason: string): ProcessResult {
  return { status: 'failed', reason, values: Object.fromEntries(FLUX_RESULTS.map((f) => [f.name, null])) };
}

/** One flux column (pure; never throws). */
export function computeFlux(inputs: Readonly<Record<string, number>>, model: FluxRuntimeModel): ProcessResult {
  try {
    const p = model.params;
    const geo = model.table === null ? lidAdiabatGeotherm(inputs.tp_c, inputs.lid_km, inputs.slab_depth_km, p) : tableGeotherm(model.table, inputs.slab_depth_km, p);
    if (typeof geo === 'string') return failed(geo);
    return toResult(fluxColumn(geo, inputs.water_ppm, { heat: model.heat, params: p, withProfile: model.withProfile }));
  } catch (err) {
    return failed(`flux column: ${err instanceof Error ? err.message : String(err)}`);
  }
}

/** The process `flux`. */
export const flux: ProcessDefinition<FluxRuntimeModel> = {
  name: 'flux',
  title: 'flux melting of a wedge column',
  description:
    'melting of a vertical column through the mantle wedge above a slab at a prescribed geotherm (plate + adiabat, or a table), by the bulk water of the wedge',
  inputsFor: (m) => ((m as Partial<FluxModelSpec>).geotherm ?? 'lid-adiabat') === 'lid-adiabat' ? FLUX_INPUTS : FLUX_TABLE_INPUTS,
  results: FLUX_RESULTS,
  statuses: ['ok', 'no_melt', 'onset_beyond_range', 'failed'],
  model: {
    keys: FLUX_MODEL_KEYS,
    defaults: Object.freeze({ geotherm: 'lid-adiabat', heat: 'balanced', params: {} }),
    validate: (raw, problems, context) => validateFluxModel(raw, problems, context),
    normalize: (m: ModelSpec) => normalizeFluxModel(m as FluxModelSpec),
    summary(m) {
      const model = m as FluxModelSpec;
      const g = model.geotherm;
      return `geotherm ${g === 'lid-adiabat' ? g : `table ${g.file} (sha256 ${g.sha256.slice(0, 12)}, ${g.at.length} rows)`}, heat ${model.heat}`;
    },
    cliFlags: [
      { flag: 'heat', key: 'heat', placeholder: 'mode', kind: 'text', description: 'heat of melting: balanced (entropy conserved at each depth, default) or fixed (T stays on the geotherm) [process flux]' },
      { flag: 'geotherm', key: 'geotherm', placeholder: 'file.csv', kind: 'file', description: 'geotherm table (columns depth_km or p_gpa, and t_c) instead of plate + adiabat; then --tp and --lid are not inputs [process flux]' },
    ],
    inputCases: [{ when: { required: ['geotherm'], properties: { geotherm: { type: 'object' } } }, model: { geotherm: { file: 'wedge.csv' }, heat: 'balanced', params: {} } }],
    inputsNote: (m) => ((m as Partial<FluxModelSpec>).geotherm ?? 'lid-adiabat') === 'lid-adiabat' ? null : 'the geotherm table gives the temperatures, so tp_c and lid_km are not inputs',
  },
  resolveModel(m, options) {
    const model = m as FluxModelSpec;
    const params = resolveParams(model.params);
    const g = model.geotherm;
    let table: GeothermTable | null = null;
    if (g !== 'lid-adiabat') {
      table = g.axis === 'depth_km' ? geothermTableFromDepths(g.at, g.t_c, params) : { pGpa: Float64Array.from(g.at), tC: Float64Array.from(g.t_c) };
    }
    return { heat: model.heat, params, table, tableFile: g === 'lid-adiabat' ? null : g.file, withProfile: options.withProfile };
  },
  compute: computeFlux,
  describeColumn(inputs, model) {
    const given = (model.table === null ? FLUX_INPUTS : FLUX_TABLE_INPUTS).map((i) => `${i.name} ${inputs[i.name]} ${i.unit}`).join(', ');
    return `model: flux melting, geotherm ${model.tableFile === null ? 'lid-adiabat (plate + adiabat)' : `table ${model.tableFile}`}, heat ${model.heat}; ${given}`;
  },
  profile: FLUX_PROFILE_FIELDS,
  diagram: async () => (await import('../report/flux-diagram.js')).fluxDiagram,
};
