/**
 * One unit of work: integrate the columns of a contiguous range of scenario indices and
 * return the results as struct-of-arrays typed arrays (moved, not copied, out of a worker).
 * Pure apart from the clock: the same (spec, range) gives the same arrays on any thread.
 */
import { RESULT_NUMERIC_NAMES, type ResultNumericName } from '../physics/fields.js';
import { resolveParams } from '../physics/params.js';
import { meltColumn, resolveThermalModel } from '../physics/column.js';
import { COLUMN_STATUSES, type ColumnResult, type ColumnStatus, type ModelOptions, type Scenario } from '../physics/types.js';
import { allocatePointBatch, planSweep } from '../plan/index.js';
import type { PointBatch, Plan } from '../plan/types.js';
import type { SweepSpec } from '../spec/types.js';
import { profileGridPressures, type ProfileGrid } from './profile-grid.js';
import { allocateProfileSamples, clearProfileRow, sampleColumnProfile, type ProfileSamples } from './profile-sampling.js';

export const STATUS_CODE: Readonly<Record<ColumnStatus, number>> = Object.freeze(
  Object.fromEntries(COLUMN_STATUSES.map((s, i) => [s, i])) as Record<ColumnStatus, number>,
);
export const FAILED_CODE = STATUS_CODE.failed;

/** Results of scenarios [start, end). Numeric arrays hold NaN where the value is null. */
export interface ChunkResult {
  readonly start: number;
  readonly end: number;
  readonly points: PointBatch;
  /** index into COLUMN_STATUSES */
  readonly status: Uint8Array;
  readonly numeric: Readonly<Record<ResultNumericName, Float64Array>>;
  /** reasons of failed / out-of-range rows, by offset within the chunk */
  readonly reasons: ReadonlyArray<readonly [number, string]>;
  /** thread CPU time spent on the columns, ms */
  readonly computeMs: number;
  /** the columns sampled on the profile grid (only when the run asks for profiles) */
  readonly profiles?: ProfileSamples;
}

/** What a column computation needs besides the points: built once per spec. */
export interface ChunkContext {
  readonly spec: SweepSpec;
  readonly plan: Plan;
  readonly model: ModelOptions;
  /** the profile grid's pressures (GPa, ascending), or null when no profile table is written */
  readonly profilePressures: Float64Array | null;
}

/**
 * Everything computeChunk needs for a sweep, built once per thread. With a profile grid the
 * columns keep their profile arrays (withProfile) and are sampled onto the grid.
 */
export function makeChunkContext(spec: SweepSpec, profiles?: ProfileGrid): ChunkContext {
  const params = resolveParams(spec.model.params);
  const withProfile = profiles !== undefined;
  return {
    spec,
    plan: planSweep(spec),
    model: { thermal: spec.model.thermal, water: spec.model.water, params, stepGpa: spec.model.step_gpa, withProfile },
    profilePressures: withProfile ? profileGridPressures(profiles) : null,
  };
}

function allocateNumeric(n: number): Record<ResultNumericName, Float64Array> {
  const out = {} as Record<ResultNumericName, Float64Array>;
  for (const name of RESULT_NUMERIC_NAMES) out[name] = new Float64Array(n);
  return out;
}

/** An ok row must hold finite numbers: anything else is demoted to failed with the field named. */
function firstNonFinite(r: ColumnResult): ResultNumericName | null {
  for (const name of RESULT_NUMERIC_NAMES) {
    const v = r[name];
    if (v !== null && !Number.isFinite(v)) return name;
  }
  return null;
}

/**
 * Integrate scenarios [start, end) of the context's plan.
 * A scenario that throws is recorded as failed with the error message; it never stops the chunk.
 */
