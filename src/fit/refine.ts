/**
 * The next sweep after a fit: the same design over the region the posterior occupies, so that
 * more rows land where the weight is and the effective sample size grows.
 */
import type { FitAxis, FitPrior, FitResult } from './types.js';

/** Margin added on each side of the posterior's 0.5-99.5 % range, as a share of its width. */
export const REFINE_MARGIN = 0.1;

/** How far a range is extended beyond an edge the posterior piles against, as a share of the old range. */
export const REFINE_EXTEND = 0.25;

/** The allowed interval of an input (the process's plausible range). */
export interface InputLimits {
  readonly min: number;
  readonly max: number;
}

/** One refined axis, in the sweep-file form, with what was decided about it. */
export interface RefinedAxis {
  readonly name: string;
  readonly from: number;
  readonly to: number;
  /** grid designs: the old number of values */
  readonly count?: number;
  readonly scale: 'linear' | 'log';
  readonly note: string | null;
}

function toT(x: number, log: boolean): number {
  return log ? Math.log(x) : x;
}

function fromT(t: number, log: boolean): number {
  return log ? Math.exp(t) : t;
}

/** Round lo down and hi up to about three significant digits of the width (never inward). */
function roundOut(lo: number, hi: number): [number, number] {
  const width = hi - lo;
  if (!(width > 0)) return [lo, hi];
  const step = 10 ** (Math.floor(Math.log10(width)) - 2);
  const a = Number((Math.floor(lo / step) * step).toPrecision(12));
  const b = Number((Math.ceil(hi / step) * step).toPrecision(12));
  return [a <= lo ? a : lo, b >= hi ? b : hi];
}

/**
 * The refined interval of each swept input: the posterior's 0.5-99.5 % range widened by
 * REFINE_MARGIN of its width on each side and to at least two row spacings of the old design,
 * kept inside the old range except on a side the posterior piles against (an edge warning),
 * which is extended by REFINE_EXTEND of the old range; everything within `limits`.
 * Grid axes keep their number of values (so the grid gets finer); log axes are handled in ln x.
 */
export function refineAxes(prior: FitPrior, result: FitResult, limits: Readonly<Record<string, InputLimits>> = {}): RefinedAxis[] {
  const k = prior.axes.length;
  return prior.axes.map((axis: FitAxis) => {
    const log = axis.scale === 'log';
    const count = prior.kind === 'grid' ? axis.values.length : undefined;
    if (axis.min === axis.max || (count !== undefined && count < 2)) {
      return { name: axis.name, from: axis.min, to: axis.max, count, scale: axis.scale, note: 'a single value: kept' };
    }
    const t0 = toT(axis.min, log);
    const t1 = toT(axis.max, log);
    const [q0, q1] = result.range99[axis.name];
    let lo = toT(q0, log);
    let hi = toT(q1, log);
    const margin = REFINE_MARGIN * (hi - lo);
    lo -= margin;
    hi += margin;
    const spacing = count !== undefined ? (t1 - t0) / (count - 1) : (t1 - t0) * Math.max(result.rows, 1) ** (-1 / k);
    const mid = toT(result.posterior[axis.name].p50, log);
    if (hi - lo < 2 * spacing) {
      lo = Math.min(lo, mid - spacing);
      hi = Math.max(hi, mid + spacing);
    }
    const edge = (side: 'lower' | 'upper'): boolean => result.warnings.some((w) => w.kind === 'edge' && w.input === axis.name && w.message.includes(`${side} edge`));
    const notes: string[] = [];
    if (edge('lower')) {
      lo = Math.min(lo, t0 - REFINE_EXTEND * (t1 - t0));
      notes.push('extended below the old range');
    } else lo = Math.max(lo, t0);
    if (edge('upper')) {
      hi = Math.max(hi, t1 + REFINE_EXTEND * (t1 - t0));
      notes.push('extended above the old range');
    } else hi = Math.min(hi, t1);
    let from = fromT(lo, log);
    let to = fromT(hi, log);
    [from, to] = roundOut(from, to);
    const lim = limits[axis.name];
    if (lim !== undefined) {
      if (from < lim.min) {
        from = lim.min;
        notes.push(`held at the allowed minimum ${lim.min}`);
      }
      if (to > lim.max) {
        to = lim.max;
        notes.push(`held at the allowed maximum ${lim.max}`);
      }
    }
    if (log && !(from > 0)) from = axis.min;
    return { name: axis.name, from, to, count, scale: axis.scale, note: notes.length > 0 ? notes.join('; ') : null };
  });
}

/**
 * The refined sweep as sweep-file data: every key of the old sweep kept (fixed inputs, design,
 * model, ...), the name marked as refined, and the swept axes replaced by the refined intervals
 * (grids: from/to/count; sampled designs: from/to).
 * @param sweep the old sweep as stored in the table (its `axes` list is replaced)
 */
export function refinedSweepData(sweep: Readonly<Record<string, unknown>>, axes: readonly RefinedAxis[]): Record<string, unknown> {
  const out: Record<string, unknown> = {};
  const oldName = typeof sweep.name === 'string' ? sweep.name : 'sweep';
  for (const [key, value] of Object.entries(sweep)) {
    if (key === 'axes') {
      out.axes = Object.fromEntries(
        axes.map((a) => {
          const body: Record<string, unknown> = { from: a.from, to: a.to };
          if (a.count !== undefined) body.count = a.count;
          if (a.scale === 'log') body.scale = 'log';
          return [a.name, body];
        }),
      );
    } else if (key === 'name') {
      out.name = `${oldName.replace(/-refined(-\d+)?$/, '').slice(0, 180)}-refined`;
    } else {
      out[key] = value;
    }
  }
  if (out.name === undefined) out.name = `${oldName}-refined`;
  return out;
}
