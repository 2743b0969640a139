/**
 * Main-effect curves: the conditional mean of an output along one input, for plotting.
 * - grids: one point per axis value, the mean over every other axis of the usable rows;
 * - other designs: equal-count quantile bins of x (see quantileBins), x = mean x in the bin.
 */
import type { QuantileBins } from './binned-first-order.js';
import type { MainEffectCurve } from './types.js';

/** Curve of a grid axis from its slab means, in ascending x. */
export function gridMainEffect(output: string, input: string, values: Float64Array, slabMean: Float64Array, slabCount: Float64Array): MainEffectCurve {
  const order = Array.from({ length: values.length }, (_, t) => t).sort((a, b) => values[a] - values[b]);
  return {
    output,
    input,
    binned: false,
    x: order.map((t) => values[t]),
    mean: order.map((t) => slabMean[t]),
    count: order.map((t) => slabCount[t]),
  };
}

/** Curve of a sampled design from quantile bins. */
export function binnedMainEffect(output: string, input: string, bins: QuantileBins): MainEffectCurve {
  return {
    output,
    input,
    binned: true,
    x: Array.from(bins.meanX),
    mean: Array.from(bins.meanY),
    count: Array.from(bins.count),
  };
}