export function computeChunk(ctx: ChunkContext, start: number, end: number): ChunkResult {
  const n = end - start;
  const points = allocatePointBatch(n, ctx.plan.hasBlocks);
  ctx.plan.fill(start, end, points);
  const status = new Uint8Array(n);
  const numeric = allocateNumeric(n);
  const reasons: Array<readonly [number, string]> = [];
  const pressures = ctx.profilePressures;
  const profiles = pressures === null ? undefined : allocateProfileSamples(n, pressures.length);
  const t0 = performance.now();
  for (let i = 0; i < n; i++) {
    const scenario: Scenario = {
      tp_c: points.tp_c[i],
      water_ppm: points.water_ppm[i],
      lid_km: points.lid_km[i],
      upwelling_mm_yr: points.upwelling_mm_yr[i],
    };
    let result: ColumnResult | null = null;
    let failure: string | null = null;
    try {
      result = meltColumn(scenario, ctx.model);
      if (result.status === 'ok') {
        const bad = firstNonFinite(result);
        if (bad !== null) failure = `non-finite ${bad} in an ok column`;
      }
    } catch (err) {
      failure = `column raised: ${err instanceof Error ? err.message : String(err)}`;
    }
    if (failure !== null || result === null) {
      status[i] = FAILED_CODE;
      for (const name of RESULT_NUMERIC_NAMES) numeric[name][i] = NaN;
      reasons.push([i, failure ?? 'no result']);
      if (profiles !== undefined) clearProfileRow(profiles, i);
      continue;
    }
    const ok: ColumnResult = result;
    status[i] = STATUS_CODE[ok.status];
    for (const name of RESULT_NUMERIC_NAMES) {
      const v = ok[name];
      numeric[name][i] = v === null ? NaN : v;
    }
    if (ok.reason !== null) reasons.push([i, ok.reason]);
    if (profiles !== undefined && pressures !== null) {
      const thermal = resolveThermalModel(scenario, ctx.model);
      sampleColumnProfile(ok, scenario.tp_c, scenario.lid_km, thermal, ctx.model.params, pressures, profiles, i);
    }
  }
  const computeMs = performance.now() - t0;
  return profiles === undefined
    ? { start, end, points, status, numeric, reasons, computeMs }
    : { start, end, points, status, numeric, reasons, computeMs, profiles };
}

/** Rows of a chunk that could not be computed at all (worker lost twice): all failed, inputs kept. */
export function failedChunk(ctx: ChunkContext, start: number, end: number, reason: string): ChunkResult {
  const n = end - start;
  const points = allocatePointBatch(n, ctx.plan.hasBlocks);
  ctx.plan.fill(start, end, points);
  const status = new Uint8Array(n).fill(FAILED_CODE);
  const numeric = allocateNumeric(n);
  for (const name of RESULT_NUMERIC_NAMES) numeric[name].fill(NaN);
  const reasons: Array<readonly [number, string]> = [];
  for (let i = 0; i < n; i++) reasons.push([i, reason]);
  const pressures = ctx.profilePressures;
  if (pressures === null) return { start, end, points, status, numeric, reasons, computeMs: 0 };
  return { start, end, points, status, numeric, reasons, computeMs: 0, profiles: allocateProfileSamples(n, pressures.length) };
}

/** Every ArrayBuffer of a chunk, for moving it across a thread boundary without copying. */
export function chunkTransferables(c: ChunkResult): ArrayBuffer[] {
  const list: ArrayBuffer[] = [
    c.points.tp_c.buffer as ArrayBuffer,
    c.points.water_ppm.buffer as ArrayBuffer,
    c.points.lid_km.buffer as ArrayBuffer,
    c.points.upwelling_mm_yr.buffer as ArrayBuffer,
    c.status.buffer as ArrayBuffer,
  ];
  if (c.points.block) list.push(c.points.block.buffer as ArrayBuffer);
  for (const name of RESULT_NUMERIC_NAMES) list.push(c.numeric[name].buffer as ArrayBuffer);
  const pr = c.profiles;
  if (pr !== undefined) {
    list.push(pr.t_c.buffer as ArrayBuffer, pr.f.buffer as ArrayBuffer, pr.h2o_melt_wt_pct.buffer as ArrayBuffer, pr.productivity_pct_per_gpa.buffer as ArrayBuffer);
  }
  return list;
}
