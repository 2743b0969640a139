/**
 * The per-batch kernels of a fit: log-likelihoods, the prior's row counts and the posterior's
 * weighted sums (cells, moments, pairs), all held relative to the running maximum log-likelihood
 * (see accumulate.ts). Tight loops over typed arrays; no allocation per row.
 */
import { axisCells, groupCells, type Cells } from './cells.js';
import type { FitSetup } from './types.js';

/** Display cells per input of the two-input panels (finer cells are grouped). */
export const PAIR_CELLS = 64;

/** Weights below this share of the heaviest row's are left out of histograms, moments and pairs. */
const NEGLIGIBLE = 1e-16;

/** Sums over the rows, relative to the running maximum log-likelihood (see the file comment). */
export interface FitSums {
  readonly names: readonly string[];
  readonly cells: readonly Cells[];
  /** posterior mass per cell, per input */
  readonly post: readonly Float64Array[];
  /** prior row count per cell, per input (every row with a value, used or not) */
  readonly priorCount: readonly Float64Array[];
  /** posterior sum of w (x - shift) and w (x - shift)^2 per input */
  readonly m1: Float64Array;
  readonly m2: Float64Array;
  /** prior sums of (x - shift), (x - shift)^2 and rows per input */
  readonly p1: Float64Array;
  readonly p2: Float64Array;
  readonly pn: Float64Array;
  /** subtracted from x before summing (the middle of the range): keeps the variance exact */
  readonly shift: Float64Array;
  /** pair (a, b), a < b in axis order: mass[gb * groupsA + ga] */
  readonly pairs: readonly { readonly a: number; readonly b: number; readonly mass: Float64Array }[];
  readonly groups: readonly { readonly groupOf: Int32Array; readonly edgesT: Float64Array }[];
  s1: number;
  s2: number;
  /** the running maximum log-likelihood (-Infinity before the first used row) */
  maxLl: number;
}

/**
 * Log-likelihood of rows [0, n) into ll[pos ..] (NaN for left-out rows, counted in leftOut:
 * [code] for a left-out status, [nStatus + code * K + k] for a null observed output k).
 * Returns the largest log-likelihood and the rows within 3 sd of every observation.
 */
export function logLikelihoods(
  outs: readonly Float64Array[],
  values: Float64Array,
  inv: Float64Array,
  c0: number,
  status: Uint8Array | undefined,
  leave: Uint8Array,
  n: number,
  ll: Float64Array,
  pos: number,
  leftOut: Float64Array,
  used: Float64Array,
  nStatus: number,
): { max: number; within: number } {
  const K = outs.length;
  let max = -Infinity;
  let within = 0;
  // one observation is the common case: a loop without the inner loop
  if (K === 1) {
    const y = outs[0];
    const v = values[0];
    const iv = inv[0];
    for (let r = 0; r < n; r++) {
      const code = status === undefined ? 0 : status[r];
      const d = y[r] - v;
      if (leave[code] === 1 || d - d !== 0) {
        if (leave[code] === 1) leftOut[code] += 1;
        else leftOut[nStatus + code] += 1;
        ll[pos + r] = NaN;
        continue;
      }
      const z2 = d * d * iv;
      const l = c0 - 0.5 * z2;
      ll[pos + r] = l;
      used[code] += 1;
      if (z2 <= 9) within++;
      if (l > max) max = l;
    }
    return { max, within };
  }
  for (let r = 0; r < n; r++) {
    const code = status === undefined ? 0 : status[r];
    if (leave[code] === 1) {
      leftOut[code] += 1;
      ll[pos + r] = NaN;
      continue;
    }
    let chi2 = 0;
    let worst = 0;
    let nullAt = -1;
    for (let k = 0; k < K; k++) {
      const d = outs[k][r] - values[k];
      if (d - d !== 0) {
        nullAt = k;
        break;
      }
      const z2 = d * d * inv[k];
      chi2 += z2;
      if (z2 > worst) worst = z2;
    }
    if (nullAt >= 0) {
      leftOut[nStatus + code * K + nullAt] += 1;
      ll[pos + r] = NaN;
      continue;
    }
    const l = c0 - 0.5 * chi2;
    ll[pos + r] = l;
    used[code] += 1;
    if (worst <= 9) within++;
    if (l > max) max = l;
  }
  return { max, within };
}

