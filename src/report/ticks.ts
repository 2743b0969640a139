/**
 * Tick values chosen by measuring their labels: no two labels of an axis touch, however narrow the
 * panel, and the ticks are round numbers (linear axes), 1-2-5 values or decades (log axes), or the
 * edges of a map's bins. Label widths are those of the bundled font (textWidthPx).
 */
import { textWidthPx } from './font.js';
import { formatNumber } from './labels.js';

/** Font size of axis tick labels, px (the theme's axis labelFontSize). */
export const TICK_LABEL_SIZE = 10.5;
/** Most ticks on a linear axis: more read as a ruler, not as values. */
export const MAX_TICKS = 7;
/** Least gap between two neighbouring tick labels, px. */
export const TICK_LABEL_GAP = 8;

/** A tick label as the axis prints it: up to 4 significant digits, no thousands separator. */
export function tickLabel(value: number): string {
  return formatNumber(value);
}

/**
 * Whether labels at these positions (px along the axis) fit side by side: each neighbouring pair
 * at least TICK_LABEL_GAP apart, centred labels. Vertical axes give `along: 'y'` (labels one line
 * high, so only the line height counts).
 */
export function labelsFit(positionsPx: readonly number[], labels: readonly string[], along: 'x' | 'y' = 'x'): boolean {
  const size = (l: string): number => (along === 'x' ? textWidthPx(l, TICK_LABEL_SIZE) : TICK_LABEL_SIZE + 2);
  for (let k = 1; k < positionsPx.length; k++) {
    const room = Math.abs(positionsPx[k] - positionsPx[k - 1]);
    if (room < (size(labels[k]) + size(labels[k - 1])) / 2 + TICK_LABEL_GAP) return false;
  }
  return true;
}

/** Nice steps 1, 2, 2.5, 5 x 10^k from about span/50 upwards. */
function niceSteps(span: number): number[] {
  const out: number[] = [];
  const e0 = Math.floor(Math.log10(span)) - 2;
  for (let e = e0; e <= e0 + 4; e++) for (const m of [1, 2, 2.5, 5]) out.push(Number((m * 10 ** e).toPrecision(12)));
  return out;
}

/** Multiples of step inside [lo, hi] (inclusive, to rounding). */
function multiplesIn(lo: number, hi: number, step: number): number[] {
  const out: number[] = [];
  const tol = step * 1e-9;
  for (let k = Math.ceil((lo - tol) / step); k * step <= hi + tol; k++) out.push(Number((k * step).toPrecision(12)));
  return out;
}

/**
 * Round tick values inside [lo, hi] of a linear axis widthPx long, as many as fit (at most
 * MAX_TICKS): the smallest nice step whose labels do not touch. At least the one value that fits.
 */
export function linearTicks(lo: number, hi: number, widthPx: number, along: 'x' | 'y' = 'x'): number[] {
  if (!(hi > lo)) return [lo];
  const px = (v: number): number => ((v - lo) / (hi - lo)) * widthPx;
  for (const step of niceSteps(hi - lo)) {
    const ticks = multiplesIn(lo, hi, step);
    if (ticks.length > MAX_TICKS) continue;
    if (ticks.length >= 2 && labelsFit(ticks.map(px), ticks.map(tickLabel), along)) return ticks;
  }
  return [lo];
}

/**
 * Tick values of a log axis over [lo, hi] (lo > 0) widthPx long: 1-2-5 values, else decades, else
 * every other decade and so on, the first set whose labels do not touch.
 */
export function logAxisTicks(lo: number, hi: number, widthPx: number, along: 'x' | 'y' = 'x'): number[] {
  const span = Math.log10(hi / lo);
  const px = (v: number): number => (span > 0 ? (Math.log10(v / lo) / span) * widthPx : 0);
  const inRange = (v: number): boolean => v >= lo * (1 - 1e-12) && v <= hi * (1 + 1e-12);
  const valuesOf = (mantissas: readonly number[]): number[] => {
    const out: number[] = [];
    for (let e = Math.floor(Math.log10(lo)); e <= Math.ceil(Math.log10(hi)); e++) for (const m of mantissas) if (inRange(m * 10 ** e)) out.push(Number((m * 10 ** e).toPrecision(12)));
    return out;
  };
  const decades = valuesOf([1]);
  const sets = [valuesOf([1, 2, 5]), valuesOf([1, 3]), decades, ...[2, 3, 5, 10].map((every) => decades.filter((_, i) => i % every === 0))];
  // a short range (less than a decade or so): every mantissa first
  if (sets[0].length < 3) sets.unshift(valuesOf([1, 2, 3, 4, 5, 6, 7, 8, 9]));
  for (const ticks of sets) if (ticks.length >= 2 && labelsFit(ticks.map(px), ticks.map(tickLabel), along)) return ticks;
  const one = sets.find((t) => t.length > 0);
  return one === undefined ? [lo] : [one[0]];
}

/** The top of a melt-fraction axis: the next of 0.01, 0.02, ... 1 at least 4 % above the largest value. */
export function meltFractionAxisMax(v: number): number {
  const steps = [0.01, 0.02, 0.05, 0.1, 0.15, 0.2, 0.25, 0.3, 0.4, 0.5, 0.6, 0.8, 1];
  return steps.find((s) => s >= v * 1.04) ?? 1;
}

/** Round values from 0 to max, about six of them (a step of 1, 2 or 5 x 10^k), e.g. pressures in GPa. */
export function ticksFromZero(max: number): number[] {
  if (!(max > 0)) return [0];
  const raw = max / 6;
  const mag = 10 ** Math.floor(Math.log10(raw));
  const step = [1, 2, 5, 10].map((m) => m * mag).find((s) => s >= raw) ?? 10 * mag;
  const out: number[] = [];
  for (let v = 0; v <= max * (1 + 1e-9); v += step) out.push(Number(v.toPrecision(12)));
  return out;
}
