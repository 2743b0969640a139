/**
 * The prior and posterior predictive of one output, accumulated while streaming (nothing per row).
 *
 * Values fall into PREDICTIVE_CELLS equal cells over a range that starts as the first batch's
 * span and doubles (merging neighbouring cells in pairs) whenever a value falls outside it, so the
 * cells always cover every value at a width of at most twice the output's full span / cells.
 * Posterior weights are held relative to the fit's running maximum log-likelihood and rescaled
 * with it; prior counts are plain row counts.
 */
import { cellQuantile, equalCells } from './cells.js';
import type { FitHistogram, FitSummary } from './types.js';

/** Cells of a predictive histogram (quantiles interpolate within them). */
export const PREDICTIVE_CELLS = 8192;

/** Cells of the predictive pictures. */
export const PREDICT_PLOT_CELLS = 48;

export class PredictiveAccumulator {
  readonly name: string;
  /** posterior weight per cell (relative to the running maximum) */
  private readonly mass = new Float64Array(PREDICTIVE_CELLS);
  /** rows per cell (every used row with a value) */
  private readonly count = new Float64Array(PREDICTIVE_CELLS);
  private lo = NaN;
  private width = NaN;
  /** weighted sums of (y - shift) and (y - shift)^2, and of the weights */
  private s1 = 0;
  private m1 = 0;
  private m2 = 0;
  private shift = NaN;
  private priorLo = Infinity;
  private priorHi = -Infinity;
  rows = 0;

  constructor(name: string) {
    this.name = name;
  }

  /** Multiply the weighted sums by f (the running maximum rose). */
  rescale(f: number): void {
    for (let i = 0; i < PREDICTIVE_CELLS; i++) this.mass[i] *= f;
    this.s1 *= f;
    this.m1 *= f;
    this.m2 *= f;
  }

  /** Double the range until it holds [a, b], merging cells in pairs. */
  private cover(a: number, b: number): void {
    if (this.lo !== this.lo) {
      const span = b > a ? b - a : Math.max(Math.abs(a) * 1e-6, 1e-12);
      this.width = (span * (1 + 1e-9)) / PREDICTIVE_CELLS;
      this.lo = b > a ? a : a - span / 2;
    }
    const half = PREDICTIVE_CELLS / 2;
    while (a < this.lo || b >= this.lo + this.width * PREDICTIVE_CELLS) {
      // grow towards the side that needs it; the old cells become the other half, merged in pairs
      const down = a < this.lo;
      for (const arr of [this.mass, this.count]) {
        const merged = new Float64Array(half);
        for (let i = 0; i < PREDICTIVE_CELLS; i++) merged[i >> 1] += arr[i];
        arr.fill(0);
        arr.set(merged, down ? half : 0);
      }
      if (down) this.lo -= this.width * PREDICTIVE_CELLS;
      this.width *= 2;
    }
  }

  /**
   * Add rows [0, n): value y[r] with weight w[r]; rows whose log-likelihood ll[r] is NaN (left
   * out) and rows whose value is null are skipped.
   */
  add(y: Float64Array, w: Float64Array, ll: Float64Array, n: number): void {
    let a = Infinity;
    let b = -Infinity;
    for (let r = 0; r < n; r++) {
      const v = y[r];
      if (ll[r] !== ll[r] || v !== v) continue;
      if (v < a) a = v;
      if (v > b) b = v;
    }
    if (!(a <= b)) return;
    if (a < this.priorLo) this.priorLo = a;
    if (b > this.priorHi) this.priorHi = b;
    this.cover(a, b);
    if (this.shift !== this.shift) this.shift = a;
    const lo = this.lo;
    const inv = 1 / this.width;
    const last = PREDICTIVE_CELLS - 1;
    const shift = this.shift;
    const mass = this.mass;
    const count = this.count;
    let s1 = 0;
    let m1 = 0;
    let m2 = 0;
    let rows = 0;
    for (let r = 0; r < n; r++) {
      const v = y[r];
      if (ll[r] !== ll[r] || v !== v) continue;
      let i = Math.floor((v - lo) * inv);
      i = i < 0 ? 0 : i > last ? last : i;
      const wr = w[r];
      count[i] += 1;
      mass[i] += wr;
      const d = v - shift;
      s1 += wr;
      m1 += wr * d;
      m2 += wr * d * d;
      rows++;
    }
    this.s1 += s1;
    this.m1 += m1;
    this.m2 += m2;
    this.rows += rows;
  }

  /** Posterior predictive summary (NaN when no used row has a value). */
  summary(): FitSummary {
    const edges = this.edges();
    const mean = this.m1 / this.s1;
    const q = (p: number): number => cellQuantile(this.mass, this.s1, edges, false, p);
    return { mean: this.shift + mean, sd: Math.sqrt(Math.max(0, this.m2 / this.s1 - mean * mean)), p2_5: q(0.025), p16: q(0.16), p50: q(0.5), p84: q(0.84), p97_5: q(0.975) };
  }

  private edges(): Float64Array {
    return Float64Array.from({ length: PREDICTIVE_CELLS + 1 }, (_, i) => this.lo + i * this.width);
  }

  /**
   * Prior and posterior predictive on PREDICT_PLOT_CELLS cells spanning every value and, for an
   * observed output, the observation +- 2 sd (fine cells are shared out by overlap).
   */
  plot(obs: { readonly value: number; readonly totalSd: number } | undefined): FitHistogram {
    let a = this.priorLo;
    let b = this.priorHi;
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
    const pw = (b - a) / PREDICT_PLOT_CELLS;
    for (let i = 0; i < PREDICTIVE_CELLS; i++) {
      if (this.count[i] === 0) continue;
      const x0 = this.lo + i * this.width;
      const x1 = x0 + this.width;
      // share the cell out over the plot cells it overlaps
      const j0 = Math.max(0, Math.floor((x0 - a) / pw));
      const j1 = Math.min(PREDICT_PLOT_CELLS - 1, Math.floor((x1 - a) / pw));
      for (let j = j0; j <= j1; j++) {
        const overlap = Math.min(x1, a + (j + 1) * pw) - Math.max(x0, a + j * pw);
        const share = j0 === j1 ? 1 : Math.max(0, overlap) / this.width;
        prior[j] += (share * this.count[i]) / this.rows;
        posterior[j] += (share * this.mass[i]) / this.s1;
      }
    }
    return { name: this.name, edges: cells.edgesT, prior, posterior };
  }
}
