/**
 * Isentropic columns per second on one core, at default accuracy (tolerance 1e-4; with
 * `stepGpa`, the fixed-step path, e.g. 0.05 GPa as before tolerances existed), for a fixed,
 * deterministic mix of wet and dry scenarios: 2,000 scenarios over Tp 1250-1500 degC,
 * water 0-500 ppm (every other scenario dry), lid 0-30 km, batch water mode. Each repetition
 * runs the set repeatedly for at least 2 s; the figure is the median over 5 repetitions.
 *
 * Run standalone: node dist/bench/column.js
 */
import { defaultModel, meltColumn } from '../src/physics/column.js';
import type { Scenario } from '../src/physics/types.js';
import { benchScenarioRate, formatBench, isMain, recurrencePoint, type BenchResult, type ScenarioBenchOptions } from './util.js';

/** The benchmark's scenario set: a low-discrepancy (additive recurrence) fill of the box. */
export function benchScenarios(count = 2000): Scenario[] {
  const out: Scenario[] = [];
  for (let i = 0; i < count; i++) {
    const [u1, u2, u3] = recurrencePoint(i);
    out.push({
      tp_c: 1250 + 250 * u1,
      water_ppm: i % 2 === 0 ? 0 : 500 * u2,
      lid_km: 30 * u3,
      upwelling_mm_yr: Number.NaN,
    });
  }
  return out;
}

export interface ColumnBenchOptions extends ScenarioBenchOptions {
  /** a fixed step (GPa) instead of the default tolerance */
  readonly stepGpa?: number;
}

/**
 * Isentropic columns per second on one core: the median, min and max over `repetitions`
 * repetitions, each running the scenario set until at least `minSeconds` have passed. Rates are
 * per second of process CPU time (user + system), so other load on a shared machine does not count
 * against the figure; `wall` holds the same statistics per second of wall-clock time.
 */
export async function benchColumn(opts: ColumnBenchOptions = {}): Promise<BenchResult & { readonly wall: BenchResult }> {
  const model = defaultModel(opts.stepGpa === undefined ? { thermal: 'isentropic' } : { thermal: 'isentropic', stepGpa: opts.stepGpa });
  const label = opts.stepGpa === undefined ? 'default tolerance' : `fixed ${opts.stepGpa} GPa step`;
  const one = (s: Scenario): number => meltColumn(s, model).crust_km ?? 0;
  return benchScenarioRate(`isentropic column, ${label}`, benchScenarios(opts.scenarios ?? 2000), one, opts);
}

if (isMain(import.meta.url)) {
  const r = await benchColumn();
  const fixed = await benchColumn({ stepGpa: 0.05 });
  process.stdout.write(`${formatBench(r)}\n${formatBench(r.wall)}\n${formatBench(fixed)}\n`);
}
