/**
 * Small numeric helpers on typed arrays: in-place selection and percentiles (no full sort).
 */

/** Arrays at least this long try the one-pass bracketing first. */
const BRACKET_MIN_ROWS = 65536;
/** Sample size that sets the brackets. */
const BRACKET_SAMPLE = 8192;

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
 * (Hyndman & Fan 1996, Amer. Statist. 50, definition 7). `ps` must be ascending. NaN for m = 0.
 * Exact in every case; large arrays first try a one-pass bracketing of the wanted ranks (see
 * percentilesByBracket) and fall back to selection on the whole array.
 */
export function percentilesInPlace(a: Float64Array, m: number, ps: readonly number[]): number[] {
  if (m === 0) return ps.map(() => NaN);
  if (m >= BRACKET_MIN_ROWS) {
    const fast = percentilesByBracket(a, m, ps);
    if (fast !== null) return fast;
  }
  return percentilesBySelect(a, m, ps);
}

function percentilesBySelect(a: Float64Array, m: number, ps: readonly number[]): number[] {
  const out: number[] = [];
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

/**
 * Exact percentiles by bracketing (the sampling idea of Floyd & Rivest 1975, Commun. ACM 18): a
 * pseudo-random sample of the values gives, for each wanted rank, a bracket [lo, hi] that very
 * likely contains it; one tight pass per bracket counts the values below lo, equal to lo or hi,
 * and copies those strictly inside; the rank is then selected among the copies.
 * Returns null (caller falls back) when a rank falls outside its bracket or a bracket holds too
 * many values. Exported for tests.
 */
export function percentilesByBracket(a: Float64Array, m: number, ps: readonly number[]): number[] | null {
  const s = BRACKET_SAMPLE;
  const sample = new Float64Array(s);
  // local LCG: the sample positions must not alias with any grid stride
  let state = 0x2545f491;
  for (let i = 0; i < s; i++) {
    state = (Math.imul(state, 1664525) + 1013904223) >>> 0;
    sample[i] = a[Math.floor((state / 4294967296) * m)];
  }
  sample.sort();
  const margin = Math.ceil(2 * Math.sqrt(s)); // >= 4 sd of a sample quantile's rank
  // a bracket holds about 2 margin / s of the values; allow twice that before giving up
  const cap = Math.ceil((4 * margin * m) / s) + 1024;
  const inside = new Float64Array(cap);
  const out: number[] = [];
  for (const p of ps) {
    const r = p * (s - 1);
    const rl = Math.floor(r) - margin;
    const rh = Math.ceil(r) + margin;
    const lo = rl < 0 ? -Infinity : sample[rl];
    const hi = rh > s - 1 ? Infinity : sample[rh];
    // one pass: counts below lo, at lo, at hi; copies of the values strictly between
    let below = 0;
    let atLo = 0;
    let atHi = 0;
    let nIn = 0;
    for (let j = 0; j < m; j++) {
      const v = a[j];
      if (v < lo) below++;
      else if (v <= hi) {
        if (v === lo) atLo++;
        else if (v === hi) atHi++;
        else {
          if (nIn === cap) return null;
          inside[nIn++] = v;
        }
      }
    }
    const valueAtRank = (rank: number): number => {
      let k = rank - below;
      if (k < 0) return NaN;
      if (k < atLo) return lo;
      k -= atLo;
      if (k < nIn) {
        selectInPlace(inside, 0, nIn - 1, k);
        return inside[k];
      }
      k -= nIn;
      return k < atHi ? hi : NaN;
    };
    const h = (m - 1) * p;
    const k = Math.floor(h);
    const frac = h - k;
    let v = valueAtRank(k);
    if (frac > 0 && k + 1 < m) v += frac * (valueAtRank(k + 1) - v);
    if (Number.isNaN(v)) return null;
    out.push(v);
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
