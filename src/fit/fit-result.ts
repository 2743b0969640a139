/**
 * From the accumulated sums to the fit's answer: normalised weights, effective sample size,
 * summaries (mean, sd, quantiles by the convention of cells.ts), the pictures' mass functions and
 * the warnings with the next step to take.
 */
import { InputError } from '../errors.js';
import type { FitAccumulator, FitSums } from './accumulate.js';
import { cellQuantile, equalCells, fromT } from './cells.js';
import { describePrior } from './prior.js';
import type { FitBestRow, FitHistogram, FitPairDensity, FitResult, FitSummary, FitWarning } from './types.js';
import { fitWarnings } from './warnings.js';

/** Quantile levels of every summary. */
export const SUMMARY_LEVELS = { p2_5: 0.025, p16: 0.16, p50: 0.5, p84: 0.84, p97_5: 0.975 } as const;

/** Cells of the output histograms behind the predictive quantiles. */
export const PREDICT_CELLS = 4096;

/** Cells of the predictive pictures. */
export const PREDICT_PLOT_CELLS = 48;

/** Display cells of each input's prior-vs-posterior picture. */
export const MARGINAL_CELLS = 64;

/** Rows lighter than this share of the heaviest row do not stretch the predictive cells. */
const NEGLIGIBLE_WEIGHT = 1e-12;

/** Mean, sd and the quantiles of a mass function on cells with its moments. */
export function summaryOf(mass: ArrayLike<number>, total: number, edgesT: ArrayLike<number>, log: boolean, mean: number, variance: number): FitSummary {
  const q = (p: number): number => cellQuantile(mass, total, edgesT, log, p);
  return {
    mean,
    sd: Math.sqrt(Math.max(0, variance)),
    p2_5: q(SUMMARY_LEVELS.p2_5),
    p16: q(SUMMARY_LEVELS.p16),
    p50: q(SUMMARY_LEVELS.p50),
    p84: q(SUMMARY_LEVELS.p84),
    p97_5: q(SUMMARY_LEVELS.p97_5),
  };
}

function inputSummaries(s: FitSums): { prior: Record<string, FitSummary>; posterior: Record<string, FitSummary>; range99: Record<string, [number, number]> } {
  const prior: Record<string, FitSummary> = {};
  const posterior: Record<string, FitSummary> = {};
  const range99: Record<string, [number, number]> = {};
  s.names.forEach((name, a) => {
    const cells = s.cells[a];
    const pm = s.m1[a] / s.s1;
    posterior[name] = summaryOf(s.post[a], s.s1, cells.edgesT, cells.log, s.shift[a] + pm, s.m2[a] / s.s1 - pm * pm);
    range99[name] = [cellQuantile(s.post[a], s.s1, cells.edgesT, cells.log, 0.005), cellQuantile(s.post[a], s.s1, cells.edgesT, cells.log, 0.995)];
    const qm = s.p1[a] / s.pn[a];
    prior[name] = summaryOf(s.priorCount[a], s.pn[a], cells.edgesT, cells.log, s.shift[a] + qm, s.p2[a] / s.pn[a] - qm * qm);
  });
  return { prior, posterior, range99 };
}

/** Posterior predictive of one stored output: exact moments, quantiles from fine cells. */
function predictiveOf(name: string, y: Float64Array, weights: Float64Array, obs: { value: number; totalSd: number } | undefined): { summary: FitSummary; plot: FitHistogram } {
  let wMax = 0;
  for (let r = 0; r < y.length; r++) if (weights[r] > wMax) wMax = weights[r];
  const floor = wMax * NEGLIGIBLE_WEIGHT;
  let lo = Infinity;
  let hi = -Infinity;
  let priorLo = Infinity;
  let priorHi = -Infinity;
  let s1 = 0;
  let m1 = 0;
  let m2 = 0;
  let shift = NaN;
  for (let r = 0; r < y.length; r++) {
    const w = weights[r];
    if (!(w >= 0)) continue; // left out (NaN)
    const v = y[r];
    if (v < priorLo) priorLo = v;
    if (v > priorHi) priorHi = v;
    if (w <= floor) continue;
    if (shift !== shift) shift = v;
    if (v < lo) lo = v;
    if (v > hi) hi = v;
    const d = v - shift;
    s1 += w;
    m1 += w * d;
    m2 += w * d * d;
  }
  const mean = shift + m1 / s1;
  const variance = m2 / s1 - (m1 / s1) ** 2;
  let summary: FitSummary;
  if (hi > lo) {
    const cells = equalCells(lo, hi, PREDICT_CELLS, false);
    const mass = new Float64Array(PREDICT_CELLS);
    for (let r = 0; r < y.length; r++) if (weights[r] > floor) mass[cells.index(y[r])] += weights[r];
    summary = summaryOf(mass, s1, cells.edgesT, false, mean, variance);
  } else {
    summary = { mean: lo, sd: 0, p2_5: lo, p16: lo, p50: lo, p84: lo, p97_5: lo };
  }
  // the picture spans what the design can produce and the observation +- 2 sd
  let a = priorLo;
  let b = priorHi;
  if (obs !== undefined) {
    a = Math.min(a, obs.value - 2 * obs.totalSd);
    b = Math.max(b, obs.value + 2 * obs.totalSd);
  }
  if (!(b > a)) {
    const half = Math.max(Math.abs(a) * 0.05, 0.5);
    a -= half;
    b += half;
  }
  const cells = equalCells(a, b, PREDICT_PLOT_CELLS, false);
  const prior = new Float64Array(PREDICT_PLOT_CELLS);
  const posterior = new Float64Array(PREDICT_PLOT_CELLS);
  let n = 0;
  for (let r = 0; r < y.length; r++) {
    const w = weights[r];
    if (!(w >= 0)) continue;
    const i = cells.index(y[r]);
    prior[i] += 1;
    posterior[i] += w;
    n++;
  }
  // weights already sum to 1 over the used rows
  for (let i = 0; i < PREDICT_PLOT_CELLS; i++) prior[i] /= n;
  return { summary, plot: { name, edges: cells.edgesT, prior, posterior } };
}

