/**
 * Outputs that repeat another output: y_b = scale y_a + offset on every row (the same rows hold a
 * value in both), e.g. a depth computed from a pressure, or a flux that is a fixed multiple of a
 * melt fraction when the rate is not swept. Their indices are identical, so a summary prints one.
 * Found from the data, so it knows nothing about the outputs' meaning.
 */

/** How output `of` maps onto the copy: copy = scale x of + offset. */
export interface AffineCopy {
  readonly of: string;
  readonly scale: number;
  readonly offset: number;
}

/** Relative tolerance of the affine match (rounding of unit conversions is ~1e-16). */
const TOLERANCE = 1e-9;

function usableAt(y: Float64Array, include: Uint8Array | undefined, r: number): boolean {
  return (include === undefined || include[r] !== 0) && Number.isFinite(y[r]);
}

function matches(a: number, b: number, scale: number, offset: number): boolean {
  const fit = scale * a + offset;
  return Math.abs(b - fit) <= TOLERANCE * (Math.abs(b) + Math.abs(scale * a) + Math.abs(offset));
}

/**
 * scale and offset if b is an affine copy of a (non-zero scale, the same usable rows, a not
 * constant), else null. The map is fixed by the rows of the smallest and largest a (well apart, so
 * rounding in a cannot spoil it); a probe of a few rows rejects most pairs before the full check.
 */
export function affineCopy(a: Float64Array, b: Float64Array, include?: Uint8Array): { scale: number; offset: number } | null {
  const n = a.length;
  let lo = -1;
  let hi = -1;
  for (let r = 0; r < n; r++) {
    if (!usableAt(a, include, r)) continue;
    if (lo < 0 || a[r] < a[lo]) lo = r;
    if (hi < 0 || a[r] > a[hi]) hi = r;
  }
  if (lo < 0 || a[hi] === a[lo] || !usableAt(b, include, lo) || !usableAt(b, include, hi)) return null;
  const scale = (b[hi] - b[lo]) / (a[hi] - a[lo]);
  const offset = b[lo] - scale * a[lo];
  if (!(scale !== 0 && Number.isFinite(scale) && Number.isFinite(offset))) return null;
  const agrees = (r: number): boolean => {
    const ua = usableAt(a, include, r);
    return ua === usableAt(b, include, r) && (!ua || matches(a[r], b[r], scale, offset));
  };
  const probes = Math.min(n, 64);
  for (let k = 0; k < probes; k++) if (!agrees(Math.floor(((k + 0.5) * n) / probes))) return null;
  for (let r = 0; r < n; r++) if (!agrees(r)) return null;
  return { scale, offset };
}

/**
 * For each output that is an affine copy of an earlier one (in the given order), the output it
 * copies. Copies point at the first output of their group; constant outputs are never copies.
 */
export function findAffineCopies(
  names: readonly string[],
  columns: Readonly<Record<string, Float64Array>>,
  include?: Uint8Array,
): Record<string, AffineCopy> {
  const found: Record<string, AffineCopy> = {};
  const originals: string[] = [];
  for (const name of names) {
    const y = columns[name];
    let copy: AffineCopy | null = null;
    for (const of of originals) {
      const map = affineCopy(columns[of], y, include);
      if (map !== null) {
        copy = { of, ...map };
        break;
      }
    }
    if (copy === null) originals.push(name);
    else found[name] = copy;
  }
  return found;
}
