/**
 * analyzeSensitivity: which inputs matter for each output of a sweep table. Pure: no I/O, no
 * module-level state; deterministic for a given seed.
 */
import { InputError } from '../errors.js';
import { binnedFirstOrder, defaultFirstOrderBins, quantileBins, rowsSortedByInput } from './binned-first-order.js';
import { createGridScratch, gridAxisVariance, gridGeometry, type GridGeometry } from './grid-variance.js';
import { gridLocalDerivatives } from './local-derivatives.js';
import { findAffineCopies } from './copies.js';
import { binnedMainEffect, gridMainEffect } from './main-effects.js';
import { saltelliIndices } from './saltelli-estimators.js';
import type {
  AnalysisLayout,
  MainEffectCurve,
  OutputCounts,
  ResolvedSensitivityOptions,
  SensitivityInput,
  SensitivityMeasure,
  SensitivityOptions,
  SensitivityRecord,
  SensitivityReport,
} from './types.js';
import { checkTable, fillUsable, layoutInputs, leftOutCounts, usableMoments } from './validate.js';

function resolveOptions(o: SensitivityOptions): ResolvedSensitivityOptions {
  const problems: string[] = [];
  const resamples = o.resamples ?? 500;
  const seed = o.seed ?? 1;
  const confidence = o.confidence ?? 0.95;
  const bins = o.bins ?? null;
  const curveBins = o.curveBins ?? 20;
  const edges = o.edges ?? 'one-sided';
  const slopeScale = o.slopeScale ?? 'std';
  if (!Number.isInteger(resamples) || resamples < 0) problems.push(`analyze: resamples must be a whole number >= 0, got ${resamples}.`);
  if (!Number.isInteger(seed)) problems.push(`analyze: seed must be an integer, got ${seed}.`);
  if (!(confidence > 0 && confidence < 1)) problems.push(`analyze: confidence must lie between 0 and 1 (e.g. 0.95), got ${confidence}.`);
  if (bins !== null && (!Number.isInteger(bins) || bins < 2)) problems.push(`analyze: bins must be a whole number >= 2, got ${bins}.`);
  if (!Number.isInteger(curveBins) || curveBins < 1) problems.push(`analyze: curveBins must be a whole number >= 1, got ${curveBins}.`);
  if (edges !== 'one-sided' && edges !== 'skip') problems.push(`analyze: edges must be 'one-sided' or 'skip', got ${String(edges)}.`);
  if (slopeScale !== 'std' && slopeScale !== 'range') problems.push(`analyze: slopeScale must be 'std' or 'range', got ${String(slopeScale)}.`);
  if (problems.length > 0) throw new InputError(problems);
  return { resamples, seed, confidence, bins, curveBins, edges, slopeScale, local: o.local ?? true };
}

/** A variance this small next to the mean is rounding noise of a constant output. */
function isConstant(mean: number, variance: number): boolean {
  return !(variance > Math.max(Number.MIN_VALUE, (Math.abs(mean) * 1e-12) ** 2));
}

function finiteOrNull(v: number | null): number | null {
  return v !== null && Number.isFinite(v) ? v : null;
}

/**
 * Above this fraction of dropped base samples a saltelli analysis warns that its indices are
 * biased (the dropped samples are not a random subset of the input space).
 */
export const SALTELLI_DROP_WARNING_FRACTION = 0.03;

/** Collects records and notes for one analysis. */
class Collector {
  readonly records: SensitivityRecord[] = [];
  readonly curves: MainEffectCurve[] = [];
  readonly warnings: string[] = [];
  readonly dropped = new Map<string, number>();
  private readonly noteSet = new Set<string>();
  private readonly localNoteSet = new Set<string>();

  add(output: string, input: string, measure: SensitivityMeasure, value: number | null, n: number, ci: [number, number] | null = null): void {
    this.records.push({ output, input, measure, value: finiteOrNull(value), ci_low: ci ? ci[0] : null, ci_high: ci ? ci[1] : null, n });
  }

  note(text: string): void {
    this.noteSet.add(text);
  }

  /** a note about the local-derivative measures (elasticities, slopes) only */
  localNote(text: string): void {
    this.localNoteSet.add(text);
  }

  get localNotes(): string[] {
    return [...this.localNoteSet];
  }

  get notes(): string[] {
    return [...this.noteSet];
  }
}

interface OutputContext {
  readonly name: string;
  readonly y: Float64Array;
  readonly usable: Uint8Array;
  readonly used: number;
  readonly mean: number;
  readonly variance: number;
  readonly constant: boolean;
}