function marginalsOf(s: FitSums): FitHistogram[] {
  return s.names.map((name, a) => {
    const cells = s.cells[a];
    const groups = Math.min(cells.count, MARGINAL_CELLS);
    const groupOf = new Int32Array(cells.count);
    for (let i = 0; i < cells.count; i++) groupOf[i] = Math.floor((i * groups) / cells.count);
    const prior = new Float64Array(groups);
    const posterior = new Float64Array(groups);
    for (let i = 0; i < cells.count; i++) {
      prior[groupOf[i]] += s.priorCount[a][i] / s.pn[a];
      posterior[groupOf[i]] += s.post[a][i] / s.s1;
    }
    const edges = new Float64Array(groups + 1);
    for (let g = 0; g <= groups; g++) edges[g] = fromT(cells.edgesT[Math.ceil((g * cells.count) / groups)], cells.log);
    return { name, edges, prior, posterior };
  });
}

function pairsOf(s: FitSums): FitPairDensity[] {
  return s.pairs.map((p) => ({
    x: s.names[p.a],
    y: s.names[p.b],
    xEdges: s.groups[p.a].edgesT.map((t) => fromT(t, s.cells[p.a].log)),
    yEdges: s.groups[p.b].edgesT.map((t) => fromT(t, s.cells[p.b].log)),
    mass: p.mass.map((m) => m / s.s1),
  }));
}

/**
 * The fit's answer from an accumulator that has seen every row.
 * @throws InputError when no row could be used (every row left out)
 */
export function finishFit(acc: FitAccumulator): FitResult {
  const s = acc.sums;
  const rowsLeftOut = acc.leftOutCounts();
  const rowsUsed = acc.usedByCode.reduce((a, b) => a + b, 0);
  if (rowsUsed === 0 || !(s.s1 > 0)) {
    const why = Object.entries(rowsLeftOut).map(([k, v]) => `${v} ${k}`).join(', ');
    throw new InputError(`fit: none of the ${acc.rows} rows can be used (${why || 'no rows'}); the observed outputs need values in rows whose status counts`);
  }
  const rows = acc.rowArrays();
  const weights = new Float64Array(acc.rows);
  const inv = 1 / s.s1;
  for (let r = 0; r < acc.rows; r++) {
    const l = rows.ll[r];
    weights[r] = l === l ? Math.exp(l - s.maxLl) * inv : NaN;
  }
  const { prior, posterior, range99 } = inputSummaries(s);
  const observations = acc.setup.observations.map((o, k) => ({ ...o, totalSd: acc.obsTotalSd[k] }));
  const predict: Record<string, FitSummary> = {};
  const predictive: FitHistogram[] = [];
  for (const name of acc.stored) {
    const obs = observations.find((o) => o.output === name);
    const p = predictiveOf(name, rows.outputs[name], weights, obs);
    predict[name] = p.summary;
    predictive.push(p.plot);
  }
  const best: FitBestRow = {
    row: acc.bestRow,
    id: rows.ids[acc.bestRow],
    logLikelihood: acc.bestLl,
    inputs: acc.bestInputs,
    outputs: acc.bestOutputs,
    z: Object.fromEntries(observations.map((o) => [o.output, (acc.bestOutputs[o.output] - o.value) / o.totalSd])),
  };
  const usedByStatus: Record<string, number> = {};
  acc.statuses.forEach((st, code) => {
    if (acc.usedByCode[code] > 0) usedByStatus[st] = acc.usedByCode[code];
  });
  const ess = (s.s1 * s.s1) / s.s2;
  const marginals = marginalsOf(s);
  const warnings: FitWarning[] = fitWarnings({ ess, rowsUsed, within3Sd: acc.within3Sd, best, observations, sums: s, axes: acc.setup.prior.axes });
  return {
    rows: acc.rows,
    rowsUsed,
    usedByStatus,
    rowsLeftOut,
    ess,
    rowsWithin3Sd: acc.within3Sd,
    observations,
    priorText: describePrior(acc.setup.prior, acc.setup.units),
    prior,
    posterior,
    range99,
    predict,
    best,
    warnings,
    marginals,
    pairs: pairsOf(s),
    predictive,
    weights,
    logLikelihood: rows.ll,
    ids: rows.ids,
  };
}
