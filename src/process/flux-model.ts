/**
 * The `model` section of a flux sweep: `geotherm` (lid-adiabat, or a table file), `heat`
 * (balanced or fixed) and `params` (overrides of the published parameters, as for decompression).
 * Normalized form: { process: 'flux', geotherm, heat, params }, the table embedded with its
 * SHA-256 (src/process/flux-geotherm-file.ts).
 */
import { FLUX_HEAT_MODES, type FluxHeat } from '../physics/flux-point.js';
import { PARAM_NAMES, type ParamName, type ParamOverrides } from '../physics/params.js';
import { checkKeys, describeFound, isMapping, readChoice, type ProblemList } from '../spec/problems.js';
import type { ModelSpec } from '../spec/types.js';
import { validateParams } from '../spec/validate-model.js';
import { describeModelValidator, paramsSchema } from '../spec/json-schema.js';
import { parseGeothermCsv, readGeothermFile, type GeothermTableSpec } from './flux-geotherm-file.js';
import type { ModelContext } from './types.js';

/** The `model` section of a flux sweep, normalized. */
export interface FluxModelSpec extends ModelSpec {
  readonly process: 'flux';
  /** 'lid-adiabat' (default) or a geotherm table read from a file */
  readonly geotherm: 'lid-adiabat' | GeothermTableSpec;
  /** 'balanced' (default) or 'fixed' */
  readonly heat: FluxHeat;
  readonly params: ParamOverrides;
}

/** Keys of a flux model section besides `process`. */
export const FLUX_MODEL_KEYS = ['geotherm', 'heat', 'params'] as const;

/** Validate a flux model section (see ProcessModelOptions.validate); wrapped below with its key schemas. */
function validateFluxSection(raw: Readonly<Record<string, unknown>>, problems: ProblemList, context: ModelContext = {}): FluxModelSpec | undefined {
  const before = problems.count;
  checkKeys(raw, FLUX_MODEL_KEYS, 'model', problems);
  const heat = raw.heat === undefined ? 'balanced' : readChoice(raw.heat, FLUX_HEAT_MODES, 'model.heat', problems, 'a heat mode');
  const geotherm = readGeotherm(raw.geotherm, context, problems);
  const params = raw.params === undefined || raw.params === null ? {} : validateParams(raw.params, problems);
  if (problems.count !== before || heat === undefined || geotherm === undefined || params === undefined) return undefined;
  return normalizeFluxModel({ process: 'flux', geotherm, heat, params });
}

/** Validate a flux model section, carrying the JSON Schema of each key for `meltsweep schema`. */
export const validateFluxModel = describeModelValidator(validateFluxSection, {
  geotherm: {
    description: 'the temperature profile of the column: lid-adiabat (default: linear in the plate, the adiabat of tp_c below), or { file: TABLE.csv } (columns depth_km or p_gpa, and t_c; relative to the sweep file; then tp_c and lid_km are not inputs)',
    default: 'lid-adiabat',
    anyOf: [
      { const: 'lid-adiabat' },
      { type: 'null' },
      { type: 'object', required: ['file'], properties: { file: { type: 'string', minLength: 1 }, sha256: { type: 'string' }, axis: { enum: ['depth_km', 'p_gpa'] }, at: { type: 'array', items: { type: 'number' } }, t_c: { type: 'array', items: { type: 'number' } } }, additionalProperties: false },
    ],
  },
  heat: { enum: [...FLUX_HEAT_MODES], default: 'balanced', description: 'balanced: melting takes its latent heat from the rock (entropy conserved at each depth); fixed: the rock stays on the geotherm' },
  params: paramsSchema(),
});

function readGeotherm(raw: unknown, context: ModelContext, problems: ProblemList): FluxModelSpec['geotherm'] | undefined {
  if (raw === undefined || raw === null || raw === 'lid-adiabat') return 'lid-adiabat';
  const allowed = 'allowed: lid-adiabat, or { file: TABLE.csv } (columns depth_km or p_gpa, and t_c)';
  if (!isMapping(raw)) {
    problems.add('model.geotherm', `${describeFound(raw)} is not a geotherm; ${allowed}`);
    return undefined;
  }
  if (typeof raw.file !== 'string' || raw.file.trim() === '') {
    problems.add('model.geotherm.file', `${describeFound(raw.file)} is not a file name; ${allowed}`);
    return undefined;
  }
  // the stored form (a spec read back from a results file) carries the table itself
  if (typeof raw.sha256 === 'string' && Array.isArray(raw.at) && Array.isArray(raw.t_c) && (raw.axis === 'depth_km' || raw.axis === 'p_gpa')) {
    const at = raw.at as unknown[];
    const tc = raw.t_c as unknown[];
    const text = [`${raw.axis},t_c`, ...at.map((a, i) => `${String(a)},${String(tc[i])}`)].join('\n');
    const parsed = at.length === tc.length ? parseGeothermCsv(text, raw.file, 'model.geotherm', problems) : undefined;
    if (parsed === undefined) {
      if (at.length !== tc.length) problems.add('model.geotherm', `the stored table has ${at.length} positions but ${tc.length} temperatures`);
      return undefined;
    }
    return { file: raw.file, sha256: raw.sha256, ...parsed };
  }
  checkKeys(raw, ['file'], 'model.geotherm', problems);
  return readGeothermFile(raw.file, context.baseDir ?? process.cwd(), 'model.geotherm.file', problems);
}

/** The canonical form of a valid flux model section (key order fixed, params in registry order). */
export function normalizeFluxModel(model: FluxModelSpec): FluxModelSpec {
  const params: Partial<Record<ParamName, number>> = {};
  for (const name of PARAM_NAMES) {
    const v = model.params[name];
    if (v !== undefined) params[name] = v;
  }
  const g = model.geotherm;
  const geotherm = g === 'lid-adiabat' ? g : { file: g.file, sha256: g.sha256, axis: g.axis, at: [...g.at], t_c: [...g.t_c] };
  return { process: 'flux', geotherm, heat: model.heat, params };
}
