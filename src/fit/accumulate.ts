/**
 * The streaming core of a fit: record batches in, weighted sums out, in one pass and bounded memory
 * (per row only the log-likelihood, the id and the observed and predicted outputs are kept).
 *
 * Weights are handled in log space: every sum is held relative to the largest log-likelihood M
 * seen so far (w = exp(ll - M) <= 1), and when a batch raises M the sums are rescaled once by
 * exp(M_old - M_new). Nothing underflows however far the rows lie from the observations
 * (log-sum-exp), and the normalised weights are exp(ll - M) / sum exp(ll - M).
 */
import { InputError } from '../errors.js';
import { PredictiveAccumulator } from './predictive.js';
import type { FitBatch, FitSetup } from './types.js';
import { accumulatePosterior, accumulatePrior, createSums, logLikelihoods, rescale, type FitSums } from './weighted-sums.js';

/** Statuses left out by default: their outputs were not computed. */
export const DEFAULT_LEAVE_OUT: readonly string[] = ['failed', 'onset_beyond_range'];

const LOG_2PI = Math.log(2 * Math.PI);

/** Per-row arrays, grown by doubling. */
interface RowStore {
  ll: Float64Array;
  /** null while the ids are firstId, firstId + 1, ... (the usual case: no per-row storage) */
  ids: Float64Array | null;
}

/**
 * Accumulates a fit over batches. Call add() for every batch in row order, then finish()
 * (see fit-result.ts) to get weights and summaries.
 */
export class FitAccumulator {
  readonly setup: FitSetup;
  readonly obsNames: readonly string[];
  readonly obsValue: Float64Array;
  readonly obsInvVar: Float64Array;
  readonly obsTotalSd: Float64Array;
  /** log-likelihood constant: -sum ln sd_k - K/2 ln 2 pi */
  readonly llConstant: number;
  readonly statuses: readonly string[];
  /** 1 for status codes that are left out */
  private readonly leave: Uint8Array;
  /** outputs whose predictive is accumulated (observed first, then predicted) */
  readonly stored: readonly string[];
  /** the predictive of each stored output */
  readonly predictive: readonly PredictiveAccumulator[];
  readonly sums: FitSums;
  /** left-out counts: [code] for left-out statuses, [statuses + code * K + k] for a null output */
  private readonly leftOut: Float64Array;
  readonly usedByCode: Float64Array;
  rows = 0;
  within3Sd = 0;
  bestLl = -Infinity;
  bestRow = -1;
  bestInputs: Record<string, number> = {};
  bestOutputs: Record<string, number> = {};
  private store: RowStore;
  private scratchIdx: Int32Array[] = [];
  /** the weights of the current batch's rows */
  private weights = new Float64Array(0);

  constructor(setup: FitSetup) {
    if (setup.observations.length === 0) throw new InputError('fit: no observation given; observe at least one output, e.g. crust_km=7.1+-0.8');
    if (setup.prior.axes.length === 0) throw new InputError('fit: the sweep swept no input; a posterior needs at least one swept input');
    this.setup = setup;
    const obs = setup.observations;
    this.obsNames = obs.map((o) => o.output);
    this.obsValue = Float64Array.from(obs.map((o) => o.value));
    this.obsTotalSd = Float64Array.from(obs.map((o) => Math.hypot(o.sd, o.discrepancySd ?? 0)));
    this.obsInvVar = this.obsTotalSd.map((s) => 1 / (s * s));
    let c = -0.5 * obs.length * LOG_2PI;
    for (const s of this.obsTotalSd) c -= Math.log(s);
    this.llConstant = c;
    this.statuses = setup.statuses ?? ['ok'];
    if (this.statuses.length > 255) throw new InputError(`fit: at most 255 statuses, got ${this.statuses.length}`);
    const leaveOut = new Set(setup.leaveOut ?? DEFAULT_LEAVE_OUT);
    this.leave = Uint8Array.from(this.statuses.map((s) => (leaveOut.has(s) ? 1 : 0)));
    this.stored = [...new Set([...this.obsNames, ...(setup.predict ?? [])])];
    this.leftOut = new Float64Array(this.statuses.length * (1 + obs.length));
    this.usedByCode = new Float64Array(this.statuses.length);
    this.sums = createSums(setup);
    this.predictive = this.stored.map((n) => new PredictiveAccumulator(n));
    this.store = { ll: new Float64Array(0), ids: null };
    this.grow(Math.max(1024, setup.expectedRows ?? 0));
  }

  private grow(need: number): void {
    const cap = this.store.ll.length;
    if (need <= cap) return;
    const size = Math.max(need, cap * 2);
    const extend = (a: Float64Array): Float64Array => {
      const b = new Float64Array(size);
      b.set(a.subarray(0, this.rows));
      return b;
    };
    this.store = {
      ll: extend(this.store.ll),
      ids: this.store.ids === null ? null : extend(this.store.ids),
    };
  }

