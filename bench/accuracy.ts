/**
 * An independent check of the accuracy statements (README "Accuracy"), on scenarios the tests do not
 * contain: a low-discrepancy fill of the input box (additive recurrence, not the tests' seeded random
 * sample) and hand-picked hard cases, each column at its default tolerance against a much finer
 * computation of the same column. Prints the worst error per output; no timing.
 *
 * - isentropic (default tolerance 1e-4): 600 columns, Tp 1100-1800 degC, water 0 or 1-50,000 ppm
 *   (log), lid 0-200 km, batch and fractional; reference: tolerance 1e-6, itself compared with a fixed
 *   0.0002 GPa step (a different integrator) where melting runs to the lid base. (A 0.0005 GPa step is
 *   not fine enough for that: wet columns melting to the surface are 4e-4 off with it in f_max.)
 * - conductive (default tolerance 1e-3): 80 columns, Tp 1250-1600 degC, water 0-1,000 ppm, lid 0-120
 *   km, upwelling 0.5-500 mm/yr (log); reference: the fixed grid of resolution 32.
 *
 * Error measure: relative, with the floors of the accuracy tests (CONDUCTIVE_ERROR_FLOORS; the
 * isentropic floors are the same).
 *
 * Run standalone: node dist/bench/accuracy.js
 */
import { defaultModel, meltColumn } from '../src/physics/column.js';
import { conductiveColumn } from '../src/physics/conductive-column.js';
import { CONDUCTIVE_OUTPUTS, conductiveOutputError, type ConductiveOutput } from '../src/physics/conductive-tolerance.js';
import { DEFAULT_PARAMS } from '../src/physics/params.js';
import type { ColumnResult, ModelOptions, Scenario } from '../src/physics/types.js';
import { isMain, recurrencePoint } from './util.js';

/** The outputs the isentropic tolerance covers (README "Accuracy"); onset and top are exact there. */
const ISENTROPIC_OUTPUTS: readonly ConductiveOutput[] = ['f_max', 'f_mean', 'crust_km', 't_top_c', 'h2o_melt_wt_pct', 'productivity_pct_per_gpa'];

/** Worst error per output over a set, with the scenario where it occurred. */
export interface AccuracyReport {
  readonly title: string;
  readonly rows: number;
  readonly melting: number;
  readonly worst: Readonly<Record<string, { readonly err: number; readonly at: string }>>;
}

/** Hand-picked isentropic hard cases not in the tests: very wet cold columns, lids at cpx exhaustion. */
function isentropicHardCases(): Scenario[] {
  const sc = (tp_c: number, water_ppm: number, lid_km: number): Scenario => ({ tp_c, water_ppm, lid_km, upwelling_mm_yr: Number.NaN });
  return [sc(1120, 3000, 0), sc(1190, 700, 0), sc(1365, 450, 0), sc(1505, 75, 12), sc(1545, 0, 27), sc(1660, 2200, 33), sc(1750, 40, 0), sc(1310, 12000, 4)];
}

/**
 * Isentropic columns at the default tolerance against the tightest tolerance (1e-6), and that
 * reference against a fixed 0.0002 GPa step (a different integrator) on the columns that melt up to the
 * lid base (the fixed step does not locate a stop inside a step); the second is the `reference check`.
 */
export function isentropicAccuracy(count = 600): AccuracyReport & { readonly referenceCheck: AccuracyReport['worst'] } {
  const worst: Record<string, { err: number; at: string }> = Object.fromEntries(ISENTROPIC_OUTPUTS.map((o) => [o, { err: 0, at: '' }]));
  const check: Record<string, { err: number; at: string }> = Object.fromEntries(ISENTROPIC_OUTPUTS.map((o) => [o, { err: 0, at: '' }]));
  let rows = 0;
  const cases: Array<{ s: Scenario; water: 'batch' | 'fractional' }> = [];
  for (let i = 0; i < count; i++) {
    const [u1, u2, u3, u4] = recurrencePoint(i + 7919);
    const water_ppm = u2 < 0.15 ? 0 : Math.exp(Math.log(50000) * ((u2 - 0.15) / 0.85));
    cases.push({ s: { tp_c: 1100 + 700 * u1, water_ppm, lid_km: 200 * u3 * u3, upwelling_mm_yr: Number.NaN }, water: u4 < 0.5 ? 'batch' : 'fractional' });
  }
  for (const s of isentropicHardCases()) cases.push({ s, water: 'batch' }, { s, water: 'fractional' });
  for (const { s, water } of cases) {
    const base: ModelOptions = defaultModel({ thermal: 'isentropic', water, params: DEFAULT_PARAMS });
    const got = meltColumn(s, base);
    if (got.status !== 'ok') continue;
    rows++;
    const ref = meltColumn(s, { ...base, tolerance: 1e-6 });
    const at = `${JSON.stringify(s)} ${water}`;
    for (const o of ISENTROPIC_OUTPUTS) {
      // the floors of the accuracy tests (t_top_c: 1 degC, far below its values)
      const e = conductiveOutputError(o, got, ref);
      if (e > worst[o].err) worst[o] = { err: e, at };
    }
    if (!stopsAtTop(ref)) continue;
    const fixed = meltColumn(s, { ...base, stepGpa: 0.0002 });
    for (const o of ISENTROPIC_OUTPUTS) {
      const e = conductiveOutputError(o, ref, fixed);
      if (e > check[o].err) check[o] = { err: e, at };
    }
  }
  return {
    title: `isentropic, default tolerance 1e-4 vs tolerance 1e-6, ${count} recurrence-filled + ${2 * isentropicHardCases().length} hand-picked`,
    rows,
    melting: rows,
    worst,
    referenceCheck: check,
  };
}

