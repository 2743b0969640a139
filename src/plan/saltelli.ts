/**
 * Saltelli design: the A, B and AB_i matrices that variance-based (Sobol-index) estimators
 * need (Saltelli et al. 2010, Comput. Phys. Commun. 181, 259-270), built from one
 * 2k-dimensional Sobol sequence: A = dimensions 1..k, B = dimensions k+1..2k, and AB_i = A with
 * column i taken from B. Rows are block-major (src/plan/types.ts): [0, N) A, [N, 2N) B,
 * [(2 + i) N, (3 + i) N) AB_i; row j of every block uses Sobol index skip + j.
 * Block tags: 0 = A, 1 = B, 2 + i = AB_i.
 */
import type { SweepSpec } from '../spec/types.js';
import { buildPlan } from './build-plan.js';
import { fillSobolColumns, makeSobolTable, type SobolColumn } from './sobol.js';
import type { Plan } from './types.js';

/** Block tag of matrix A. */
export const SALTELLI_BLOCK_A = 0;
/** Block tag of matrix B. */
export const SALTELLI_BLOCK_B = 1;
/** Block tag of AB_0; AB_i is tagged SALTELLI_BLOCK_AB0 + i. */
export const SALTELLI_BLOCK_AB0 = 2;

/** Sobol dimension (0-based) feeding axis `a` of block `block`, for k axes. */
export function saltelliDimension(block: number, a: number, k: number): number {
  if (block === SALTELLI_BLOCK_A) return a;
  if (block === SALTELLI_BLOCK_B) return k + a;
  return block - SALTELLI_BLOCK_AB0 === a ? k + a : a;
}

/** Plan of a `saltelli` design: base N, k swept inputs, N (k + 2) rows. */
export function planSaltelli(spec: SweepSpec): Plan {
  const design = spec.design;
  if (design.kind !== 'saltelli') throw new TypeError(`planSaltelli needs a saltelli design, got ${design.kind}`);
  const k = spec.axes.length;
  const base = design.base;
  const table = makeSobolTable(2 * k, design.seed);
  const inputs = Object.freeze(spec.axes.map((a) => a.name));
  return buildPlan({
    spec,
    count: base * (k + 2),
    layout: Object.freeze({ kind: 'saltelli', base, inputs }),
    hasBlocks: true,
    fillSwept(start, end, out) {
      const block = out.block as Uint8Array; // buildPlan checked it is present
      for (let r = start; r < end; ) {
        const b = Math.floor(r / base);
        const segEnd = Math.min(end, (b + 1) * base);
        const j0 = r - b * base;
        const columns: SobolColumn[] = spec.axes.map((axis, a) => ({ dim: saltelliDimension(b, a, k), axis, out: out.inputs[axis.name] }));
        fillSobolColumns(table, design.skip + j0, segEnd - r, columns, r - start);
        block.fill(b, r - start, segEnd - start);
        r = segEnd;
      }
    },
  });
}