  /**
   * Add the next batch of rows.
   * @returns the row (within this batch) of a new best-fitting row, or -1 when the best is unchanged
   * @throws InputError when a column the fit needs is missing or short
   */
  add(batch: FitBatch): number {
    const n = batch.rows;
    const outs = this.obsNames.map((name) => columnOf(batch.outputs, name, n, 'output'));
    const ins = this.sums.names.map((name) => columnOf(batch.inputs, name, n, 'input'));
    const kept = this.stored.map((name) => columnOf(batch.outputs, name, n, 'output'));
    const status = batch.status;
    if (status !== undefined && status.length < n) throw new InputError(`fit: the status codes hold ${status.length} rows, the batch ${n}`);
    this.grow(this.rows + n);
    const pos = this.rows;
    const ll = this.store.ll;
    const values = this.obsValue;
    const inv = this.obsInvVar;
    const leave = this.leave;
    const nStatus = this.statuses.length;

    // pass 1: the log-likelihood of every row (NaN = left out, counted by reason)
    for (let r = 0; r < n; r++) {
      const code = status === undefined ? 0 : status[r];
      if (code >= nStatus) throw new InputError(`fit: status code ${code} at row ${pos + r} is not one of the ${nStatus} statuses`);
    }
    const pass = logLikelihoods(outs, values, inv, this.llConstant, status, leave, n, ll, pos, this.leftOut, this.usedByCode, nStatus);
    const batchMax = pass.max;
    const within = pass.within;
    this.within3Sd += within;

    const s = this.sums;
    if (batchMax > s.maxLl) {
      if (s.maxLl > -Infinity) {
        const f = Math.exp(s.maxLl - batchMax);
        rescale(s, f);
        for (const p of this.predictive) p.rescale(f);
      }
      s.maxLl = batchMax;
    }
    let newBest = -1;
    if (batchMax > this.bestLl) {
      for (let r = 0; r < n; r++) {
        if (ll[pos + r] === batchMax) {
          newBest = r;
          break;
        }
      }
      this.bestLl = batchMax;
      this.bestRow = pos + newBest;
      this.bestInputs = Object.fromEntries(this.sums.names.map((name, a) => [name, ins[a][newBest]]));
      this.bestOutputs = Object.fromEntries(this.stored.map((name, k) => [name, kept[k][newBest]]));
    }

    // pass 2: cells of every input, then the weighted sums
    const idx = this.cellIndices(ins, n);
    accumulatePrior(s, ins, idx, n);
    if (this.weights.length < n) this.weights = new Float64Array(n);
    accumulatePosterior(s, ins, idx, ll, pos, n, this.weights);

    const batchLl = ll.subarray(pos, pos + n);
    for (let k = 0; k < this.stored.length; k++) this.predictive[k].add(kept[k], this.weights, batchLl, n);
    this.keepIds(batch.ids, pos, n);
    this.rows += n;
    return newBest;
  }

  private cellIndices(ins: readonly Float64Array[], n: number): Int32Array[] {
    if (this.scratchIdx.length === 0 || this.scratchIdx[0].length < n) {
      this.scratchIdx = ins.map(() => new Int32Array(Math.max(n, 4096)));
    }
    ins.forEach((x, a) => this.sums.cells[a].indexAll(x, n, this.scratchIdx[a]));
    return this.scratchIdx;
  }

  /** id of the first row; row p has id firstId + p while the ids are contiguous */
  firstId = 0;

  /** Keep the ids of rows [pos, pos + n): nothing while they continue firstId + p, else per row. */
  private keepIds(ids: Float64Array | undefined, pos: number, n: number): void {
    if (ids !== undefined && ids.length < n) throw new InputError(`fit: the ids hold ${ids.length} rows, the batch ${n}`);
    if (this.store.ids === null) {
      if (ids === undefined) return;
      if (pos === 0 && n > 0) this.firstId = ids[0];
      const base = this.firstId + pos;
      let r = 0;
      while (r < n && ids[r] === base + r) r++;
      if (r === n) return;
      const all = new Float64Array(this.store.ll.length);
      for (let p = 0; p < pos; p++) all[p] = this.firstId + p;
      this.store.ids = all;
    }
    if (ids !== undefined) this.store.ids.set(ids.subarray(0, n), pos);
    else for (let r = 0; r < n; r++) this.store.ids[pos + r] = this.firstId + pos + r;
  }

  /** Left-out rows by reason: a status, or "<status>: <output> is null". */
  leftOutCounts(): Record<string, number> {
    const out: Record<string, number> = {};
    const K = this.obsNames.length;
    this.statuses.forEach((s, code) => {
      if (this.leftOut[code] > 0) out[s] = this.leftOut[code];
      for (let k = 0; k < K; k++) {
        const c = this.leftOut[this.statuses.length + code * K + k];
        if (c > 0) out[`${s}: ${this.obsNames[k]} is null`] = c;
      }
    });
    return out;
  }

  /** The per-row arrays, trimmed to the rows seen (views, not copies). */
  rowArrays(): { readonly ll: Float64Array; readonly ids: Float64Array | null } {
    const n = this.rows;
    return {
      ll: this.store.ll.subarray(0, n),
      ids: this.store.ids === null ? null : this.store.ids.subarray(0, n),
    };
  }
}

function columnOf(cols: Readonly<Record<string, Float64Array>>, name: string, n: number, what: string): Float64Array {
  const c = cols[name];
  if (c === undefined) throw new InputError(`fit: the batch has no ${what} column "${name}" (${what}s given: ${Object.keys(cols).join(', ') || 'none'})`);
  if (c.length < n) throw new InputError(`fit: ${what} column "${name}" holds ${c.length} rows, the batch ${n}`);
  return c;
}