export function createSums(setup: FitSetup): FitSums {
  const axes = setup.prior.axes;
  const grid = setup.prior.kind === 'grid';
  const cells = axes.map((a) => axisCells(a, grid));
  const groups = cells.map((c) => groupCells(c.edgesT, PAIR_CELLS));
  const pairs: { a: number; b: number; mass: Float64Array }[] = [];
  for (let a = 0; a < axes.length; a++) {
    for (let b = a + 1; b < axes.length; b++) {
      pairs.push({ a, b, mass: new Float64Array((groups[a].edgesT.length - 1) * (groups[b].edgesT.length - 1)) });
    }
  }
  const k = axes.length;
  return {
    names: axes.map((a) => a.name),
    cells,
    post: cells.map((c) => new Float64Array(c.count)),
    priorCount: cells.map((c) => new Float64Array(c.count)),
    m1: new Float64Array(k),
    m2: new Float64Array(k),
    p1: new Float64Array(k),
    p2: new Float64Array(k),
    pn: new Float64Array(k),
    shift: Float64Array.from(axes.map((a) => 0.5 * (a.min + a.max))),
    pairs,
    groups,
    s1: 0,
    s2: 0,
    maxLl: -Infinity,
  };
}

/** Multiply every weighted sum by f (the running maximum rose). */
export function rescale(s: FitSums, f: number): void {
  for (const m of s.post) for (let i = 0; i < m.length; i++) m[i] *= f;
  for (const p of s.pairs) for (let i = 0; i < p.mass.length; i++) p.mass[i] *= f;
  for (let a = 0; a < s.m1.length; a++) {
    s.m1[a] *= f;
    s.m2[a] *= f;
  }
  s.s1 *= f;
  s.s2 *= f * f;
}

export function accumulatePrior(s: FitSums, ins: readonly Float64Array[], idx: readonly Int32Array[], n: number): void {
  for (let a = 0; a < ins.length; a++) {
    const x = ins[a];
    const ix = idx[a];
    const count = s.priorCount[a];
    const shift = s.shift[a];
    let p1 = 0;
    let p2 = 0;
    let pn = 0;
    for (let r = 0; r < n; r++) {
      const i = ix[r];
      if (i < 0) continue;
      count[i] += 1;
      const d = x[r] - shift;
      p1 += d;
      p2 += d * d;
      pn += 1;
    }
    s.p1[a] += p1;
    s.p2[a] += p2;
    s.pn[a] += pn;
  }
}

export function accumulatePosterior(s: FitSums, ins: readonly Float64Array[], idx: readonly Int32Array[], ll: Float64Array, pos: number, n: number, w: Float64Array): void {
  const maxLl = s.maxLl;
  const k = ins.length;
  let s1 = 0;
  let s2 = 0;
  for (let r = 0; r < n; r++) {
    const l = ll[pos + r];
    w[r] = 0;
    if (l !== l) continue;
    const v = Math.exp(l - maxLl);
    s1 += v;
    s2 += v * v;
    // rows this far below the heaviest one cannot move a sum (n x 1e-16 relative at most)
    if (v < NEGLIGIBLE) continue;
    w[r] = v;
  }
  s.s1 += s1;
  s.s2 += s2;
  for (let a = 0; a < k; a++) {
    const x = ins[a];
    const ix = idx[a];
    const post = s.post[a];
    const shift = s.shift[a];
    let m1 = 0;
    let m2 = 0;
    for (let r = 0; r < n; r++) {
      const v = w[r];
      const i = ix[r];
      if (v === 0 || i < 0) continue;
      post[i] += v;
      const d = x[r] - shift;
      m1 += v * d;
      m2 += v * d * d;
    }
    s.m1[a] += m1;
    s.m2[a] += m2;
  }
  for (const p of s.pairs) {
    const ga = s.groups[p.a].groupOf;
    const gb = s.groups[p.b].groupOf;
    const width = s.groups[p.a].edgesT.length - 1;
    const ia = idx[p.a];
    const ib = idx[p.b];
    const mass = p.mass;
    for (let r = 0; r < n; r++) {
      const v = w[r];
      if (v === 0 || ia[r] < 0 || ib[r] < 0) continue;
      mass[gb[ib[r]] * width + ga[ia[r]]] += v;
    }
  }
}
