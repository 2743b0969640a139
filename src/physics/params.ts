/**
 * Model parameter set for hydrous peridotite melting and the thermal column.
 *
 * Defaults are the values of Katz, Spiegelman & Langmuir (2003), G-cubed 4(9), 1073, Table 2
 * (as listed in the project's physics reference), plus the constants of the project's
 * conventions (g, crustal density, conductivity, surface temperature).
 *
 * Keys keep the paper's notation (A1, beta1, D_H2O, M_cpx ...) because that is how users
 * name them when they compare with the paper. Every key has a unit and a plausible range;
 * the range catches magnitude slips (GPa given as Pa, ppm given as wt%) rather than
 * judging the science.
 */
import { z } from 'zod';
import { MODEL_MAX_P_GPA } from './types.js';

export interface ParamInfo {
  /** default value (published or convention) */
  readonly value: number;
  readonly unit: string;
  readonly description: string;
  /** smallest plausible value (inclusive) */
  readonly min: number;
  /** largest plausible value (inclusive) */
  readonly max: number;
}

/** The parameter registry: one entry per parameter, in the paper's notation. */
export const PARAM_INFO = {
  A1: { value: 1085.7, unit: 'degC', description: 'anhydrous solidus: constant term', min: 800, max: 1400 },
  A2: { value: 132.9, unit: 'degC/GPa', description: 'anhydrous solidus: linear term', min: 0, max: 400 },
  A3: { value: -5.1, unit: 'degC/GPa^2', description: 'anhydrous solidus: quadratic term', min: -50, max: 50 },
  B1: { value: 1475.0, unit: 'degC', description: 'lherzolite liquidus: constant term', min: 1000, max: 2000 },
  B2: { value: 80.0, unit: 'degC/GPa', description: 'lherzolite liquidus: linear term', min: 0, max: 400 },
  B3: { value: -3.2, unit: 'degC/GPa^2', description: 'lherzolite liquidus: quadratic term', min: -50, max: 50 },
  C1: { value: 1780.0, unit: 'degC', description: 'liquidus: constant term', min: 1200, max: 2500 },
  C2: { value: 45.0, unit: 'degC/GPa', description: 'liquidus: linear term', min: 0, max: 400 },
  C3: { value: -2.0, unit: 'degC/GPa^2', description: 'liquidus: quadratic term', min: -50, max: 50 },
  r1: { value: 0.5, unit: 'cpx/melt', description: 'cpx reaction coefficient: constant term', min: 0.01, max: 2 },
  r2: { value: 0.08, unit: 'cpx/melt/GPa', description: 'cpx reaction coefficient: pressure term', min: -1, max: 1 },
  beta1: { value: 1.5, unit: '-', description: 'melt fraction exponent before cpx exhaustion', min: 0.1, max: 10 },
  beta2: { value: 1.5, unit: '-', description: 'melt fraction exponent after cpx exhaustion', min: 0.1, max: 10 },
  K: { value: 43, unit: 'degC/wt%^gamma', description: 'solidus depression by water: coefficient', min: 0, max: 500 },
  gamma: { value: 0.75, unit: '-', description: 'solidus depression by water: exponent', min: 0.1, max: 2 },
  D_H2O: { value: 0.01, unit: '-', description: 'bulk partition coefficient of water (solid/melt)', min: 1e-5, max: 1 },
  chi1: { value: 12.0, unit: 'wt%/GPa^lambda', description: 'water saturation in melt: coefficient', min: 0, max: 100 },
  chi2: { value: 1.0, unit: 'wt%/GPa', description: 'water saturation in melt: linear term', min: 0, max: 100 },
  lambda: { value: 0.6, unit: '-', description: 'water saturation in melt: exponent', min: 0.01, max: 2 },
  M_cpx: { value: 0.17, unit: 'mass fraction', description: 'modal clinopyroxene in the source', min: 0, max: 0.5 },
  c_P: { value: 1000, unit: 'J/kg/K', description: 'specific heat capacity', min: 500, max: 2000 },
  alpha_s: { value: 40e-6, unit: '1/K', description: 'thermal expansivity of the solid', min: 0, max: 1e-4 },
  alpha_f: { value: 68e-6, unit: '1/K', description: 'thermal expansivity of the melt', min: 0, max: 2e-4 },
  rho_s: { value: 3300, unit: 'kg/m3', description: 'density of the solid mantle (also used for depth from pressure)', min: 2500, max: 4500 },
  rho_f: { value: 2900, unit: 'kg/m3', description: 'density of the melt', min: 2000, max: 4000 },
  dS: { value: 300, unit: 'J/kg/K', description: 'entropy of fusion', min: 0, max: 1000 },
  rho_c: { value: 2900, unit: 'kg/m3', description: 'density of the crust (crust thickness from melt column)', min: 2000, max: 3500 },
  g: { value: 9.81, unit: 'm/s2', description: 'gravitational acceleration', min: 1, max: 30 },
  k: { value: 3.3, unit: 'W/m/K', description: 'thermal conductivity (conductive column)', min: 0.5, max: 10 },
  T_surface: { value: 0, unit: 'degC', description: 'surface temperature (conductive column)', min: -50, max: 100 },
} as const satisfies Record<string, ParamInfo>;

export type ParamName = keyof typeof PARAM_INFO;

