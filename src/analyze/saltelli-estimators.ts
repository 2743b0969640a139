/**
 * First-order and total Sobol indices from a saltelli design (block-major A, B, AB_i), with
 * bootstrap percentile intervals.
 *
 * For base sample j, with f_A = f(A_j), f_B = f(B_j), f_ABi = f(AB_i,j) and V the variance of the
 * f_A and f_B values together:
 * - first order, the estimator proposed by Saltelli, Annoni, Azzini, Campolongo, Ratto & Tarantola
 *   (2010, Comput. Phys. Commun. 181, 259-270):  S_i = mean(f_B (f_ABi - f_A)) / V;
 * - total effect, the estimator of Jansen (1999, Comput. Phys. Commun. 117, 35-43), as recommended
 *   in Saltelli et al. (2010):  S_Ti = mean((f_A - f_ABi)^2) / (2 V).
 * f_B is centred on the mean of the f_A and f_B values first: mean(f_ABi - f_A) is zero in
 * expectation, so this leaves the estimator's expectation unchanged and removes the noise a large
 * mean would add.
 *
 * Base sample j is used for input i only when A_j, B_j and AB_i,j are all usable; V, the estimates
 * and the resampling all use that same set of base samples. The bootstrap resamples base samples
 * with replacement (seeded) and recomputes V and both indices on each resample.
 */
import { percentileInterval } from './bootstrap.js';
import { createRng, deriveSeed } from './rng.js';

export interface SaltelliEstimate {
  readonly s1: number | null;
  readonly st: number | null;
  readonly s1Ci: [number, number] | null;
  readonly stCi: [number, number] | null;
  /** base samples used */
  readonly m: number;
}

export interface SaltelliSettings {
  readonly resamples: number;
  readonly confidence: number;
  readonly seed: number;
}

/**
 * Per-base-sample terms whose (weighted) sums give V, S_i and S_Ti: rows 0..3 are a, b, a^2, b^2
 * (a, b: f_A, f_B shifted by a common constant), then per input g the rows 4 + 3g + 0..2 are
 * b d, d, d^2 (d = f_ABi - f_A). Each row is a Float64Array over the base samples.
 */
function indicesFromSums(sums: Float64Array, m: number, g: number): { s1: number; st: number } {
  const c = (sums[0] + sums[1]) / (2 * m);
  const v = (sums[2] + sums[3]) / (2 * m) - c * c;
  if (!(v > 0)) return { s1: NaN, st: NaN };
  const o = 4 + 3 * g;
  return { s1: (sums[o] / m - (c * sums[o + 1]) / m) / v, st: sums[o + 2] / (2 * m * v) };
}

/** sum_q w_q x_q (two accumulators to shorten the dependency chain). */
function weightedSum(w: Float64Array, x: Float64Array, m: number): number {
  let s0 = 0;
  let s1 = 0;
  let q = 0;
  for (; q + 1 < m; q += 2) {
    s0 += w[q] * x[q];
    s1 += w[q + 1] * x[q + 1];
  }
  if (q < m) s0 += w[q] * x[q];
  return s0 + s1;
}

/** Plain sums of every term row (the full-sample estimate). */
function plainSums(terms: readonly Float64Array[], out: Float64Array): void {
  terms.forEach((row, t) => {
    let s = 0;
    for (let q = 0; q < row.length; q++) s += row[q];
    out[t] = s;
  });
}

/**
 * Indices of every input of a saltelli layout for one output.
 * @param labels input names (layout order), used to seed each resampling stream
 * @param streamLabel a label of the output, also used for seeding
 */
export function saltelliIndices(
  y: Float64Array,
  usable: Uint8Array,
  base: number,
  labels: readonly string[],
  streamLabel: string,
  settings: SaltelliSettings,
): SaltelliEstimate[] {
  const n = base;
  const k = labels.length;
  // base samples usable for each input
  const lists: Uint32Array[] = [];
  for (let i = 0; i < k; i++) {
    const off = (2 + i) * n;
    let m = 0;
    for (let j = 0; j < n; j++) if (usable[j] !== 0 && usable[n + j] !== 0 && usable[off + j] !== 0) m++;
    const list = new Uint32Array(m);
    m = 0;
    for (let j = 0; j < n; j++) if (usable[j] !== 0 && usable[n + j] !== 0 && usable[off + j] !== 0) list[m++] = j;
    lists.push(list);
  }
  // inputs sharing the same base samples are resampled together (the usual case: one group)
  const groups: { list: Uint32Array; inputs: number[] }[] = [];
  for (let i = 0; i < k; i++) {
    const list = lists[i];
    const same = groups.find((g) => g.list.length === list.length && g.list.every((v, q) => v === list[q]));
    if (same) same.inputs.push(i);
    else groups.push({ list, inputs: [i] });
  }
  const out: SaltelliEstimate[] = new Array<SaltelliEstimate>(k);
  for (const group of groups) {
    const { list, inputs } = group;
    const m = list.length;
    const gk = inputs.length;
    if (m < 2) {
      for (const i of inputs) out[i] = { s1: null, st: null, s1Ci: null, stCi: null, m };
      continue;
    }
    let mu = 0;
    for (let q = 0; q < m; q++) mu += y[list[q]] + y[n + list[q]];
    mu /= 2 * m;
    const terms = Array.from({ length: 4 + 3 * gk }, () => new Float64Array(m));
    for (let q = 0; q < m; q++) {
      const j = list[q];
      const a = y[j] - mu;
      const b = y[n + j] - mu;
      terms[0][q] = a;
      terms[1][q] = b;
      terms[2][q] = a * a;
      terms[3][q] = b * b;
      for (let g = 0; g < gk; g++) {
        const dq = y[(2 + inputs[g]) * n + j] - y[j];
        terms[4 + 3 * g][q] = b * dq;
        terms[5 + 3 * g][q] = dq;
        terms[6 + 3 * g][q] = dq * dq;
      }
    }
    const sums = new Float64Array(terms.length);
    plainSums(terms, sums);
    const point = inputs.map((_, g) => indicesFromSums(sums, m, g));

    const r = settings.resamples;
    const s1Boot = inputs.map(() => new Float64Array(r));
    const stBoot = inputs.map(() => new Float64Array(r));
    if (r > 0) {
      const rng = createRng(deriveSeed(settings.seed, streamLabel, labels[inputs[0]]));
      // a resample as multiplicities: w_q = times base sample q was drawn
      const w = new Float64Array(m);
      for (let rep = 0; rep < r; rep++) {
        w.fill(0);
        for (let q = 0; q < m; q++) w[rng.below(m)] += 1;
        for (let t = 0; t < terms.length; t++) sums[t] = weightedSum(w, terms[t], m);
        for (let g = 0; g < gk; g++) {
          const e = indicesFromSums(sums, m, g);
          s1Boot[g][rep] = e.s1;
          stBoot[g][rep] = e.st;
        }
      }
    }
    inputs.forEach((i, g) => {
      const e = point[g];
      out[i] = {
        s1: Number.isFinite(e.s1) ? e.s1 : null,
        st: Number.isFinite(e.st) ? e.st : null,
        s1Ci: r > 0 && Number.isFinite(e.s1) ? percentileInterval(s1Boot[g], settings.confidence) : null,
        stCi: r > 0 && Number.isFinite(e.st) ? percentileInterval(stBoot[g], settings.confidence) : null,
        m,
      };
    });
  }
  return out;
}
