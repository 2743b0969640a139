/**
 * Sobol design: quasi-random points from the Sobol sequence (Sobol 1967) with the direction
 * numbers of Joe & Kuo (2008), in Gray-code order (Antonov & Saleev 1979). Point j of a dimension
 * is the XOR of the direction numbers over the set bits of gray(j) = j XOR (j >> 1), so any
 * point is computed directly from its index; within a range, consecutive points differ by one
 * XOR. Results are exact integers, so they never depend on how a range is split.
 *
 * Seed (optional): a random digital shift, each dimension XORed with a 32-bit word derived from
 * the seed (keeps the (t, m, s)-net structure; gives independent replicates). Without a seed the
 * published sequence is reproduced: dimension 1 starts 0, 0.5, 0.75, 0.25, 0.375, 0.875, ...
 */
import type { AxisSpec, SweepSpec } from '../spec/types.js';
import { buildPlan } from './build-plan.js';
import { deriveKey } from './mix.js';
import { SOBOL_MAX_DIMENSIONS, sobolDirectionNumbers } from './sobol-directions.js';
import type { Plan } from './types.js';
import { mapUnitsToAxis } from './unit-to-axis.js';

/** Stream tag of the digital-shift keys (keeps them apart from other uses of the seed). */
const STREAM_SHIFT = 0x5b01;
const TWO_POW_M32 = 2 ** -32;

/** Direction numbers and digital shifts of the first `dims` dimensions. */
export interface SobolTable {
  readonly dims: number;
  /** directions[d][b]: direction number of dimension d + 1 for Gray-code bit b */
  readonly directions: readonly Uint32Array[];
  /** XOR shift of each dimension (all 0 without a seed) */
  readonly shifts: Uint32Array;
}

/** The table for `dims` dimensions; `seed` (optional) selects a digital shift. */
export function makeSobolTable(dims: number, seed?: number): SobolTable {
  if (dims > SOBOL_MAX_DIMENSIONS) throw new RangeError(`a Sobol sequence here has at most ${SOBOL_MAX_DIMENSIONS} dimensions, asked for ${dims}`);
  const directions = Array.from({ length: dims }, (_, d) => sobolDirectionNumbers(d + 1));
  const shifts = new Uint32Array(dims);
  if (seed !== undefined) for (let d = 0; d < dims; d++) shifts[d] = deriveKey(seed, STREAM_SHIFT, d);
  return { dims, directions, shifts };
}

/** Point `index` (0 <= index < 2^32) of one dimension as a 32-bit integer (before the shift). */
export function sobolWord(directions: Uint32Array, index: number): number {
  let g = (index ^ (index >>> 1)) >>> 0;
  let x = 0;
  for (let b = 0; g !== 0; b++, g >>>= 1) if ((g & 1) === 1) x ^= directions[b];
  return x >>> 0;
}

/** Point `index` of dimension `dim` (0-based) in [0, 1), shift applied. */
export function sobolUnit(table: SobolTable, dim: number, index: number): number {
  return ((sobolWord(table.directions[dim], index) ^ table.shifts[dim]) >>> 0) * TWO_POW_M32;
}

/** One output column fed by one Sobol dimension. */
export interface SobolColumn {
  /** 0-based Sobol dimension */
  readonly dim: number;
  /** the interval the unit coordinates are mapped to */
  readonly axis: Pick<AxisSpec, 'min' | 'max' | 'scale'>;
  readonly out: Float64Array;
}

/**
 * Write points first .. first + n - 1 of each column's dimension, mapped to its axis, into
 * out[offset .. offset + n). The first point is computed directly; the rest by one XOR each.
 */
export function fillSobolColumns(table: SobolTable, first: number, n: number, columns: readonly SobolColumn[], offset: number): void {
  for (const { dim, axis, out } of columns) {
    const v = table.directions[dim];
    const shift = table.shifts[dim] | 0;
    let x = sobolWord(v, first) | 0;
    out[offset] = ((x ^ shift) >>> 0) * TWO_POW_M32;
    const last = first + n;
    for (let j = first + 1, o = offset + 1; j < last; j++, o++) {
      // gray(j) = gray(j - 1) XOR 2^ctz(j); the bit trick is exact for 1 <= j < 2^32
      x ^= v[31 - Math.clz32(j & -j)];
      out[o] = ((x ^ shift) >>> 0) * TWO_POW_M32;
    }
    mapUnitsToAxis(axis, out, offset, offset + n);
  }
}

/** Plan of a `sobol` design: point i uses Sobol index skip + i; axis a (spec order) uses dimension a + 1. */
export function planSobol(spec: SweepSpec): Plan {
  const design = spec.design;
  if (design.kind !== 'sobol') throw new TypeError(`planSobol needs a sobol design, got ${design.kind}`);
  const table = makeSobolTable(spec.axes.length, design.seed);
  const inputs = Object.freeze(spec.axes.map((a) => a.name));
  return buildPlan({
    spec,
    count: design.samples,
    layout: Object.freeze({ kind: 'sobol', samples: design.samples, inputs }),
    hasBlocks: false,
    fillSwept(start, end, out) {
      const columns = spec.axes.map((axis, d) => ({ dim: d, axis, out: out.inputs[axis.name] }));
      fillSobolColumns(table, design.skip + start, end - start, columns, 0);
    },
  });
}
