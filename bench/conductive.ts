/**
 * Conductive columns per second on one core, at the default tolerance (1e-3, grid-resolution control;
 * or on the fixed default grid of before, `resolution: 1`), batch water, for a
 * fixed, deterministic mix of 1,000 scenarios: Tp 1280-1450 degC, water 0-300 ppm (every third
 * scenario dry), lid 0-30 km, upwelling 1-100 mm/yr spread evenly in log. Each repetition runs the set
 * repeatedly for at least 2 s; the figure is the median over 5 repetitions, with min and max.
 *
 * Run standalone: node dist/bench/conductive.js
 */
import { conductiveColumn } from '../src/physics/conductive-column.js';
import { DEFAULT_PARAMS } from '../src/physics/params.js';
import type { ModelOptions, Scenario } from '../src/physics/types.js';
import { benchScenarioRate, formatBench, isMain, recurrencePoint, type BenchResult, type ScenarioBenchOptions } from './util.js';

/** The benchmark's scenario set: a low-discrepancy (additive recurrence) fill of the box. */
export function conductiveBenchScenarios(count = 1000): Scenario[] {
  const out: Scenario[] = [];
  for (let i = 0; i < count; i++) {
    const [u1, u2, u3, u4] = recurrencePoint(i);
    out.push({
      tp_c: 1280 + 170 * u1,
      water_ppm: i % 3 === 0 ? 0 : 300 * u2,
      lid_km: 30 * u3,
      upwelling_mm_yr: Math.pow(10, 2 * u4),
    });
  }
  return out;
}

export interface ConductiveBenchOptions extends ScenarioBenchOptions {
  /** a fixed grid (conductiveResolution) instead of the tolerance control */
  readonly resolution?: number;
}

/** Median conductive columns/s on the calling thread (CPU time; `wall`: wall clock). */
export async function benchConductive(opts: ConductiveBenchOptions = {}): Promise<BenchResult & { readonly wall: BenchResult }> {
  const model: ModelOptions = { thermal: 'conductive', water: 'batch', params: DEFAULT_PARAMS, ...(opts.resolution === undefined ? {} : { conductiveResolution: opts.resolution }) };
  const how = opts.resolution === undefined ? 'default tolerance 1e-3' : `fixed grid, resolution ${opts.resolution} (before)`;
  const one = (s: Scenario): number => {
    const r = conductiveColumn(s, model);
    if (r.status === 'failed') throw new Error(`bench: a conductive column failed: ${r.reason ?? ''}`);
    return r.crust_km ?? 0;
  };
  return benchScenarioRate(`conductive column, ${how}`, conductiveBenchScenarios(opts.scenarios ?? 1000), one, opts);
}

if (isMain(import.meta.url)) {
  const r = await benchConductive();
  process.stdout.write(`${formatBench(r)}\n`);
  const fixed = await benchConductive({ resolution: 1 });
  process.stdout.write(`${formatBench(fixed)}\n`);
}
