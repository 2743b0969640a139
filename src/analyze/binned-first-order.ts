/**
 * First-order index from independent samples (latin-hypercube, sobol, or the A and B blocks of a
 * saltelli design) by the correlation ratio over equal-count quantile bins of x_i, with the
 * analysis-of-variance bias correction of Kelley (1935, Proc. Natl. Acad. Sci. 21, "An unbiased
 * correlation ratio measure"):
 *   S_i = (SS_between - (B - 1) SS_within / (n - B)) / SS_total
 * SS_between = sum_b n_b (mean_b - mean)^2, SS_within = sum over bins of squared deviations from the
 * bin mean, B = bins with rows. SS_between estimates Var(E[y | x_i]) (Sobol 1993, first-order index,
 * binned) but is inflated by the noise of each bin mean; the subtracted term removes that inflation
 * in expectation. Binning also smooths E[y | x_i] inside each bin, which biases S_i down by
 * O(1/B^2); the default B = round(n^(2/5)) balances that against the O(B/n^2) noise of the
 * correction. The value is not clamped: small negative values mean "no detectable effect".
 * Total-effect indices cannot be estimated from independent samples this way; they need a
 * saltelli design.
 */

/** Default bin count of the first-order estimator for n usable rows. */
export function defaultFirstOrderBins(n: number): number {
  return Math.min(200, Math.max(2, Math.round(Math.pow(n, 0.4))));
}

/**
 * Rows in [start, end) with a finite x and the include flag set, sorted by x (ascending).
 * Computed once per input and reused for every output.
 */
export function rowsSortedByInput(x: Float64Array, include: Uint8Array | undefined, start: number, end: number): Uint32Array {
  let m = 0;
  for (let r = start; r < end; r++) if ((include === undefined || include[r] !== 0) && Number.isFinite(x[r])) m++;
  const rows = new Uint32Array(m);
  let q = 0;
  for (let r = start; r < end; r++) if ((include === undefined || include[r] !== 0) && Number.isFinite(x[r])) rows[q++] = r;
  return rows.sort((a, b) => x[a] - x[b]);
}

/** Per-bin statistics of y over equal-count quantile bins of x. */
export interface QuantileBins {
  /** rows used (usable rows among the sorted candidates) */
  readonly n: number;
  readonly count: Float64Array;
  readonly meanX: Float64Array;
  readonly meanY: Float64Array;
  /** sum of squared deviations of y from its bin mean, per bin */
  readonly ssWithin: Float64Array;
}

/**
 * Split the usable rows among `sorted` (ascending x) into `bins` groups of (near) equal count:
 * the q-th usable row of n goes to bin floor(q B / n). Rows with equal x at a boundary may fall in
 * either bin.
 */
export function quantileBins(x: Float64Array, y: Float64Array, usable: Uint8Array, sorted: Uint32Array, bins: number): QuantileBins {
  let n = 0;
  for (let q = 0; q < sorted.length; q++) if (usable[sorted[q]] !== 0) n++;
  const b = Math.max(1, Math.min(bins, n));
  const count = new Float64Array(b);
  const sumX = new Float64Array(b);
  const sumY = new Float64Array(b);
  let k = 0;
  for (let q = 0; q < sorted.length; q++) {
    const r = sorted[q];
    if (usable[r] === 0) continue;
    const bin = Math.floor((k * b) / n);
    k++;
    count[bin] += 1;
    sumX[bin] += x[r];
    sumY[bin] += y[r];
  }
  const meanX = new Float64Array(b);
  const meanY = new Float64Array(b);
  for (let i = 0; i < b; i++) {
    meanX[i] = count[i] > 0 ? sumX[i] / count[i] : NaN;
    meanY[i] = count[i] > 0 ? sumY[i] / count[i] : NaN;
  }
  const ssWithin = new Float64Array(b);
  k = 0;
  for (let q = 0; q < sorted.length; q++) {
    const r = sorted[q];
    if (usable[r] === 0) continue;
    const bin = Math.floor((k * b) / n);
    k++;
    const d = y[r] - meanY[bin];
    ssWithin[bin] += d * d;
  }
  return { n, count, meanX, meanY, ssWithin };
}

/** Bias-corrected correlation ratio from quantile bins (see the file comment); null when Var(y) = 0 or n <= B. */
export function binnedFirstOrder(bins: QuantileBins): number | null {
  const { n, count, meanY, ssWithin } = bins;
  let sum = 0;
  let nonEmpty = 0;
  for (let i = 0; i < count.length; i++) {
    if (count[i] > 0) {
      sum += count[i] * meanY[i];
      nonEmpty++;
    }
  }
  if (n <= nonEmpty || nonEmpty < 2) return null;
  const mean = sum / n;
  let between = 0;
  let within = 0;
  for (let i = 0; i < count.length; i++) {
    if (count[i] > 0) {
      const d = meanY[i] - mean;
      between += count[i] * d * d;
      within += ssWithin[i];
    }
  }
  const total = between + within;
  if (!(total > 0)) return null;
  return (between - ((nonEmpty - 1) * within) / (n - nonEmpty)) / total;
}
