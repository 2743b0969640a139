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

/** Accumulated sums from which V, S_i and S_Ti follow. */
interface Sums {
  sa: number;
  sb: number;
  saa: number;
  sbb: number;
  sbd: Float64Array;
  sd: Float64Array;
  sdd: Float64Array;
}

function indicesFromSums(s: Sums, m: number, g: number): { s1: number; st: number } {
  const c = (s.sa + s.sb) / (2 * m);
  const v = (s.saa + s.sbb) / (2 * m) - c * c;
  if (!(v > 0)) return { s1: NaN, st: NaN };
  return { s1: (s.sbd[g] / m - (c * s.sd[g]) / m) / v, st: s.sdd[g] / (2 * m * v) };
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
    const a = new Float64Array(m);
    const b = new Float64Array(m);
    const d = inputs.map(() => new Float64Array(m));
    for (let q = 0; q < m; q++) {
      const j = list[q];
      a[q] = y[j] - mu;
      b[q] = y[n + j] - mu;
      for (let g = 0; g < gk; g++) d[g][q] = y[(2 + inputs[g]) * n + j] - y[j];
    }
    const sums: Sums = { sa: 0, sb: 0, saa: 0, sbb: 0, sbd: new Float64Array(gk), sd: new Float64Array(gk), sdd: new Float64Array(gk) };
    const accumulate = (q: number): void => {
      const aq = a[q];
      const bq = b[q];
      sums.sa += aq;
      sums.sb += bq;
      sums.saa += aq * aq;
      sums.sbb += bq * bq;
      for (let g = 0; g < gk; g++) {
        const dq = d[g][q];
        sums.sbd[g] += bq * dq;
        sums.sd[g] += dq;
        sums.sdd[g] += dq * dq;
      }
    };
    const reset = (): void => {
      sums.sa = sums.sb = sums.saa = sums.sbb = 0;
      sums.sbd.fill(0);
      sums.sd.fill(0);
      sums.sdd.fill(0);
    };
    for (let q = 0; q < m; q++) accumulate(q);
    const point = inputs.map((_, g) => indicesFromSums(sums, m, g));

    const r = settings.resamples;
    const s1Boot = inputs.map(() => new Float64Array(r));
    const stBoot = inputs.map(() => new Float64Array(r));
    if (r > 0) {
      const rng = createRng(deriveSeed(settings.seed, streamLabel, labels[inputs[0]]));
      for (let rep = 0; rep < r; rep++) {
        reset();
        for (let q = 0; q < m; q++) accumulate(rng.below(m));
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
