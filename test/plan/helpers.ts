import { validateSweep } from '../../src/spec/index.js';
import type { SweepSpec } from '../../src/spec/index.js';
import { allocatePointBatch, planSweep } from '../../src/plan/index.js';
import type { Plan, PointBatch } from '../../src/plan/index.js';
import { INPUT_NAMES } from '../../src/physics/fields.js';

export const FOUR_AXES = {
  tp_c: { from: 1280, to: 1420, step: 20 },
  water_ppm: { values: [0, 50, 100, 200] },
  lid_km: { from: 0, to: 40, count: 5 },
  upwelling_mm_yr: { from: 2, to: 80, count: 6, scale: 'log' },
};

/** A validated spec with the four axes above and the given design. */
export function specWith(design: Record<string, unknown>, axes: Record<string, unknown> = FOUR_AXES): SweepSpec {
  return validateSweep({ name: 'test', axes, design });
}

/** fill(start, end) into a fresh batch. */
export function fillRange(plan: Plan, start: number, end: number): PointBatch {
  const out = allocatePointBatch(plan.inputNames, end - start, plan.hasBlocks);
  plan.fill(start, end, out);
  return out;
}

/** Rows of a batch as arrays [tp_c, water_ppm, lid_km, upwelling_mm_yr]. */
export function rows(batch: PointBatch): number[][] {
  const n = batch.inputs.tp_c.length;
  return Array.from({ length: n }, (_, i) => INPUT_NAMES.map((name) => batch.inputs[name][i]));
}

/** fill over pieces [cuts[i], cuts[i+1]) concatenated, as one batch. */
export function fillPieces(plan: Plan, cuts: readonly number[]): PointBatch {
  const total = cuts[cuts.length - 1] - cuts[0];
  const out = allocatePointBatch(plan.inputNames, total, plan.hasBlocks);
  for (let i = 0; i + 1 < cuts.length; i++) {
    const piece = fillRange(plan, cuts[i], cuts[i + 1]);
    const at = cuts[i] - cuts[0];
    for (const name of INPUT_NAMES) out.inputs[name].set(piece.inputs[name], at);
    if (out.block !== null && piece.block !== null) out.block.set(piece.block, at);
  }
  return out;
}

/** Plan a spec (re-exported for brevity). */
export { planSweep };
