/**
 * The canonical form of a spec: fixed key order, defaults written out, deep-frozen, plain
 * JSON data. Two specs that make the same points normalize to the same JSON (and hash).
 */
import { processOfSpec } from '../process/registry.js';
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
 * input of the sweep's process (user-fixed values and finite defaults, e.g. water_ppm 0, lid_km 0;
 * an input whose default is NaN only when given), the model section in the process's canonical form, optional design fields omitted when absent.
 * The spec is trusted to be valid (it comes from `validateSweep`, or from stored JSON that did);
 * use `validateSweep` for anything a user wrote.
 */
export function normalizeSweep(spec: SweepSpec): SweepSpec {
  const process = processOfSpec(spec);
  const swept = new Set<string>(spec.axes.map((a) => a.name));
  const axes: AxisSpec[] = spec.axes.map((a) => ({
    name: a.name,
    values: [...a.values],
    min: a.min,
    max: a.max,
    scale: a.scale,
  }));
  const fixed: Record<string, number> = {};
  for (const input of process.inputsFor(spec.model)) {
    if (swept.has(input.name)) continue;
    const given = spec.fixed[input.name];
    if (given !== undefined) fixed[input.name] = given;
    else if (input.default !== null && Number.isFinite(input.default)) fixed[input.name] = input.default;
  }
  const model: ModelSpec = process.model.normalize(spec.model, new Set([...swept, ...Object.keys(fixed)]));
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
