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
import { benchScenarioRate, formatBench, isMain, recurrencePoint, type BenchResult, type ScenarioBenchOptions } from './util.js';

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

/** Flux columns per second on one core (CPU time), with the wall-clock figure alongside. */
export async function benchFluxColumn(opts: ScenarioBenchOptions = {}): Promise<BenchResult & { readonly wall: BenchResult }> {
  const params = resolveParams({});
  const models: Record<'fixed' | 'balanced', FluxRuntimeModel> = {
    fixed: { heat: 'fixed', params, table: null, tableFile: null, withProfile: false },
    balanced: { heat: 'balanced', params, table: null, tableFile: null, withProfile: false },
  };
  const scenarios = fluxBenchScenarios(opts.scenarios ?? 2000);
  return benchScenarioRate('flux column', scenarios, (s) => computeFlux(s.inputs, models[s.heat]).values.melt_column_km ?? 0, opts);
}

if (isMain(import.meta.url)) {
  const r = await benchFluxColumn();
  process.stdout.write(`${formatBench(r)}\n${formatBench(r.wall)}\n`);
}
