/**
 * Local derivatives of an output on grid neighbours, summarised as percentiles over the grid.
 *
 * The derivative at a point is the derivative of the quadratic through three neighbouring points
 * along the axis (Lagrange interpolation; exact for quadratics, second order on uneven spacing):
 * - central: the neighbours below and above (in value order);
 * - with edges = 'one-sided' (default), where a central stencil is not available (an axis end, or
 *   a neighbour that is not usable): the two next points above, else the two below (second order),
 *   else the single usable neighbour (two-point difference, first order);
 * - with edges = 'skip': only central stencils; other points get no derivative.
 * Points whose own row is not usable get no derivative, and a stencil never uses an unusable row.
 *
 * Elasticity at a point: (dy/dx) x / y = d ln y / d ln x, taken only where x > 0 and y > 0
 * (other points are counted and left out of the elasticity percentiles).
 */
import { percentilesInPlace } from './stats.js';
import type { EdgeRule } from './types.js';
import { axisLayout, type GridGeometry } from './grid-variance.js';

/**
 * Derivative where the central stencil is not available: two points above, else two below
 * (second order), else one usable neighbour (first order); NaN when none is usable.
 */
function edgeDerivative(
  y: Float64Array,
  usable: Uint8Array,
  base: number,
  j: number,
  q: number,
  y0: number,
  offM1: Int32Array,
  offM2: Int32Array,
  offP1: Int32Array,
  offP2: Int32Array,
  wf: Float64Array,
  wb: Float64Array,
  xs: Float64Array,
): number {
  const pP1 = offP1[q] >= 0 ? base + offP1[q] + j : -1;
  const pP2 = offP2[q] >= 0 ? base + offP2[q] + j : -1;
  const pM1 = offM1[q] >= 0 ? base + offM1[q] + j : -1;
  const pM2 = offM2[q] >= 0 ? base + offM2[q] + j : -1;
  const okP1 = pP1 >= 0 && usable[pP1] !== 0;
  const okM1 = pM1 >= 0 && usable[pM1] !== 0;
  if (okP1 && pP2 >= 0 && usable[pP2] !== 0) return wf[3 * q] * y0 + wf[3 * q + 1] * y[pP1] + wf[3 * q + 2] * y[pP2];
  if (okM1 && pM2 >= 0 && usable[pM2] !== 0) return wb[3 * q] * y0 + wb[3 * q + 1] * y[pM1] + wb[3 * q + 2] * y[pM2];
  if (okP1) return (y[pP1] - y0) / (xs[q + 1] - xs[q]);
  if (okM1) return (y0 - y[pM1]) / (xs[q] - xs[q - 1]);
  return NaN;
}

const LOCAL_PERCENTILES = [0.1, 0.5, 0.9] as const;

export interface LocalDerivativeStats {
  /** 10th, 50th, 90th percentile of dy/dx over points with a derivative (NaN when none) */
  readonly slope: readonly number[];
  readonly slopeCount: number;
  /** 10th, 50th, 90th percentile of d ln y / d ln x over points with x > 0 and y > 0 */
  readonly elasticity: readonly number[];
  readonly elasticityCount: number;
  /** points with a derivative but x <= 0 or y <= 0 */
  readonly nonPositive: number;
  /** usable points without a stencil */
  readonly noStencil: number;
}

/** Derivative weights at node x0 of the quadratic through (x0, x1, x2), written into w at 3q. */
function weights3(w: Float64Array, q: number, x0: number, x1: number, x2: number): void {
  w[3 * q] = 1 / (x0 - x1) + 1 / (x0 - x2);
  w[3 * q + 1] = (x0 - x2) / ((x1 - x0) * (x1 - x2));
  w[3 * q + 2] = (x0 - x1) / ((x2 - x0) * (x2 - x1));
}

/**
 * Derivative percentiles of y along one axis. `slopeBuf` and `elasticityBuf` are scratch arrays
 * of length >= geom.n; they are overwritten.
 */
export function gridLocalDerivatives(
  y: Float64Array,
  usable: Uint8Array,
  geom: GridGeometry,
  axis: number,
  edges: EdgeRule,
  slopeBuf: Float64Array,
  elasticityBuf: Float64Array,
): LocalDerivativeStats {
  const { size, stride, block, outer } = axisLayout(geom, axis);
  const values = geom.values[axis];
  // positions along the axis in ascending value order, and per rank q: the row offsets (within a
  // block) of the point and its neighbours in value order (-1 = none) and the stencil weights
  const order = Array.from({ length: size }, (_, t) => t).sort((a, b) => values[a] - values[b]);
  const xs = Float64Array.from(order, (t) => values[t]);
  const rel = (q: number): number => (q >= 0 && q < size ? order[q] * stride : -1);
  const off0 = Int32Array.from(order, (_, q) => rel(q));
  const offM1 = Int32Array.from(order, (_, q) => rel(q - 1));
  const offM2 = Int32Array.from(order, (_, q) => rel(q - 2));
  const offP1 = Int32Array.from(order, (_, q) => rel(q + 1));
  const offP2 = Int32Array.from(order, (_, q) => rel(q + 2));
  const wc = new Float64Array(3 * size);
  const wf = new Float64Array(3 * size);
  const wb = new Float64Array(3 * size);
  for (let q = 0; q < size; q++) {
    if (q >= 1 && q + 1 < size) weights3(wc, q, xs[q], xs[q - 1], xs[q + 1]);
    if (q + 2 < size) weights3(wf, q, xs[q], xs[q + 1], xs[q + 2]);
    if (q >= 2) weights3(wb, q, xs[q], xs[q - 1], xs[q - 2]);
  }
  const oneSided = edges === 'one-sided';
  let nSlope = 0;
  let nElast = 0;
  let nonPositive = 0;
  let noStencil = 0;
  for (let o = 0; o < outer; o++) {
    const base = o * block;
    for (let q = 0; q < size; q++) {
      const x = xs[q];
      const xPositive = x > 0;
      const p0 = base + off0[q];
      const hasM1 = offM1[q] >= 0;
      const hasP1 = offP1[q] >= 0;
      const hasCentral = hasM1 && hasP1;
      const pM1 = base + offM1[q];
      const pP1 = base + offP1[q];
      const c0 = wc[3 * q];
      const cM = wc[3 * q + 1];
      const cP = wc[3 * q + 2];
      for (let j = 0; j < stride; j++) {
        const p = p0 + j;
        if (usable[p] === 0) continue;
        const y0 = y[p];
        let d: number;
        if (hasCentral && usable[pM1 + j] !== 0 && usable[pP1 + j] !== 0) {
          d = c0 * y0 + cM * y[pM1 + j] + cP * y[pP1 + j];
        } else {
          d = oneSided ? edgeDerivative(y, usable, base, j, q, y0, offM1, offM2, offP1, offP2, wf, wb, xs) : NaN;
          if (Number.isNaN(d)) {
            noStencil++;
            continue;
          }
        }
        slopeBuf[nSlope++] = d;
        if (xPositive && y0 > 0) elasticityBuf[nElast++] = (d * x) / y0;
        else nonPositive++;
      }
    }
  }
  return {
    slope: percentilesInPlace(slopeBuf, nSlope, LOCAL_PERCENTILES),
    slopeCount: nSlope,
    elasticity: percentilesInPlace(elasticityBuf, nElast, LOCAL_PERCENTILES),
    elasticityCount: nElast,
    nonPositive,
    noStencil,
  };
}