/** A complete, validated parameter set. Frozen; safe to share between threads by value. */
export type MeltParams = { readonly [K in ParamName]: number };

export const PARAM_NAMES = Object.keys(PARAM_INFO) as ParamName[];

/** The published defaults (Katz et al. 2003, Table 2) and the project's conventions. */
export const DEFAULT_PARAMS: MeltParams = Object.freeze(
  Object.fromEntries(PARAM_NAMES.map((n) => [n, PARAM_INFO[n].value])) as MeltParams,
);

function paramField(name: ParamName) {
  const info: ParamInfo = PARAM_INFO[name];
  return z
    .number({ error: `params.${name}: must be a number (${info.unit}), allowed ${info.min} to ${info.max}` })
    .refine((v) => Number.isFinite(v) && v >= info.min && v <= info.max, {
      error: (iss) =>
        `params.${name}: ${String(iss.input)} ${info.unit} is outside the plausible range ${info.min} to ${info.max} ${info.unit} (${info.description})`,
    });
}

/** zod schema for user overrides: any subset of the parameters, no unknown keys. */
export const paramOverridesSchema = z
  .object(Object.fromEntries(PARAM_NAMES.map((n) => [n, paramField(n).optional()])) as {
    [K in ParamName]: z.ZodOptional<ReturnType<typeof paramField>>;
  })
  .strict();

export type ParamOverrides = Partial<Record<ParamName, number>>;

/** Thrown for a parameter set that fails validation; the message names every bad field. */
export class ParamError extends Error {
  override readonly name = 'ParamError';
  constructor(readonly problems: readonly string[]) {
    super(problems.join('\n'));
  }
}

/**
 * Merge user overrides onto the defaults and check the result, including the
 * relations between parameters that single ranges cannot express.
 * @throws ParamError naming each bad field, its value and what is allowed.
 */
export function resolveParams(overrides: ParamOverrides = {}): MeltParams {
  const parsed = paramOverridesSchema.safeParse(overrides);
  if (!parsed.success) {
    throw new ParamError(
      parsed.error.issues.map((iss) =>
        iss.code === 'unrecognized_keys'
          ? `params: unknown parameter(s) ${iss.keys.join(', ')}; allowed: ${PARAM_NAMES.join(', ')}`
          : iss.message,
      ),
    );
  }
  const merged = { ...DEFAULT_PARAMS } as Record<ParamName, number>;
  for (const [k, v] of Object.entries(parsed.data)) if (v !== undefined) merged[k as ParamName] = v;
  const problems: string[] = [];
  const below = (upper: 'B' | 'C', lower: 'A' | 'B', what: string): void => {
    const gap = lowestGap(merged, upper, lower, MODEL_MAX_P_GPA);
    if (!(gap.gapC > 0)) {
      const at = (k: 'A' | 'B' | 'C'): string => (merged[`${k}1`] + merged[`${k}2`] * gap.pGpa + merged[`${k}3`] * gap.pGpa ** 2).toFixed(1);
      problems.push(
        `params.${upper}1, ${upper}2, ${upper}3 with params.${lower}1, ${lower}2, ${lower}3: ${what} at P = ${gap.pGpa.toFixed(2)} GPa ` +
          `(${at(upper)} vs ${at(lower)} degC); it must stay above it at every pressure the model covers, 0 to ${MODEL_MAX_P_GPA} GPa`,
      );
    }
  };
  below('B', 'A', 'the lherzolite liquidus B1 + B2 P + B3 P^2 is not above the solidus A1 + A2 P + A3 P^2');
  below('C', 'B', 'the liquidus C1 + C2 P + C3 P^2 is not above the lherzolite liquidus B1 + B2 P + B3 P^2');
  const rCpxLow = Math.min(merged.r1, merged.r1 + merged.r2 * MODEL_MAX_P_GPA);
  if (!(rCpxLow > 0)) {
    problems.push(
      `params.r1, r2: the cpx reaction coefficient r1 + r2 P is ${rCpxLow.toPrecision(3)} at ${merged.r1 <= rCpxLow ? 0 : MODEL_MAX_P_GPA} GPa; ` +
        `it must be positive at every pressure the model covers, 0 to ${MODEL_MAX_P_GPA} GPa`,
    );
  }
  if (problems.length > 0) throw new ParamError(problems);
  return Object.freeze(merged);
}

/**
 * Smallest difference (degC) between two quadratic melting curves, upper minus lower, over
 * [0, pMaxGpa] and where it occurs: at an end of the range or at the vertex of the difference.
 */
export function lowestGap(p: Readonly<Record<ParamName, number>>, upper: 'B' | 'C', lower: 'A' | 'B', pMaxGpa: number): { gapC: number; pGpa: number } {
  const c0 = p[`${upper}1`] - p[`${lower}1`];
  const c1 = p[`${upper}2`] - p[`${lower}2`];
  const c2 = p[`${upper}3`] - p[`${lower}3`];
  const gap = (x: number): number => c0 + c1 * x + c2 * x * x;
  const candidates = [0, pMaxGpa];
  if (c2 > 0) {
    const vertex = -c1 / (2 * c2);
    if (vertex > 0 && vertex < pMaxGpa) candidates.push(vertex);
  }
  let best = { gapC: gap(0), pGpa: 0 };
  for (const x of candidates) if (gap(x) < best.gapC) best = { gapC: gap(x), pGpa: x };
  return best;
}
