/**
 * Test data builders for the sensitivity tests: known functions, grids, saltelli blocks and
 * samplers written here (independent of src/plan and of the analyzer's own code).
 */

/** Ishigami function (Ishigami & Homma 1990) with a = 7, b = 0.1. */
export function ishigami(x1: number, x2: number, x3: number, a = 7, b = 0.1): number {
  return Math.sin(x1) + a * Math.sin(x2) ** 2 + b * x3 ** 4 * Math.sin(x1);
}

/** Analytic Ishigami indices for a = 7, b = 0.1 (Ishigami & Homma 1990; analytic values, from memory, as listed in docs/physics.md). */
export const ISHIGAMI = {
  S1: [0.3139, 0.4424, 0] as const,
  ST: [0.5576, 0.4424, 0.2437] as const,
};

/** Minimal 32-bit LCG (Numerical Recipes constants) for test data; not the analyzer's generator. */
export function lcg(seed: number): () => number {
  let s = seed >>> 0;
  return () => {
    s = (Math.imul(s, 1664525) + 1013904223) >>> 0;
    return s / 4294967296;
  };
}

/** Radical inverse of i in base p (van der Corput), the coordinate of a Halton point. */
export function radicalInverse(i: number, p: number): number {
  let f = 1;
  let r = 0;
  let k = i;
  while (k > 0) {
    f /= p;
    r += f * (k % p);
    k = Math.floor(k / p);
  }
  return r;
}

export interface Axis {
  name: string;
  values: number[];
}

/** Evenly spaced values from lo to hi (inclusive), count n. */
export function linspace(lo: number, hi: number, n: number): number[] {
  return Array.from({ length: n }, (_, i) => (n === 1 ? lo : lo + ((hi - lo) * i) / (n - 1)));
}

/** Midpoints of n equal cells on [lo, hi]. */
export function midpoints(lo: number, hi: number, n: number): number[] {
  return Array.from({ length: n }, (_, i) => lo + ((hi - lo) * (i + 0.5)) / n);
}

/** A full grid table: rows in mixed-radix order, last axis fastest (nested counters). */
export function gridTable(axes: Axis[], f: (x: Float64Array) => number): { inputs: Record<string, Float64Array>; y: Float64Array; n: number } {
  const n = axes.reduce((p, a) => p * a.values.length, 1);
  const k = axes.length;
  const cols = axes.map(() => new Float64Array(n));
  const y = new Float64Array(n);
  const idx = new Array<number>(k).fill(0);
  const x = new Float64Array(k);
  for (let r = 0; r < n; r++) {
    for (let a = 0; a < k; a++) {
      x[a] = axes[a].values[idx[a]];
      cols[a][r] = x[a];
    }
    y[r] = f(x);
    for (let a = k - 1; a >= 0; a--) {
      idx[a]++;
      if (idx[a] < axes[a].values.length) break;
      idx[a] = 0;
    }
  }
  const inputs: Record<string, Float64Array> = {};
  axes.forEach((a, i) => (inputs[a.name] = cols[i]));
  return { inputs, y, n };
}

/**
 * Saltelli block-major table from base matrices A and B (row-major N x k):
 * rows [0,N) = A, [N,2N) = B, [(2+i)N,(3+i)N) = A with column i from B.
 */
export function saltelliTable(A: Float64Array, B: Float64Array, N: number, names: string[], f: (x: Float64Array) => number): { inputs: Record<string, Float64Array>; y: Float64Array } {
  const k = names.length;
  const rows = N * (k + 2);
  const cols = names.map(() => new Float64Array(rows));
  const y = new Float64Array(rows);
  const x = new Float64Array(k);
  for (let blk = 0; blk < k + 2; blk++) {
    for (let j = 0; j < N; j++) {
      for (let c = 0; c < k; c++) {
        const fromB = blk === 1 || (blk >= 2 && c === blk - 2);
        x[c] = fromB ? B[j * k + c] : A[j * k + c];
      }
      const r = blk * N + j;
      for (let c = 0; c < k; c++) cols[c][r] = x[c];
      y[r] = f(x);
    }
  }
  const inputs: Record<string, Float64Array> = {};
  names.forEach((nm, i) => (inputs[nm] = cols[i]));
  return { inputs, y };
}

/** Latin hypercube on [0,1)^k with a seeded LCG: one point per stratum, jittered. Row-major N x k. */
export function latinHypercube(N: number, k: number, seed: number): Float64Array {
  const rnd = lcg(seed);
  const out = new Float64Array(N * k);
  for (let c = 0; c < k; c++) {
    const perm = Array.from({ length: N }, (_, i) => i);
    for (let i = N - 1; i > 0; i--) {
      const j = Math.floor(rnd() * (i + 1));
      [perm[i], perm[j]] = [perm[j], perm[i]];
    }
    for (let i = 0; i < N; i++) out[i * k + c] = (perm[i] + rnd()) / N;
  }
  return out;
}

/** Population variance of a list of numbers. */
export function discreteVariance(v: readonly number[]): number {
  const m = v.reduce((s, x) => s + x, 0) / v.length;
  return v.reduce((s, x) => s + (x - m) ** 2, 0) / v.length;
}
