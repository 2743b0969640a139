/**
 * Exact variance-based (Sobol) indices on a full grid, treating the grid as the uniform discrete
 * distribution over its points (Sobol 1993, Math. Model. Comput. Exp. 1; Sobol 2001, Math. Comput.
 * Simul. 55):
 *   S_i  = Var(E[y | x_i]) / Var(y)          (first order)
 *   S_Ti = E[Var(y | x_~i)] / Var(y)         (total effect)
 * E[y | x_i] is the mean over the slab x_i = v (every other axis free); Var(y | x_~i) is the variance
 * along a line where every axis but i is fixed.
 *
 * Rows that are not usable (left out, or null output) are dropped and the usable ones are used in
 * each group, by the law of total variance over the usable rows:
 *   S_i  = sum_v c_v (mean_v - mean)^2 / SS_total    (slabs weighted by their usable counts c_v),
 *   S_Ti = (pooled within-line sum of squares / rows in those lines) / (SS_total / usable rows),
 * the pooling taken over lines with at least 2 usable points (a line with one point carries no
 * information on variation along x_i and is skipped). On a complete grid both reduce to the exact
 * formulas above. On an incomplete grid they describe the usable rows, not the full design.
 */

/** Shape of a grid: axis sizes, strides (row step of one axis step) and values. */
export interface GridGeometry {
  readonly n: number;
  readonly sizes: readonly number[];
  readonly strides: readonly number[];
  readonly values: readonly Float64Array[];
}

export function gridGeometry(axes: readonly { readonly values: readonly number[] }[]): GridGeometry {
  const sizes = axes.map((a) => a.values.length);
  const n = sizes.reduce((p, s) => p * s, 1);
  const strides: number[] = [];
  let stride = n;
  for (const s of sizes) {
    stride /= s;
    strides.push(stride);
  }
  return { n, sizes, strides, values: axes.map((a) => Float64Array.from(a.values)) };
}

/**
 * How the rows run along one axis: row = o x block + t x stride + j for o < outer (the axes before
 * it), t < size (its values) and j < stride (the axes after it).
 */
export function axisLayout(geom: GridGeometry, axis: number): { size: number; stride: number; block: number; outer: number } {
  const size = geom.sizes[axis];
  const stride = geom.strides[axis];
  return { size, stride, block: size * stride, outer: geom.n / (size * stride) };
}

export interface GridAxisVariance {
  /** mean of the usable rows on each slab x_i = values[t] (NaN when empty), in axis value order */
  readonly slabMean: Float64Array;
  readonly slabCount: Float64Array;
  /** null when Var(y) is zero */
  readonly s1: number | null;
  /** null when Var(y) is zero or no line has 2 usable points */
  readonly st: number | null;
  /** usable rows in lines with >= 2 usable points (the rows behind S_T) */
  readonly stRows: number;
  readonly linesUsed: number;
  /** lines with exactly one usable point */
  readonly linesSkipped: number;
  /** lines with no usable point */
  readonly linesEmpty: number;
}

/** Scratch buffers reused across axes and outputs (sized to the largest stride). */
export interface GridScratch {
  lineMean: Float64Array;
  lineCount: Float64Array;
}

export function createGridScratch(geom: GridGeometry): GridScratch {
  const m = Math.max(...geom.strides);
  return { lineMean: new Float64Array(m), lineCount: new Float64Array(m) };
}

/**
 * First-order and total indices of one axis in two passes over the rows, walking the grid one
 * outer block at a time so that memory access stays contiguous.
 * @param mean mean of y over the usable rows
 * @param ssTotal sum of squared deviations of y over the usable rows
 * @param used number of usable rows
 */
export function gridAxisVariance(
  y: Float64Array,
  usable: Uint8Array,
  geom: GridGeometry,
  axis: number,
  mean: number,
  ssTotal: number,
  used: number,
  scratch: GridScratch,
  constant: boolean,
): GridAxisVariance {
  const { size, stride, block, outer } = axisLayout(geom, axis);
  const slabSum = new Float64Array(size);
  const slabCount = new Float64Array(size);
  const { lineMean, lineCount } = scratch;
  let within = 0;
  let stRows = 0;
  let linesUsed = 0;
  let linesSkipped = 0;
  let linesEmpty = 0;
  for (let o = 0; o < outer; o++) {
    const base = o * block;
    lineMean.fill(0, 0, stride);
    lineCount.fill(0, 0, stride);
    for (let t = 0; t < size; t++) {
      const off = base + t * stride;
      let s = 0;
      let c = 0;
      for (let j = 0; j < stride; j++) {
        const p = off + j;
        if (usable[p] !== 0) {
          const v = y[p];
          lineMean[j] += v;
          lineCount[j] += 1;
          s += v;
          c += 1;
        }
      }
      slabSum[t] += s;
      slabCount[t] += c;
    }
    for (let j = 0; j < stride; j++) {
      const c = lineCount[j];
      if (c > 0) lineMean[j] /= c;
      if (c >= 2) {
        linesUsed++;
        stRows += c;
      } else if (c === 1) linesSkipped++;
      else linesEmpty++;
    }
    for (let t = 0; t < size; t++) {
      const off = base + t * stride;
      for (let j = 0; j < stride; j++) {
        const p = off + j;
        if (usable[p] !== 0 && lineCount[j] >= 2) {
          const d = y[p] - lineMean[j];
          within += d * d;
        }
      }
    }
  }
  const slabMean = new Float64Array(size);
  let between = 0;
  for (let t = 0; t < size; t++) {
    const c = slabCount[t];
    slabMean[t] = c > 0 ? slabSum[t] / c : NaN;
    if (c > 0) {
      const d = slabMean[t] - mean;
      between += c * d * d;
    }
  }
  let s1: number | null = null;
  let st: number | null = null;
  if (!constant && used > 0) {
    s1 = between / ssTotal;
    if (size === 1) st = 0; // a fixed axis cannot vary y
    else if (stRows > 0) st = within / stRows / (ssTotal / used);
  }
  return { slabMean, slabCount, s1, st, stRows, linesUsed, linesSkipped, linesEmpty };
}