/** Percent with one decimal, e.g. 27.1 %. */
function pct(part: number, whole: number): string {
  return `${((100 * part) / whole).toFixed(1)} %`;
}

/**
 * Sensitivity of every output to every swept input of a design.
 *
 * Per (output, input) pair, by design:
 * - grid: exact first-order (S1) and total (ST) Sobol indices of the grid's discrete uniform
 *   distribution (see grid-variance.ts), and percentiles (10th, 50th, 90th) over the grid of local
 *   elasticities d ln y / d ln x and of normalised slopes (dy/dx) sd(x)/sd(y) (or range(x)/range(y)
 *   with slopeScale 'range'), sd and range over the usable rows (see local-derivatives.ts);
 * - saltelli: S1 (Saltelli et al. 2010) and ST (Jansen 1999) with bootstrap percentile intervals
 *   (see saltelli-estimators.ts);
 * - latin-hypercube, sobol: S1 by a bias-corrected binned correlation ratio (see
 *   binned-first-order.ts); ST is null (it needs a saltelli design).
 * Main-effect curves: conditional means along each input (grid values, or quantile bins).
 *
 * With a single swept input every non-constant output's S1 and ST are exactly 1 (all of the
 * variance of a deterministic output is due to its only input), whatever the design: the exact
 * value is reported instead of a noisy estimate, with a note pointing to the main-effect curve.
 *
 * Only rows with include = 1 and a finite output value are used; left-out rows are counted by
 * reason in `counts`, and everything skipped or approximated is said in `notes`. Saltelli designs
 * count the base samples they drop per output and warn in `warnings` above
 * SALTELLI_DROP_WARNING_FRACTION. Outputs that are affine copies of an earlier output are listed
 * in `copies`.
 *
 * @throws InputError when the table does not match its layout or an option is out of range.
 */
export function analyzeSensitivity(table: SensitivityInput, options: SensitivityOptions = {}): SensitivityReport {
  const settings = resolveOptions(options);
  const outputNames = options.outputs ?? Object.keys(table.outputs);
  const n = checkTable(table, outputNames);
  const layout = table.layout;
  const inputNames = layoutInputs(layout);
  const c = new Collector();
  const { included, leftOut } = leftOutCounts(table, n, (text) => c.note(text));
  const perOutput: Record<string, OutputCounts> = {};
  const usable = new Uint8Array(n);
  const analyzeOutput = prepareDesign(table, layout, n, settings, c);

  for (const name of outputNames) {
    const y = table.outputs[name];
    const { used, nullValues } = fillUsable(y, table.include, usable);
    const { mean, variance } = usableMoments(y, usable, used);
    if (nullValues > 0) c.note(`${name}: ${nullValues} included rows have a null value and are left out for this output.`);
    if (used === 0) c.note(`${name}: no usable rows; every measure is null.`);
    const constant = mean === null || variance === null || isConstant(mean, variance);
    if (used > 0 && constant) c.note(`${name}: constant over the usable rows; its Sobol indices and normalised slopes are null.`);
    analyzeOutput({ name, y, usable, used, mean: mean ?? NaN, variance: variance ?? NaN, constant });
    perOutput[name] = { used, nullValues, mean, variance, droppedBaseSamples: c.dropped.get(name) ?? null };
  }

  return {
    design: layout.kind,
    inputs: [...inputNames],
    outputs: [...outputNames],
    records: c.records,
    mainEffects: c.curves,
    counts: { rows: n, included, leftOut, perOutput },
    notes: c.notes,
    localNotes: c.localNotes,
    warnings: c.warnings,
    copies: findAffineCopies(outputNames, table.outputs, table.include),
    settings,
  };
}

