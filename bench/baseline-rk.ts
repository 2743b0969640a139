/**
 * A straightforward baseline for the isentropic column, written in the same language, to keep
 * the engine's speed claim honest: integrate dT/dP from the entropy balance with a
 * general-purpose adaptive Runge-Kutta integrator (Dormand-Prince 5(4), Dormand & Prince 1980),
 * where every right-hand-side evaluation finds F(T, P) by a nested root solve for the water
 * term (meltFraction) and its partial derivatives by finite differences.
 *
 *   (c_P / T) dT - (alpha/rho)_mix dP + dS dF = 0,  dF = F_T dT + F_P dP
 *   => dT/dP = ((alpha/rho)_mix - dS F_P) / (c_P / T + dS F_T)        (P in Pa, T in K)
 *
 * Crust integral I = int F dP rides along as a second state. The onset is found with the same
 * routine as the engine, so only the ascent is compared. The tolerance is chosen so that crust
 * agrees with the engine's fine-step value to 0.1 % (checked and printed by the benchmark).
 *
 * Run standalone: node dist/bench/baseline-rk.js
 */
import { adiabatTempK } from '../src/physics/adiabat.js';
import { crustKmFromMeltIntegral } from '../src/physics/column-result.js';
import { defaultModel, meltColumn } from '../src/physics/column.js';
import { meltFraction } from '../src/physics/melting.js';
import { findMeltOnset } from '../src/physics/onset.js';
import type { MeltParams } from '../src/physics/params.js';
import type { Scenario } from '../src/physics/types.js';
import { KELVIN_OFFSET, PA_PER_GPA, pGpaFromDepthKm, wtPctFromPpm } from '../src/physics/units.js';
import { benchScenarios } from './column.js';
import { formatBench, isMain, secondsSince, summarise, type BenchResult } from './util.js';

/** dT/dP (K/GPa) on the melting path at (T, P), with F from the nested solve. */
function dTdP(tK: number, pGpa: number, xWtPct: number, p: MeltParams): number {
  const tC = tK - KELVIN_OFFSET;
  const f = meltFraction(tC, pGpa, xWtPct, p);
  const hT = 1e-3;
  const hP = 1e-6;
  const fT = (meltFraction(tC + hT, pGpa, xWtPct, p) - meltFraction(tC - hT, pGpa, xWtPct, p)) / (2 * hT);
  const fPperGpa = (meltFraction(tC, pGpa + hP, xWtPct, p) - meltFraction(tC, pGpa - hP, xWtPct, p)) / (2 * hP);
  const alphaRho = f * (p.alpha_f / p.rho_f) + (1 - f) * (p.alpha_s / p.rho_s);
  const perPa = (alphaRho - p.dS * (fPperGpa / PA_PER_GPA)) / (p.c_P / tK + p.dS * fT);
  return perPa * PA_PER_GPA;
}

// Dormand-Prince 5(4) tableau
const C2 = 1 / 5, C3 = 3 / 10, C4 = 4 / 5, C5 = 8 / 9;
const A21 = 1 / 5;
const A31 = 3 / 40, A32 = 9 / 40;
const A41 = 44 / 45, A42 = -56 / 15, A43 = 32 / 9;
const A51 = 19372 / 6561, A52 = -25360 / 2187, A53 = 64448 / 6561, A54 = -212 / 729;
const A61 = 9017 / 3168, A62 = -355 / 33, A63 = 46732 / 5247, A64 = 49 / 176, A65 = -5103 / 18656;
const B1 = 35 / 384, B3 = 500 / 1113, B4 = 125 / 192, B5 = -2187 / 6784, B6 = 11 / 84;
const E1 = 71 / 57600, E3 = -71 / 16695, E4 = 71 / 1920, E5 = -17253 / 339200, E6 = 22 / 525, E7 = -1 / 40;

export interface BaselineResult {
  readonly crustKm: number;
  readonly fTop: number;
  readonly steps: number;
}

