/**
 * Small numeric helpers on typed arrays: in-place selection and percentiles (no full sort).
 */

/**
 * Partially order a[lo..hi] in place so that a[k] holds the value of rank k, everything in
 * [lo, k) is <= a[k] and everything in (k, hi] is >= a[k] (Hoare's FIND with a median-of-three
 * pivot; expected linear time).
 */
export function selectInPlace(a: Float64Array, lo: number, hi: number, k: number): void {
  while (hi > lo) {
    const mid = (lo + hi) >>> 1;
    const x = a[lo];
    const y = a[mid];
    const z = a[hi];
    // median of the three as pivot keeps sorted and reversed inputs linear
    const pivot = x < y ? (y < z ? y : x < z ? z : x) : x < z ? x : y < z ? z : y;
    let i = lo;
    let j = hi;
    while (i <= j) {
      while (a[i] < pivot) i++;
      while (a[j] > pivot) j--;
      if (i <= j) {
        const t = a[i];
        a[i] = a[j];
        a[j] = t;
        i++;
        j--;
      }
    }
    if (k <= j) hi = j;
    else if (k >= i) lo = i;
    else return; // a[j + 1 .. i - 1] all equal the pivot
  }
}

/**
 * Percentiles of the first `m` values of `a` (reordered in place), by linear interpolation between
 * order statistics: position h = (m - 1) p, value = x_(floor h) + (h - floor h)(x_(floor h + 1) - x_(floor h))
 * (Hyndman & Fan 1996, definition 7). `ps` must be ascending. Returns NaN for m = 0.
 */
export function percentilesInPlace(a: Float64Array, m: number, ps: readonly number[]): number[] {
  const out: number[] = [];
  if (m === 0) return ps.map(() => NaN);
  let lo = 0;
  for (const p of ps) {
    const h = (m - 1) * p;
    const k = Math.floor(h);
    const frac = h - k;
    // elements below lo are already <= everything from lo on, so searching [lo, m) is enough
    selectInPlace(a, lo, m - 1, k);
    let v = a[k];
    if (frac > 0 && k + 1 < m) {
      let next = Infinity;
      for (let q = k + 1; q < m; q++) if (a[q] < next) next = a[q];
      v += frac * (next - v);
    }
    out.push(v);
    lo = k;
  }
  return out;
}

/** Percentile (definition 7, as above) of an already sorted array. */
export function percentileSorted(sorted: Float64Array, m: number, p: number): number {
  if (m === 0) return NaN;
  const h = (m - 1) * p;
  const k = Math.floor(h);
  const frac = h - k;
  return k + 1 < m ? sorted[k] + frac * (sorted[k + 1] - sorted[k]) : sorted[k];
}