/** Per-design setup shared by all outputs; returns the per-output step. */
function prepareDesign(
  table: SensitivityInput,
  layout: AnalysisLayout,
  n: number,
  settings: ResolvedSensitivityOptions,
  c: Collector,
): (out: OutputContext) => void {
  if (layout.kind === 'grid') {
    const geom = gridGeometry(layout.axes);
    const scratch = createGridScratch(geom);
    const slopeBuf = settings.local ? new Float64Array(n) : new Float64Array(0);
    const elastBuf = settings.local ? new Float64Array(n) : new Float64Array(0);
    return (out) => analyzeGridOutput(out, layout.axes.map((a) => a.name), geom, scratch, slopeBuf, elastBuf, settings, c);
  }
  const inputs = layout.inputs;
  if (layout.kind === 'saltelli') {
    const base = layout.base;
    // main-effect curves from the independent samples of A and B
    const sorted = inputs.map((name) => rowsSortedByInput(table.inputs[name], table.include, 0, 2 * base));
    return (out) => {
      const dropped = droppedBaseSamples(out.usable, base, inputs.length);
      c.dropped.set(out.name, dropped);
      if (dropped > 0 && out.used > 0) {
        const text =
          `${out.name}: ${dropped} of ${base} base samples (${pct(dropped, base)}) are dropped because a row of their A, B or AB block has no value`;
        if (dropped > SALTELLI_DROP_WARNING_FRACTION * base) {
          c.warnings.push(
            `${text}. The dropped samples are not a random subset of the inputs' ranges, so the S1 and ST of ${out.name} are biased. ` +
              `Narrow the swept ranges to where ${out.name} has a value, or analyse outputs that have a value in every row.`,
          );
        } else {
          c.note(`${text}; the indices use the rest.`);
        }
      }
      if (inputs.length === 1) {
        oneInputIndices(out, inputs[0], c);
      } else {
        const est = saltelliIndices(out.y, out.usable, base, inputs, out.name, settings);
        inputs.forEach((input, i) => {
          const e = est[i];
          const s1 = out.constant ? null : e.s1;
          const st = out.constant ? null : e.st;
          c.add(out.name, input, 'S1', s1, e.m, s1 === null ? null : e.s1Ci);
          c.add(out.name, input, 'ST', st, e.m, st === null ? null : e.stCi);
          if (e.m < 2) c.note(`${out.name}: fewer than 2 usable base samples for ${input}; its indices are null.`);
        });
      }
      inputs.forEach((input, i) => {
        c.curves.push(binnedMainEffect(out.name, input, quantileBins(table.inputs[input], out.y, out.usable, sorted[i], settings.curveBins)));
      });
      if (settings.resamples > 0 && inputs.length > 1) {
        c.note(`Saltelli intervals: ${Math.round(settings.confidence * 100)} % bootstrap percentile intervals from ${settings.resamples} resamples of base samples (seed ${settings.seed}).`);
      }
    };
  }
  const sorted = inputs.map((name) => rowsSortedByInput(table.inputs[name], table.include, 0, n));
  const included = table.include === undefined ? n : table.include.reduce((k, v) => k + (v !== 0 ? 1 : 0), 0);
  inputs.forEach((name, i) => {
    const missing = included - sorted[i].length;
    if (missing > 0) c.note(`${name}: ${missing} included rows have no value (NaN) and are left out of its S1 and main-effect curve.`);
  });
  if (inputs.length > 1) c.note(`ST needs a saltelli design: total-effect indices are null for a ${layout.kind} design.`);
  return (out) => {
    if (inputs.length === 1) {
      oneInputIndices(out, inputs[0], c);
      c.curves.push(binnedMainEffect(out.name, inputs[0], quantileBins(table.inputs[inputs[0]], out.y, out.usable, sorted[0], settings.curveBins)));
      return;
    }
    const bins = settings.bins ?? defaultFirstOrderBins(out.used);
    inputs.forEach((input, i) => {
      const x = table.inputs[input];
      const estimate = quantileBins(x, out.y, out.usable, sorted[i], bins);
      c.add(out.name, input, 'S1', out.constant ? null : binnedFirstOrder(estimate), estimate.n);
      c.add(out.name, input, 'ST', null, estimate.n);
      c.curves.push(binnedMainEffect(out.name, input, quantileBins(x, out.y, out.usable, sorted[i], settings.curveBins)));
    });
    c.note(`${out.name}: S1 from ${bins} equal-count bins per input (bias-corrected correlation ratio); no confidence intervals.`);
  };
}

/** Base samples j of a saltelli table (block-major) with at least one unusable row among A_j, B_j, AB_i,j. */
function droppedBaseSamples(usable: Uint8Array, base: number, k: number): number {
  let dropped = 0;
  for (let j = 0; j < base; j++) {
    let ok = usable[j] !== 0 && usable[base + j] !== 0;
    for (let i = 0; ok && i < k; i++) ok = usable[(2 + i) * base + j] !== 0;
    if (!ok) dropped++;
  }
  return dropped;
}

/**
 * One swept input: S1 = ST = 1 exactly for a non-constant deterministic output (Var E[Y|X] = Var Y),
 * null for a constant one. No estimator runs, so there are no intervals.
 */
function oneInputIndices(out: OutputContext, input: string, c: Collector): void {
  const value = out.constant || out.used === 0 ? null : 1;
  c.add(out.name, input, 'S1', value, out.used);
  c.add(out.name, input, 'ST', value, out.used);
  c.note(
    `${input} is the only swept input: it explains all of the variance of every output that varies, so S1 = ST = 1 by definition ` +
      '(no estimate is made). How an output depends on it is in its main-effect curve; sweep more inputs to compare their influence.',
  );
}

