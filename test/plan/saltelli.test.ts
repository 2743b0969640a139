import { describe, expect, it } from 'vitest';
import { makeSobolTable, sobolUnit, SALTELLI_BLOCK_AB0 } from '../../src/plan/index.js';
import { INPUT_NAMES } from '../../src/physics/fields.js';
import { fillPieces, fillRange, planSweep, rows, specWith } from './helpers.js';

describe('saltelli design (block-major A, B, AB_i)', () => {
  const N = 64;
  const spec = specWith({ kind: 'saltelli', base: N });
  const plan = planSweep(spec);
  const k = spec.axes.length;
  const all = fillRange(plan, 0, plan.count);
  const r = rows(all);
  const block = (b: number) => r.slice(b * N, (b + 1) * N);

  it('has N (k + 2) rows tagged by block', () => {
    expect(plan.count).toBe(N * (k + 2));
    expect(plan.hasBlocks).toBe(true);
    expect(plan.layout).toEqual({ kind: 'saltelli', base: N, inputs: ['tp_c', 'water_ppm', 'lid_km', 'upwelling_mm_yr'] });
    for (let b = 0; b < k + 2; b++) for (let j = 0; j < N; j++) expect(all.block![b * N + j]).toBe(b);
  });

  it('A is dimensions 1..k and B dimensions k+1..2k of one Sobol sequence', () => {
    const table = makeSobolTable(2 * k);
    const [A, B] = [block(0), block(1)];
    for (let j = 0; j < N; j++) {
      expect(A[j][0]).toBe(1280 + 140 * sobolUnit(table, 0, j));
      expect(B[j][0]).toBe(1280 + 140 * sobolUnit(table, k, j));
      expect(A[j][1]).toBe(200 * sobolUnit(table, 1, j));
      expect(B[j][1]).toBe(200 * sobolUnit(table, k + 1, j));
    }
  });

  it('AB_i equals A except column i, which equals B', () => {
    const [A, B] = [block(0), block(1)];
    for (let i = 0; i < k; i++) {
      const AB = block(SALTELLI_BLOCK_AB0 + i);
      for (let j = 0; j < N; j++) {
        for (let c = 0; c < k; c++) expect(AB[j][c]).toBe(c === i ? B[j][c] : A[j][c]);
      }
    }
  });

  it('constant inputs are the same in every block', () => {
    const s = specWith({ kind: 'saltelli', base: 8 }, { tp_c: { from: 1300, to: 1500 }, lid_km: { from: 0, to: 50 } });
    const b = fillRange(planSweep(s), 0, 32);
    expect(Array.from(b.inputs.water_ppm).every((v) => v === 0)).toBe(true);
    expect(Array.from(b.inputs.upwelling_mm_yr).every(Number.isNaN)).toBe(true);
    expect(INPUT_NAMES.length).toBe(4);
  });

  it('gives the same rows and tags for any split, across block boundaries', () => {
    expect(fillPieces(plan, [0, 63, 64, 65, 130, 200, 255, 256, 384])).toEqual(all);
  });

  it('skip and seed move the base samples reproducibly', () => {
    const skipped = fillRange(planSweep(specWith({ kind: 'saltelli', base: N, skip: 4 })), 0, 1);
    expect(skipped.inputs.tp_c[0]).toBe(all.inputs.tp_c[4]);
    const s1 = fillRange(planSweep(specWith({ kind: 'saltelli', base: N, seed: 3 })), 0, 100);
    const s2 = fillRange(planSweep(specWith({ kind: 'saltelli', base: N, seed: 3 })), 0, 100);
    expect(s1).toEqual(s2);
    expect(s1.inputs.tp_c).not.toEqual(all.inputs.tp_c.subarray(0, 100));
  });
});
