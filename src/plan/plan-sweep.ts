/**
 * Spec -> Plan: picks the design's planner from a lookup table.
 */
import { countPoints } from '../spec/count.js';
import type { DesignKind, SweepSpec } from '../spec/types.js';
import { checkCount } from './build-plan.js';
import { planGrid } from './grid.js';
import { planLatinHypercube } from './latin-hypercube.js';
import { planSaltelli } from './saltelli.js';
import { planSobol } from './sobol.js';
import type { Plan } from './types.js';

/** One planner per design kind. */
export const PLANNERS: Readonly<Record<DesignKind, (spec: SweepSpec) => Plan>> = Object.freeze({
  grid: planGrid,
  'latin-hypercube': planLatinHypercube,
  sobol: planSobol,
  saltelli: planSaltelli,
});

/**
 * Plan a validated sweep: its point count, layout and a lazy fill(start, end, out) that any
 * worker can call on any index range (results never depend on how the range is split).
 * Nothing proportional to the point count is allocated.
 * @throws InputError when the plan would have no points or more than MAX_POINTS (2^40).
 */
export function planSweep(spec: SweepSpec): Plan {
  // refuse an empty or oversized plan before a design sizes anything from the count
  checkCount(countPoints(spec.axes, spec.design), spec);
  return PLANNERS[spec.design.kind](spec);
}
