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
import type { GridGeometry } from './grid-variance.js';

export const LOCAL_PERCENTILES = [0.1, 0.5, 0.9] as const;

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

/** Derivative weights at node x0 of the quadratic through (x0, x1, x2). */
function weights3(x0: number, x1: number, x2: number): [number, number, number] {
  return [1 / (x0 - x1) + 1 / (x0 - x2), (x0 - x2) / ((x1 - x0) * (x1 - x2)), (x0 - x1) / ((x2 - x0) * (x2 - x1))];
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
  const size = geom.sizes[axis];
  const stride = geom.strides[axis];
  const values = geom.values[axis];
  const block = size * stride;
  const outer = geom.n / block;
  // positions along the axis in ascending value order
  const order = Array.from({ length: size }, (_, t) => t).sort((a, b) => values[a] - values[b]);
  const xs = order.map((t) => values[t]);
  const central = xs.map((x, q) => (q >= 1 && q + 1 < size ? weights3(x, xs[q - 1], xs[q + 1]) : null));
  const forward3 = xs.map((x, q) => (q + 2 < size ? weights3(x, xs[q + 1], xs[q + 2]) : null));
  const backward3 = xs.map((x, q) => (q >= 2 ? weights3(x, xs[q - 1], xs[q - 2]) : null));
  const oneSided = edges === 'one-sided';
  let nSlope = 0;
  let nElast = 0;
  let nonPositive = 0;
  let noStencil = 0;
  for (let o = 0; o < outer; o++) {
    const base = o * block;
    for (let q = 0; q < size; q++) {
      const x = xs[q];
      const off = base + order[q] * stride;
      // row offsets of the neighbours in value order (-1 = none)
      const offM1 = q >= 1 ? base + order[q - 1] * stride : -1;
      const offM2 = q >= 2 ? base + order[q - 2] * stride : -1;
      const offP1 = q + 1 < size ? base + order[q + 1] * stride : -1;
      const offP2 = q + 2 < size ? base + order[q + 2] * stride : -1;
      const wc = central[q];
      const wf = forward3[q];
      const wb = backward3[q];
      const hP = offP1 >= 0 ? xs[q + 1] - x : 0;
      const hM = offM1 >= 0 ? x - xs[q - 1] : 0;
      for (let j = 0; j < stride; j++) {
        const p = off + j;
        if (usable[p] === 0) continue;
        const y0 = y[p];
        const okM1 = offM1 >= 0 && usable[offM1 + j] !== 0;
        const okP1 = offP1 >= 0 && usable[offP1 + j] !== 0;
        let d: number;
        if (wc !== null && okM1 && okP1) {
          d = wc[0] * y0 + wc[1] * y[offM1 + j] + wc[2] * y[offP1 + j];
        } else if (!oneSided) {
          noStencil++;
          continue;
        } else if (wf !== null && okP1 && usable[offP2 + j] !== 0) {
          d = wf[0] * y0 + wf[1] * y[offP1 + j] + wf[2] * y[offP2 + j];
        } else if (wb !== null && okM1 && usable[offM2 + j] !== 0) {
          d = wb[0] * y0 + wb[1] * y[offM1 + j] + wb[2] * y[offM2 + j];
        } else if (okP1) {
          d = (y[offP1 + j] - y0) / hP;
        } else if (okM1) {
          d = (y0 - y[offM1 + j]) / hM;
        } else {
          noStencil++;
          continue;
        }
        slopeBuf[nSlope++] = d;
        if (x > 0 && y0 > 0) elasticityBuf[nElast++] = (d * x) / y0;
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