/** One isentropic column, the straightforward way. Null when the column does not melt. */
export function baselineColumn(s: Scenario, p: MeltParams, rtol = 1e-6): BaselineResult | null {
  const x = wtPctFromPpm(s.water_ppm);
  const pTop = pGpaFromDepthKm(s.lid_km, p.rho_s, p.g);
  const onset = findMeltOnset(s.tp_c, x, pTop, p);
  if (onset.kind !== 'onset') return null;
  // state: T (K) and I = int F dP (GPa); integrate in q = -P from -P_onset to -P_top
  let P = onset.pGpa;
  let T = adiabatTempK(s.tp_c, P, p);
  let I = 0;
  let h = -0.01;
  let steps = 0;
  // derivatives with respect to P: dT/dP and dI/dP = F (the direction is carried by h < 0)
  const rhs = (tK: number, pG: number): [number, number] => [dTdP(tK, pG, x, p), meltFraction(tK - KELVIN_OFFSET, pG, x, p)];
  let [k1T, k1I] = rhs(T, P);
  while (P > pTop + 1e-12) {
    if (P + h < pTop) h = pTop - P;
    const [k2T] = rhs(T + h * A21 * k1T, P + C2 * h);
    const [k3T, k3I] = rhs(T + h * (A31 * k1T + A32 * k2T), P + C3 * h);
    const [k4T, k4I] = rhs(T + h * (A41 * k1T + A42 * k2T + A43 * k3T), P + C4 * h);
    const [k5T, k5I] = rhs(T + h * (A51 * k1T + A52 * k2T + A53 * k3T + A54 * k4T), P + C5 * h);
    const [k6T, k6I] = rhs(T + h * (A61 * k1T + A62 * k2T + A63 * k3T + A64 * k4T + A65 * k5T), P + h);
    const tNew = T + h * (B1 * k1T + B3 * k3T + B4 * k4T + B5 * k5T + B6 * k6T);
    const iNew = I + h * (B1 * k1I + B3 * k3I + B4 * k4I + B5 * k5I + B6 * k6I);
    const [k7T, k7I] = rhs(tNew, P + h);
    const errT = h * (E1 * k1T + E3 * k3T + E4 * k4T + E5 * k5T + E6 * k6T + E7 * k7T);
    const errI = h * (E1 * k1I + E3 * k3I + E4 * k4I + E5 * k5I + E6 * k6I + E7 * k7I);
    const err = Math.max(Math.abs(errT) / (rtol * Math.abs(tNew)), Math.abs(errI) / (rtol * Math.max(Math.abs(iNew), 1e-4)));
    if (err <= 1) {
      P += h;
      T = tNew;
      I = iNew;
      k1T = k7T;
      k1I = k7I;
      steps++;
    }
    const factor = err === 0 ? 5 : Math.min(5, Math.max(0.2, 0.9 * Math.pow(err, -0.2)));
    h *= factor;
  }
  // the integral ran from P_onset down to P_top, so it is negative
  return { crustKm: crustKmFromMeltIntegral(-I, p), fTop: meltFraction(T - KELVIN_OFFSET, pTop, x, p), steps };
}

export interface BaselineBench {
  readonly baseline: BenchResult;
  readonly engine: BenchResult;
  readonly speedup: number;
  /** the baseline's tolerance: the loosest that meets the accuracy target */
  readonly rtol: number;
  /** largest relative crust error against the step -> 0 reference (engine at 0.001 GPa) */
  readonly engineCrustError: number;
  readonly baselineCrustError: number;
}

/** The accuracy both methods must meet: crust within 0.1 % of the step -> 0 limit (the column's default accuracy). */
export const ACCURACY_TARGET = 1e-3;

function maxCrustError(scenarios: readonly Scenario[], reference: ReadonlyArray<number | null>, crust: (s: Scenario) => number | null): number {
  let worst = 0;
  scenarios.forEach((s, i) => {
    const ref = reference[i];
    const c = crust(s);
    if (ref !== null && ref > 0.1 && c !== null) worst = Math.max(worst, Math.abs(c - ref) / ref);
  });
  return worst;
}

/** Engine and baseline on the same scenarios, in the same process and run, at the same accuracy target. */
export async function benchBaseline(scenarioCount = 400, repetitions = 5): Promise<BaselineBench> {
  const scenarios = benchScenarios(scenarioCount);
  const model = defaultModel({ thermal: 'isentropic' });
  const p = model.params;
  const fine = defaultModel({ thermal: 'isentropic', stepGpa: 0.001 });
  const reference = scenarios.map((s) => {
    const r = meltColumn(s, fine);
    return r.status === 'ok' ? r.crust_km : null;
  });
  const engineCrustError = maxCrustError(scenarios, reference, (s) => meltColumn(s, model).crust_km);
  // the loosest tolerance at which the baseline meets the same target
  let rtol = 1e-7;
  let baselineCrustError = Infinity;
  for (const tol of [1e-3, 1e-4, 1e-5, 1e-6, 1e-7]) {
    const err = maxCrustError(scenarios, reference, (s) => baselineColumn(s, p, tol)?.crustKm ?? null);
    if (err <= ACCURACY_TARGET) {
      rtol = tol;
      baselineCrustError = err;
      break;
    }
  }
  const time = (fn: () => void): number => {
    const start = process.hrtime.bigint();
    fn();
    return secondsSince(start);
  };
  const engineRates: number[] = [];
  const baseRates: number[] = [];
  let sink = 0;
  for (let rep = 0; rep < repetitions; rep++) {
    engineRates.push((scenarios.length * 5) / time(() => {
      for (let k = 0; k < 5; k++) for (const s of scenarios) sink += meltColumn(s, model).crust_km ?? 0;
    }));
    baseRates.push(scenarios.length / time(() => {
      for (const s of scenarios) sink += baselineColumn(s, p, rtol)?.crustKm ?? 0;
    }));
    await new Promise((r) => setImmediate(r));
  }
  if (!Number.isFinite(sink)) throw new Error('baseline bench: non-finite result');
  const engine = summarise('engine isentropic column (same scenarios)', 'columns/s', engineRates);
  const baseline = summarise(`baseline: adaptive RK45 (rtol ${rtol}) + nested water solve`, 'columns/s', baseRates);
  return { baseline, engine, speedup: engine.median / baseline.median, rtol, engineCrustError, baselineCrustError };
}

export function formatBaseline(r: BaselineBench): string {
  return (
    `${formatBench(r.engine)}\n${formatBench(r.baseline)}\n` +
    `speed-up of the engine over the baseline: ${r.speedup.toFixed(1)}x; largest crust error against the step -> 0 limit: ` +
    `engine ${(100 * r.engineCrustError).toFixed(4)} %, baseline ${(100 * r.baselineCrustError).toFixed(4)} % (target ${100 * ACCURACY_TARGET} %)`
  );
}

if (isMain(import.meta.url)) {
  process.stdout.write(`${formatBaseline(await benchBaseline())}\n`);
}
