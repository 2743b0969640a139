/**
 * The canonical form of a spec: fixed key order, defaults written out, deep-frozen, plain
 * JSON data. Two specs that make the same points normalize to the same JSON (and hash).
 */
import { INPUT_NAMES, type InputName } from '../physics/fields.js';
import { PARAM_NAMES, type ParamName } from '../physics/params.js';
import { INPUT_DEFAULTS } from './input-defaults.js';
import type { AxisSpec, DesignSpec, ModelSpec, SweepSpec } from './types.js';

/** Recursively freeze a plain-data value (objects and arrays) and return it. */
export function deepFreeze<T>(value: T): T {
  if (typeof value === 'object' && value !== null && !Object.isFrozen(value)) {
    for (const v of Object.values(value)) deepFreeze(v);
    Object.freeze(value);
  }
  return value;
}

/**
 * Canonical, deep-frozen copy of a spec: keys in a fixed order, `fixed` listing every constant
 * input (user-fixed values and the defaults water_ppm 0, lid_km 0; upwelling_mm_yr only when
 * given), parameter overrides in the registry's order, optional design fields omitted when absent.
 * The spec is trusted to be valid (it comes from `validateSweep`, or from stored JSON that did);
 * use `validateSweep` for anything a user wrote.
 */
export function normalizeSweep(spec: SweepSpec): SweepSpec {
  const swept = new Set<InputName>(spec.axes.map((a) => a.name));
  const axes: AxisSpec[] = spec.axes.map((a) => ({
    name: a.name,
    values: [...a.values],
    min: a.min,
    max: a.max,
    scale: a.scale,
  }));
  const fixed: Partial<Record<InputName, number>> = {};
  for (const name of INPUT_NAMES) {
    if (swept.has(name)) continue;
    const given = spec.fixed[name];
    if (given !== undefined) fixed[name] = given;
    else if (name !== 'tp_c' && Number.isFinite(INPUT_DEFAULTS[name])) fixed[name] = INPUT_DEFAULTS[name];
  }
  const params: Partial<Record<ParamName, number>> = {};
  for (const name of PARAM_NAMES) {
    const v = spec.model.params[name];
    if (v !== undefined) params[name] = v;
  }
  const model: ModelSpec = { thermal: spec.model.thermal, water: spec.model.water, params, step_gpa: spec.model.step_gpa };
  return deepFreeze({ name: spec.name, axes, fixed, design: normalizeDesign(spec.design), model });
}

function normalizeDesign(d: DesignSpec): DesignSpec {
  switch (d.kind) {
    case 'grid':
      return { kind: d.kind };
    case 'latin-hypercube':
      return { kind: d.kind, samples: d.samples, seed: d.seed };
    case 'sobol':
      return d.seed === undefined ? { kind: d.kind, samples: d.samples, skip: d.skip } : { kind: d.kind, samples: d.samples, skip: d.skip, seed: d.seed };
    case 'saltelli':
      return d.seed === undefined ? { kind: d.kind, base: d.base, skip: d.skip } : { kind: d.kind, base: d.base, skip: d.skip, seed: d.seed };
  }
}
