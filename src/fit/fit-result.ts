/**
 * From the accumulated sums to the fit's answer: normalised weights, effective sample size,
 * summaries (mean, sd, quantiles by the convention of cells.ts), the pictures' mass functions and
 * the warnings with the next step to take.
 */
import { InputError } from '../errors.js';
import type { FitAccumulator } from './accumulate.js';
import type { FitSums } from './weighted-sums.js';
import { cellQuantile, fromT } from './cells.js';
import { describePrior } from './prior.js';
import type { FitBestRow, FitHistogram, FitPairDensity, FitResult, FitSummary, FitWarning } from './types.js';
import { fitWarnings } from './warnings.js';

/** Quantile levels of every summary. */
export const SUMMARY_LEVELS = { p2_5: 0.025, p16: 0.16, p50: 0.5, p84: 0.84, p97_5: 0.975 } as const;

/** Display cells of each input's prior-vs-posterior picture. */
const MARGINAL_CELLS = 64;

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

/** Normalised weights exp(ll - logNormaliser), NaN where ll is NaN (left out). */
export function weightsOf(ll: Float64Array, logNormaliser: number, out = new Float64Array(ll.length)): Float64Array {
  for (let r = 0; r < ll.length; r++) {
    const l = ll[r];
    out[r] = l === l ? Math.exp(l - logNormaliser) : NaN;
  }
  return out;
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
  const logNormaliser = s.maxLl + Math.log(s.s1);
  const { prior, posterior, range99 } = inputSummaries(s);
  const observations = acc.setup.observations.map((o, k) => ({ ...o, totalSd: acc.obsTotalSd[k] }));
  const predict: Record<string, FitSummary> = {};
  const predictive: FitHistogram[] = [];
  for (const p of acc.predictive) {
    predict[p.name] = p.summary();
    predictive.push(p.plot(observations.find((o) => o.output === p.name)));
  }
  const best: FitBestRow = {
    row: acc.bestRow,
    id: rows.ids === null ? acc.firstId + acc.bestRow : rows.ids[acc.bestRow],
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
  let weights: Float64Array | undefined;
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
    get weights(): Float64Array {
      weights ??= weightsOf(rows.ll, logNormaliser);
      return weights;
    },
    logNormaliser,
    logLikelihood: rows.ll,
    ids: rows.ids,
    firstId: acc.firstId,
  };
}