/** Melting runs to the top of the column: F at the top is the largest F (no stop below the lid). */
function stopsAtTop(r: ColumnResult): boolean {
  return r.f_max !== null && r.productivity_pct_per_gpa !== null && r.onset_p_gpa !== null && r.top_p_gpa !== null
    ? Math.abs((r.productivity_pct_per_gpa * (r.onset_p_gpa - r.top_p_gpa)) / 100 - r.f_max) < 1e-12
    : false;
}

/** Hand-picked conductive hard cases not in the tests. */
function conductiveHardCases(): Scenario[] {
  const sc = (tp_c: number, water_ppm: number, lid_km: number, upwelling_mm_yr: number): Scenario => ({ tp_c, water_ppm, lid_km, upwelling_mm_yr });
  return [sc(1600, 0, 0, 0.7), sc(1580, 500, 110, 1.5), sc(1330, 50, 0, 4), sc(1520, 20, 7, 3), sc(1260, 900, 45, 25), sc(1410, 0, 0, 400), sc(1490, 250, 80, 0.9), sc(1375, 5, 30, 12)];
}

/** Conductive columns at the default tolerance against the fixed grid of resolution 32. */
export function conductiveAccuracy(count = 80): AccuracyReport {
  const worst: Record<string, { err: number; at: string }> = Object.fromEntries(CONDUCTIVE_OUTPUTS.map((o) => [o, { err: 0, at: '' }]));
  const model: ModelOptions = { thermal: 'conductive', water: 'batch', params: DEFAULT_PARAMS };
  let rows = 0;
  let melting = 0;
  const cases: Scenario[] = [];
  for (let i = 0; i < count; i++) {
    const [u1, u2, u3, u4] = recurrencePoint(i + 104729);
    cases.push({ tp_c: 1250 + 350 * u1, water_ppm: u2 < 0.25 ? 0 : 1000 * (u2 - 0.25) / 0.75, lid_km: 120 * u3, upwelling_mm_yr: 0.5 * Math.pow(1000, u4) });
  }
  cases.push(...conductiveHardCases());
  for (const s of cases) {
    const got = conductiveColumn(s, model);
    const ref = conductiveColumn(s, { ...model, conductiveResolution: 32, conductiveMaxIterations: 400 });
    if (ref.status !== 'ok' && ref.status !== 'no_melt') continue;
    rows++;
    if (ref.status === 'ok') melting++;
    for (const o of CONDUCTIVE_OUTPUTS) {
      const e = got.status === ref.status ? conductiveOutputError(o, got, ref) : Number.POSITIVE_INFINITY;
      if (e > worst[o].err) worst[o] = { err: e, at: JSON.stringify(s) };
    }
  }
  return { title: `conductive, default tolerance 1e-3, ${count} recurrence-filled + ${conductiveHardCases().length} hand-picked`, rows, melting, worst };
}

export function formatAccuracy(r: AccuracyReport): string {
  const lines = Object.entries(r.worst).map(([o, w]) => `  ${o.padEnd(26)} ${w.err.toExponential(2)}  at ${w.at}`);
  return `${r.title}: ${r.rows} rows compared, ${r.melting} melting\n${lines.join('\n')}`;
}

if (isMain(import.meta.url)) {
  const iso = isentropicAccuracy();
  process.stdout.write(`${formatAccuracy(iso)}\n`);
  process.stdout.write(`${formatAccuracy({ title: 'reference check: tolerance 1e-6 vs a fixed 0.0002 GPa step (columns melting to the top)', rows: iso.rows, melting: iso.rows, worst: iso.referenceCheck })}\n`);
  process.stdout.write(`${formatAccuracy(conductiveAccuracy())}\n`);
}
