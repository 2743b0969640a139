/**
 * The part every design shares: argument checks of fill(), constant columns (fixed inputs and
 * defaults), and the frozen Plan object. A design only writes its swept columns.
 */
import { InputError } from '../errors.js';
import { inputsOfSpec } from '../process/registry.js';
import { MAX_POINTS } from '../spec/limits.js';
import type { SweepSpec } from '../spec/types.js';
import type { DesignLayout, Plan, PointBatch } from './types.js';

/** Writes the swept columns of points [start, end) into out (row 0 of out = point start). */
export type FillSwept = (start: number, end: number, out: PointBatch) => void;

/** What a design hands to buildPlan. */
export interface PlanParts {
  readonly spec: SweepSpec;
  readonly count: number;
  readonly layout: DesignLayout;
  readonly hasBlocks: boolean;
  readonly fillSwept: FillSwept;
}

/** Value of an input that is not swept: the fixed value, else its default (NaN when none). */
export function constantValue(spec: SweepSpec, name: string): number {
  const given = spec.fixed[name];
  if (given !== undefined) return given;
  const def = inputsOfSpec(spec).find((i) => i.name === name)?.default;
  return def === undefined || def === null ? Number.NaN : def;
}

/**
 * Refuse a point count the engine will not plan (zero, or above MAX_POINTS).
 * @throws InputError naming the count and the limit.
 */
export function checkCount(count: number, spec: SweepSpec): void {
  if (!Number.isSafeInteger(count) || count < 1) {
    throw new InputError(`${spec.design.kind}: the sweep "${spec.name}" has no points to plan (count ${count})`);
  }
  if (count > MAX_POINTS) {
    throw new InputError(`${spec.design.kind}: the sweep "${spec.name}" has ${count} points, above the limit of ${MAX_POINTS} (2^40)`);
  }
}

/** Assemble the frozen Plan of a design. */
export function buildPlan(parts: PlanParts): Plan {
  const { spec, count, layout, hasBlocks, fillSwept } = parts;
  checkCount(count, spec);
  const swept = new Set<string>(spec.axes.map((a) => a.name));
  const inputNames = Object.freeze(inputsOfSpec(spec).map((i) => i.name));
  const constants = inputNames.filter((n) => !swept.has(n)).map((n) => [n, constantValue(spec, n)] as const);
  const axisNames = Object.freeze(spec.axes.map((a) => a.name));

  const fill = (start: number, end: number, out: PointBatch): void => {
    if (!Number.isSafeInteger(start) || !Number.isSafeInteger(end) || start < 0 || end < start || end > count) {
      throw new RangeError(`fill(${start}, ${end}): the range must satisfy 0 <= start <= end <= ${count}`);
    }
    const n = end - start;
    for (const name of inputNames) {
      const col = out.inputs[name];
      if (col === undefined) throw new RangeError(`fill(${start}, ${end}): out.inputs has no column ${name}`);
      if (col.length < n) throw new RangeError(`fill(${start}, ${end}): out.inputs.${name} holds ${col.length} rows, needs ${n}`);
    }
    if (hasBlocks && (out.block === null || out.block.length < n)) {
      throw new RangeError(`fill(${start}, ${end}): a ${spec.design.kind} plan needs out.block with at least ${n} rows`);
    }
    if (n === 0) return;
    for (const [name, value] of constants) out.inputs[name].fill(value, 0, n);
    fillSwept(start, end, out);
  };

  return Object.freeze({ count, design: spec.design.kind, axisNames, inputNames, layout, hasBlocks, fill });
}
