import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { buildNodeMeltTable, nodeStateFromT, nodeStateFromU, U_LATENT_SCALE_K } from '../../src/physics/conductive-melt.js';
import { meltFraction } from '../../src/physics/melting.js';
import { DEFAULT_PARAMS, resolveParams } from '../../src/physics/params.js';
import { solveTridiagonal } from '../../src/physics/tridiagonal.js';

const PRESSURES = Float64Array.from([0.01, 0.5, 1, 1.5, 2, 3, 4, 5.5, 7, 8]);
const K = 273.15;

describe('node melting state of the conductive column', () => {
  it('F from T equals meltFraction of melting.ts (batch water, any T, P, X)', () => {
    fc.assert(
      fc.property(
        fc.double({ min: 900, max: 2100, noNaN: true }),
        fc.integer({ min: 0, max: PRESSURES.length - 1 }),
        fc.constantFrom(0, 0.001, 0.01, 0.03, 0.1),
        (tC, i, x) => {
          const tb = buildNodeMeltTable(PRESSURES, x, DEFAULT_PARAMS);
          const out = new Float64Array(4);
          nodeStateFromT(tb, i, tC + K, 0, out);
          expect(out[0]).toBe(tC + K);
          expect(out[1]).toBeCloseTo(meltFraction(tC, PRESSURES[i], x, DEFAULT_PARAMS), 9);
        },
      ),
      { numRuns: 400 },
    );
  });

  it('u = T + c_u F round-trips, and the state from u is the equilibrium at its T', () => {
    fc.assert(
      fc.property(
        fc.double({ min: 1000, max: 2600, noNaN: true }),
        fc.integer({ min: 0, max: PRESSURES.length - 1 }),
        fc.constantFrom(0, 0.01, 0.05),
        fc.double({ min: 0, max: 1, noNaN: true }),
        (uK, i, x, guess) => {
          const tb = buildNodeMeltTable(PRESSURES, x, DEFAULT_PARAMS);
          const out = new Float64Array(4);
          nodeStateFromU(tb, i, uK, guess, out);
          expect(out[0] + U_LATENT_SCALE_K * out[1]).toBeCloseTo(uK, 8);
          const f = meltFraction(out[0] - K, PRESSURES[i], x, DEFAULT_PARAMS);
          expect(out[1]).toBeCloseTo(f, 8);
          // slopes: dT/du in [0, 1], dF/du in [0, 1/c_u], and dT/du + c_u dF/du = 1
          expect(out[2]).toBeGreaterThanOrEqual(0);
          expect(out[2]).toBeLessThanOrEqual(1);
          expect(out[3]).toBeGreaterThanOrEqual(0);
          expect(out[3]).toBeLessThanOrEqual(1 / U_LATENT_SCALE_K + 1e-15);
          if (out[1] > 0 && out[1] < 1 && out[3] > 0) expect(out[2] + U_LATENT_SCALE_K * out[3]).toBeCloseTo(1, 12);
        },
      ),
      { numRuns: 400 },
    );
  });

  it('dF/du matches a finite difference', () => {
    const tb = buildNodeMeltTable(PRESSURES, 0.02, DEFAULT_PARAMS);
    const out = new Float64Array(4);
    const a = new Float64Array(4);
    const b = new Float64Array(4);
    for (const [i, uK] of [[2, 1750], [4, 1900], [6, 2100], [1, 1600]] as const) {
      nodeStateFromU(tb, i, uK, 0, out);
      nodeStateFromU(tb, i, uK + 1e-4, out[1], a);
      nodeStateFromU(tb, i, uK - 1e-4, out[1], b);
      expect(out[1]).toBeGreaterThan(0);
      expect(out[3]).toBeCloseTo((a[1] - b[1]) / 2e-4, 7);
      expect(out[2]).toBeCloseTo((a[0] - b[0]) / 2e-4, 4);
    }
  });

  it('stays finite for steep melting laws (beta1 = beta2 = 0.2) and at the liquidus', () => {
    const p = resolveParams({ beta1: 0.2, beta2: 0.2 });
    const tb = buildNodeMeltTable(PRESSURES, 0.01, p);
    const out = new Float64Array(4);
    const bad: string[] = [];
    for (let i = 0; i < PRESSURES.length; i++) {
      for (let u = 1200; u < 3200; u += 7.3) {
        nodeStateFromU(tb, i, u, 0.3, out);
        if (!out.every(Number.isFinite) || out[1] < 0 || out[1] > 1) bad.push(`${PRESSURES[i]} GPa, u ${u} K: ${out.join(', ')}`);
      }
    }
    expect(bad).toEqual([]);
  });
});

describe('tridiagonal solver (Thomas algorithm)', () => {
  it('solves a diagonally dominant system like a dense solve', () => {
    const n = 40;
    const sub = new Float64Array(n);
    const diag = new Float64Array(n);
    const sup = new Float64Array(n);
    const x = new Float64Array(n);
    for (let i = 0; i < n; i++) {
      sub[i] = i > 0 ? -1 - 0.01 * i : 0;
      sup[i] = i < n - 1 ? -0.5 + 0.02 * i : 0;
      diag[i] = 3 + Math.sin(i);
      x[i] = Math.cos(0.3 * i) * 100;
    }
    const rhs = new Float64Array(n);
    for (let i = 0; i < n; i++) rhs[i] = (i > 0 ? sub[i] * x[i - 1] : 0) + diag[i] * x[i] + (i < n - 1 ? sup[i] * x[i + 1] : 0);
    expect(solveTridiagonal(sub, diag, sup, rhs, new Float64Array(n), n)).toBe(true);
    for (let i = 0; i < n; i++) expect(rhs[i]).toBeCloseTo(x[i], 10);
  });

  it('reports a vanishing pivot instead of returning NaN', () => {
    const z = new Float64Array(3);
    const rhs = Float64Array.from([1, 2, 3]);
    expect(solveTridiagonal(z, z, z, rhs, new Float64Array(3), 3)).toBe(false);
  });
});
