/**
 * Flux columns per second on one core, at default accuracy, for a fixed, deterministic set of
 * 2,000 wedge scenarios filling the box of the arc example (sweeps/arc-a2-flux.yaml): water
 * 10-20000 ppm (log-uniform), wedge Tp 1280-1400 degC, plate 50-100 km, slab 80-160 km, both heat
 * modes alternating. Each repetition runs the set until at least 2 s have passed; the figure is the
 * median over the repetitions, per second of process CPU time (one thread).
 *
 * Run standalone: node dist/bench/flux-column.js
 */
import { resolveParams } from '../src/physics/params.js';
import { computeFlux, type FluxRuntimeModel } from '../src/process/flux.js';
import { formatBench, isMain, measureRates, recurrencePoint, summarise, type BenchResult } from './util.js';

/** The benchmark's scenario set: a low-discrepancy (additive recurrence) fill of the box. */
export function fluxBenchScenarios(count = 2000): { readonly inputs: Record<string, number>; readonly heat: 'fixed' | 'balanced' }[] {
  const out: { inputs: Record<string, number>; heat: 'fixed' | 'balanced' }[] = [];
  for (let i = 0; i < count; i++) {
    const [u1, u2, u3, u4] = recurrencePoint(i);
    out.push({
      inputs: { water_ppm: 10 * Math.pow(2000, u1), tp_c: 1280 + 120 * u2, lid_km: 50 + 50 * u3, slab_depth_km: 80 + 80 * u4 },
      heat: i % 2 === 0 ? 'balanced' : 'fixed',
    });
  }
  return out;
}

export interface FluxBenchOptions {
  readonly repetitions?: number;
  readonly minSeconds?: number;
  readonly scenarios?: number;
}

/** Flux columns per second on one core (CPU time), with the wall-clock figure alongside. */
export async function benchFluxColumn(opts: FluxBenchOptions = {}): Promise<BenchResult & { readonly wall: BenchResult }> {
  const repetitions = opts.repetitions ?? 5;
  const minSeconds = opts.minSeconds ?? 2;
  const scenarios = fluxBenchScenarios(opts.scenarios ?? 2000);
  const params = resolveParams({});
  const models: Record<'fixed' | 'balanced', FluxRuntimeModel> = {
    fixed: { heat: 'fixed', params, table: null, tableFile: null, withProfile: false },
    balanced: { heat: 'balanced', params, table: null, tableFile: null, withProfile: false },
  };
  let sink = 0;
  const once = (): void => {
    for (const s of scenarios) sink += computeFlux(s.inputs, models[s.heat]).values.melt_column_km ?? 0;
  };
  once(); // warm up the JIT
  const rates = await measureRates(once, scenarios.length, repetitions, minSeconds);
  if (!Number.isFinite(sink)) throw new Error('bench: non-finite melt column');
  return {
    ...summarise('flux column (CPU time, one core)', 'columns/s', rates.cpu),
    wall: summarise('flux column (wall clock)', 'columns/s', rates.wall),
  };
}

if (isMain(import.meta.url)) {
  const r = await benchFluxColumn();
  process.stdout.write(`${formatBench(r)}\n${formatBench(r.wall)}\n`);
}