function analyzeGridOutput(
  out: OutputContext,
  names: readonly string[],
  geom: GridGeometry,
  scratch: ReturnType<typeof createGridScratch>,
  slopeBuf: Float64Array,
  elastBuf: Float64Array,
  settings: ResolvedSensitivityOptions,
  c: Collector,
): void {
  const { name, y, usable, used } = out;
  if (used < geom.n && used > 0) {
    c.note(
      `${name}: grid incomplete (${used} of ${geom.n} rows usable); S1 and ST describe the usable rows ` +
        '(count-weighted slab means; ST pools the within-line variance of lines with at least 2 usable points).',
    );
  }
  const ssTotal = out.variance * used;
  let yScale = NaN;
  if (!out.constant) {
    if (settings.slopeScale === 'std') yScale = Math.sqrt(out.variance);
    else {
      let lo = Infinity;
      let hi = -Infinity;
      for (let r = 0; r < y.length; r++) {
        if (usable[r] !== 0) {
          if (y[r] < lo) lo = y[r];
          if (y[r] > hi) hi = y[r];
        }
      }
      yScale = hi - lo;
    }
  }
  names.forEach((input, a) => {
    const size = geom.sizes[a];
    const gv = gridAxisVariance(y, usable, geom, a, out.mean, ssTotal, used, scratch, out.constant || used === 0);
    c.add(name, input, 'S1', gv.s1, used);
    c.add(name, input, 'ST', gv.st, gv.stRows);
    if (size > 1 && gv.linesSkipped > 0) {
      c.note(`${name}: ST for ${input} skips ${gv.linesSkipped} of ${gv.linesUsed + gv.linesSkipped + gv.linesEmpty} lines with a single usable point.`);
    }
    if (size === 1) c.note(`${input} has a single grid value: its S1 and ST are 0 and it has no local derivatives.`);
    c.curves.push(gridMainEffect(name, input, geom.values[a], gv.slabMean, gv.slabCount));
    if (!settings.local) return;

    const ld = gridLocalDerivatives(y, usable, geom, a, settings.edges, slopeBuf, elastBuf);
    c.add(name, input, 'elasticity_median', ld.elasticity[1], ld.elasticityCount);
    c.add(name, input, 'elasticity_p10', ld.elasticity[0], ld.elasticityCount);
    c.add(name, input, 'elasticity_p90', ld.elasticity[2], ld.elasticityCount);
    const scale = gridInputScale(geom, a, gv.slabCount, settings.slopeScale) / yScale;
    const slope = (v: number): number | null => (used > 0 && Number.isFinite(scale) && ld.slopeCount > 0 ? v * scale : null);
    c.add(name, input, 'slope_norm_median', slope(ld.slope[1]), ld.slopeCount);
    c.add(name, input, 'slope_norm_p10', slope(ld.slope[0]), ld.slopeCount);
    c.add(name, input, 'slope_norm_p90', slope(ld.slope[2]), ld.slopeCount);
    if (ld.nonPositive > 0) {
      c.localNote(`${name} vs ${input}: elasticity left out at ${ld.nonPositive} of ${ld.slopeCount} points where x <= 0 or y <= 0.`);
    }
    if (size > 1 && ld.noStencil > 0) {
      const why = settings.edges === 'skip' ? 'an axis end or a neighbour not usable (edges: skip)' : 'no usable neighbour';
      c.localNote(`${name} vs ${input}: no derivative at ${ld.noStencil} usable points (${why}).`);
    }
  });
}

/** sd (or range) of x over the usable rows of a grid axis, from the slab counts. */
function gridInputScale(geom: GridGeometry, axis: number, slabCount: Float64Array, kind: 'std' | 'range'): number {
  const values = geom.values[axis];
  let n = 0;
  let s = 0;
  let lo = Infinity;
  let hi = -Infinity;
  for (let t = 0; t < values.length; t++) {
    if (slabCount[t] > 0) {
      n += slabCount[t];
      s += slabCount[t] * values[t];
      if (values[t] < lo) lo = values[t];
      if (values[t] > hi) hi = values[t];
    }
  }
  if (kind === 'range') return hi - lo;
  const mean = s / n;
  let ss = 0;
  for (let t = 0; t < values.length; t++) {
    if (slabCount[t] > 0) {
      const d = values[t] - mean;
      ss += slabCount[t] * d * d;
    }
  }
  return Math.sqrt(ss / n);
}
