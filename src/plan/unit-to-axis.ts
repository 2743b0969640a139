/**
 * Map unit coordinates u in [0, 1) to an axis interval: uniform on [min, max], or log-uniform
 * (uniform in ln x) with scale 'log'. Results are clamped to [min, max]; u = 0 gives min exactly.
 */
import type { AxisSpec } from '../spec/types.js';

/**
 * Replace the unit coordinates col[start .. end) by their axis values, in place. One tight loop
 * per scale (no per-element calls), so mapping a million values takes a few milliseconds.
 */
export function mapUnitsToAxis(axis: Pick<AxisSpec, 'min' | 'max' | 'scale'>, col: Float64Array, start: number, end: number): void {
  const { min, max } = axis;
  if (axis.scale === 'log') {
    const span = Math.log(max / min);
    for (let i = start; i < end; i++) {
      const v = min * Math.exp(col[i] * span);
      col[i] = v < max ? v : max;
    }
  } else {
    const width = max - min;
    for (let i = start; i < end; i++) {
      const v = min + col[i] * width;
      col[i] = v < max ? v : max;
    }
  }
}
