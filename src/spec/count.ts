/**
 * Number of points a design makes from its axes: the one formula the validator (limits) and
 * the planner (Plan.count) share.
 */
import type { AxisSpec, DesignSpec } from './types.js';

/**
 * Points of a sweep: grid = product of the axis lengths (1 with no axes);
 * latin-hypercube, sobol = samples; saltelli = base (k + 2) for k swept inputs.
 * May exceed MAX_POINTS (the caller checks); exact while below 2^53.
 */
export function countPoints(axes: readonly Pick<AxisSpec, 'values'>[], design: DesignSpec): number {
  switch (design.kind) {
    case 'grid':
      return axes.reduce((n, a) => n * a.values.length, 1);
    case 'latin-hypercube':
    case 'sobol':
      return design.samples;
    case 'saltelli':
      return design.base * (axes.length + 2);
  }
}
