/**
 * Human-readable summary of a plan, for `meltsweep plan`: point count, design, each axis with
 * its values or sampled range, the constant inputs and the model choices.
 */
import { inputsOfSpec, processNameOf, processOfSpec, DEFAULT_PROCESS } from '../process/registry.js';
import type { AxisSpec, SweepSpec } from '../spec/types.js';
import type { Plan } from './types.js';

/** Values listed in full up to this many; longer lists show the first and last few. */
const MAX_LISTED = 8;

/** Number shown with at most 6 significant digits (1280, 0.05, 3.84374). */
export function formatValue(v: number): string {
  return Number.isFinite(v) ? String(Number(v.toPrecision(6))) : String(v);
}

function listValues(values: readonly number[]): string {
  const shown = values.length <= MAX_LISTED ? values.map(formatValue) : [...values.slice(0, 3).map(formatValue), '...', ...values.slice(-2).map(formatValue)];
  return shown.join(', ');
}

function isPowerOfTwo(n: number): boolean {
  return n >= 1 && 2 ** Math.round(Math.log2(n)) === n;
}

function designLine(spec: SweepSpec, plan: Plan): string {
  const d = spec.design;
  const k = spec.axes.length;
  switch (d.kind) {
    case 'grid':
      return k === 0
        ? 'design: grid with no swept inputs (a single point)'
        : `design: grid, full factorial of ${spec.axes.map((a) => a.values.length).join(' x ')}, last axis varies fastest`;
    case 'latin-hypercube':
      return `design: latin-hypercube, ${d.samples} samples, seed ${d.seed}`;
    case 'sobol':
      return `design: sobol, ${d.samples} samples (Joe & Kuo 2008 directions), skip ${d.skip}, ${d.seed === undefined ? 'no shift' : `digital shift seed ${d.seed}`}`;
    case 'saltelli': {
      const blocks = ['A', 'B', ...plan.axisNames.map((n) => `AB[${n}]`)].join(', ');
      return `design: saltelli, base ${d.base} x ${k + 2} blocks (${blocks}), Sobol sequence of ${2 * k} dimensions, skip ${d.skip}, ${d.seed === undefined ? 'no shift' : `digital shift seed ${d.seed}`}`;
    }
  }
}

function axisLine(axis: AxisSpec, spec: SweepSpec, width: number): string {
  const unit = inputsOfSpec(spec).find((i) => i.name === axis.name)?.unit ?? '';
  const label = `  ${axis.name.padEnd(width)}  `;
  if (spec.design.kind === 'grid') {
    const spacing = axis.scale === 'log' ? ' (log spacing)' : '';
    return `${label}${axis.values.length} value${axis.values.length === 1 ? '' : 's'}: ${listValues(axis.values)} ${unit}${spacing}`;
  }
  const law = axis.scale === 'log' ? 'log-uniform' : 'uniform';
  return `${label}${law} on ${formatValue(axis.min)} to ${formatValue(axis.max)} ${unit}`;
}

/**
 * Lines describing a plan (no trailing newlines): name, point count, design, axes, constant
 * inputs, model, and notes (e.g. a Sobol size that is not a power of two).
 */
export function describePlan(spec: SweepSpec, plan: Plan): string[] {
  const inputs = inputsOfSpec(spec);
  const width = Math.max(...inputs.map((i) => i.name.length));
  const lines: string[] = [];
  lines.push(`sweep: ${spec.name}`);
  lines.push(`points: ${plan.count}`);
  lines.push(designLine(spec, plan));
  if (spec.axes.length > 0) {
    lines.push('axes:');
    for (const axis of spec.axes) lines.push(axisLine(axis, spec, width));
  }
  const swept = new Set(plan.axisNames);
  const constants = inputs.filter((i) => !swept.has(i.name));
  if (constants.length > 0) {
    lines.push('constant inputs:');
    for (const input of constants) {
      const v = spec.fixed[input.name];
      const shown = v === undefined ? 'not given (rows carry NaN)' : `${formatValue(v)} ${input.unit}`;
      lines.push(`  ${input.name.padEnd(width)}  ${shown}`);
    }
  }
  const m = spec.model;
  const params = Object.entries(m.params).map(([k, v]) => `${k} = ${formatValue(v)}`);
  const process = processOfSpec(spec);
  const options = process.model.summary?.(m) ?? process.model.keys.filter((k) => k !== 'params' && m[k] !== undefined).map((k) => `${k} ${String(m[k])}`).join(', ');
  const processText = processNameOf(spec) === DEFAULT_PROCESS ? '' : `process ${process.name}, `;
  lines.push(`model: ${processText}${options === '' ? '' : `${options}, `}${params.length === 0 ? 'published parameters' : `parameters ${params.join(', ')}`}`);
  const d = spec.design;
  if (d.kind === 'sobol' && !isPowerOfTwo(d.samples)) {
    lines.push(`note: ${d.samples} samples is not a power of two; Sobol points are best balanced at powers of two (e.g. ${2 ** Math.round(Math.log2(d.samples))})`);
  }
  if (d.kind === 'saltelli' && !isPowerOfTwo(d.base)) {
    lines.push(`note: base ${d.base} is not a power of two; Sobol points are best balanced at powers of two (e.g. ${2 ** Math.round(Math.log2(d.base))})`);
  }
  if (d.kind !== 'grid' && spec.axes.some((a) => a.values.length > 2)) {
    lines.push(`note: ${d.kind} samples the whole range of each axis; a values list or a step/count only sets the range ends`);
  }
  return lines;
}
