/**
 * One unit of work: integrate the columns of a contiguous range of scenario indices and
 * return the results as struct-of-arrays typed arrays (moved, not copied, out of a worker).
 * Pure apart from the clock: the same (spec, range) gives the same arrays on any thread.
 */
import { COLUMN_STATUSES, type ColumnStatus } from '../physics/types.js';
import { allocatePointBatch, planSweep } from '../plan/index.js';
import type { Plan } from '../plan/types.js';
import { processOfSpec, resultsOf } from '../process/registry.js';
import type { AnyProcess, ProcessResult } from '../process/types.js';
import type { SweepSpec } from '../spec/types.js';
import { profileGridPressures, type ProfileGrid } from './profile-grid.js';
import { allocateProfileSamples, clearProfileRow } from './profile-sampling.js';
import type { ChunkResult } from '../process/chunk-result.js';

const STATUS_CODE: Readonly<Record<ColumnStatus, number>> = Object.freeze(
  Object.fromEntries(COLUMN_STATUSES.map((s, i) => [s, i])) as Record<ColumnStatus, number>,
);
const FAILED_CODE = STATUS_CODE.failed;

export type { ChunkResult } from '../process/chunk-result.js';

/** What a column computation needs besides the points: built once per spec. */
export interface ChunkContext {
  readonly spec: SweepSpec;
  readonly plan: Plan;
  /** the sweep's process and its runtime model (from process.resolveModel) */
  readonly process: AnyProcess;
  readonly model: unknown;
  /** the process's result field names, in table order */
  readonly resultNames: readonly string[];
  /** the profile grid's pressures (GPa, ascending), or null when no profile table is written */
  readonly profilePressures: Float64Array | null;
}

/**
 * Everything computeChunk needs for a sweep, built once per thread. With a profile grid the
 * columns keep their profile arrays (withProfile) and are sampled onto the grid.
 * @throws Error when profiles are asked of a process that writes no profile table
 */
export function makeChunkContext(spec: SweepSpec, profiles?: ProfileGrid): ChunkContext {
  const process = processOfSpec(spec);
  const withProfile = profiles !== undefined;
  if (withProfile && process.profileTable === undefined) throw new Error(`process ${process.name} writes no profile table`);
  return {
    spec,
    plan: planSweep(spec),
    process,
    model: process.resolveModel(spec.model, { withProfile }),
    resultNames: resultsOf(process, spec.model).map((r) => r.name),
    profilePressures: withProfile ? profileGridPressures(profiles) : null,
  };
}

function allocateNumeric(names: readonly string[], n: number): Record<string, Float64Array> {
  const out: Record<string, Float64Array> = {};
  for (const name of names) out[name] = new Float64Array(n);
  return out;
}

/** An ok row must hold finite numbers: anything else is demoted to failed with the field named. */
function firstNonFinite(r: ProcessResult, names: readonly string[]): string | null {
  for (const name of names) {
    const v = r.values[name];
    if (v !== null && v !== undefined && !Number.isFinite(v)) return name;
  }
  return null;
}

/**
 * Integrate scenarios [start, end) of the context's plan with the sweep's process.
 * A scenario that throws is recorded as failed with the error message; it never stops the chunk.
 * One inputs object serves every row (processes must not keep it): no allocation per row here.
 */
export function computeChunk(ctx: ChunkContext, start: number, end: number): ChunkResult {
  const n = end - start;
  const { process, model, resultNames } = ctx;
  const inputNames = ctx.plan.inputNames;
  const points = allocatePointBatch(inputNames, n, ctx.plan.hasBlocks);
  ctx.plan.fill(start, end, points);
  const status = new Uint8Array(n);
  const numeric = allocateNumeric(resultNames, n);
  const inputCols = inputNames.map((name) => points.inputs[name]);
  const resultCols = resultNames.map((name) => numeric[name]);
  const reasons: Array<readonly [number, string]> = [];
  const pressures = ctx.profilePressures;
  const profiles = pressures === null ? undefined : allocateProfileSamples(n, pressures.length);
  const row: Record<string, number> = {};
  for (const name of inputNames) row[name] = Number.NaN;
  const t0 = performance.now();
  for (let i = 0; i < n; i++) {
    for (let k = 0; k < inputCols.length; k++) row[inputNames[k]] = inputCols[k][i];
    let result: ProcessResult | null = null;
    let failure: string | null = null;
    try {
      result = process.compute(row, model);
      if (result.status === 'ok') {
        const bad = firstNonFinite(result, resultNames);
        if (bad !== null) failure = `non-finite ${bad} in an ok column`;
      }
    } catch (err) {
      failure = `column raised: ${err instanceof Error ? err.message : String(err)}`;
    }
    if (failure !== null || result === null) {
      status[i] = FAILED_CODE;
      for (const col of resultCols) col[i] = NaN;
      reasons.push([i, failure ?? 'no result']);
      if (profiles !== undefined) clearProfileRow(profiles, i);
      continue;
    }
    const ok: ProcessResult = result;
    status[i] = STATUS_CODE[ok.status];
    const values = ok.values;
    for (let k = 0; k < resultCols.length; k++) {
      const v = values[resultNames[k]];
      resultCols[k][i] = v === null || v === undefined ? NaN : v;
    }
    if (ok.reason !== null) reasons.push([i, ok.reason]);
    if (profiles !== undefined && pressures !== null && process.profileTable !== undefined) {
      process.profileTable.sample(ok, row, model, pressures, profiles, i);
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
  const points = allocatePointBatch(ctx.plan.inputNames, n, ctx.plan.hasBlocks);
  ctx.plan.fill(start, end, points);
  const status = new Uint8Array(n).fill(FAILED_CODE);
  const numeric = allocateNumeric(ctx.resultNames, n);
  for (const name of ctx.resultNames) numeric[name].fill(NaN);
  const reasons: Array<readonly [number, string]> = [];
  for (let i = 0; i < n; i++) reasons.push([i, reason]);
  const pressures = ctx.profilePressures;
  if (pressures === null) return { start, end, points, status, numeric, reasons, computeMs: 0 };
  return { start, end, points, status, numeric, reasons, computeMs: 0, profiles: allocateProfileSamples(n, pressures.length) };
}

/** Every ArrayBuffer of a chunk, for moving it across a thread boundary without copying. */
export function chunkTransferables(c: ChunkResult): ArrayBuffer[] {
  const list: ArrayBuffer[] = [];
  for (const col of Object.values(c.points.inputs)) list.push(col.buffer as ArrayBuffer);
  list.push(c.status.buffer as ArrayBuffer);
  if (c.points.block) list.push(c.points.block.buffer as ArrayBuffer);
  for (const col of Object.values(c.numeric)) list.push(col.buffer as ArrayBuffer);
  const pr = c.profiles;
  if (pr !== undefined) {
    list.push(pr.t_c.buffer as ArrayBuffer, pr.f.buffer as ArrayBuffer, pr.h2o_melt_wt_pct.buffer as ArrayBuffer, pr.productivity_pct_per_gpa.buffer as ArrayBuffer);
  }
  return list;
}
