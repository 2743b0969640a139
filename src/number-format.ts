/**
 * Numbers as people read them in labels, tables and summaries: 4 significant digits, no trailing
 * zeros, no thousands separator, exponent form only for very large or very small magnitudes.
 */

/** `v` to 4 significant digits; exponent form (with expDigits decimals) at or above expAbove and below 1e-3. */
export function formatSignificant(v: number, options: { readonly expAbove: number; readonly expDigits: number }): string {
  if (!Number.isFinite(v)) return String(v);
  if (v === 0) return '0';
  const a = Math.abs(v);
  if (a >= options.expAbove || a < 1e-3) return v.toExponential(options.expDigits);
  return String(Number(v.toPrecision(4)));
}
