/**
 * The profile table (`run --profiles`): long format, one row per (scenario, grid pressure), in
 * scenario order and ascending pressure. Columns: scenario_id, then PROFILE_TABLE_FIELDS. Schema
 * metadata is that of the results table (sweep, hash, rows, shard), with meltsweep.table =
 * "profiles" and meltsweep.profile_grid = "FROM:TO:STEP" (GPa).
 */
import * as arrow from 'apache-arrow';
import { PROFILE_TABLE_FIELDS } from '../physics/fields.js';
import { depthKmFromPGpa } from '../physics/units.js';
import type { MeltParams } from '../physics/params.js';
import type { ChunkResult } from '../process/chunk-result.js';
import { arrowField, META, resultsSchema, SCENARIO_ID_FIELD, type ResultsTableMeta } from './arrow-schema.js';
import { nanValidity } from './arrow-batch.js';

/** Schema of a profile table: the results table's metadata, the profile columns. */
export function profilesSchema(meta: ResultsTableMeta, grid: string): arrow.Schema {
  const md = new Map(resultsSchema(meta).metadata);
  md.set(META.table, 'profiles');
  md.set(META.profileGrid, grid);
  return new arrow.Schema([SCENARIO_ID_FIELD, ...PROFILE_TABLE_FIELDS].map(arrowField), md);
}

/** The grid's pressures and depths (depth from the sweep's rho_s and g), shared by every batch. */
export interface ProfileAxis {
  readonly pGpa: Float64Array;
  readonly depthKm: Float64Array;
}

/** The grid axis of a sweep: pressures (GPa) and their depths (km) from the sweep's rho_s and g. */
export function profileAxis(pressures: Float64Array, params: MeltParams): ProfileAxis {
  return { pGpa: pressures, depthKm: pressures.map((p) => depthKmFromPGpa(p, params.rho_s, params.g)) };
}

function floatData(values: Float64Array): arrow.Data<arrow.Float64> {
  const { bitmap, nullCount } = nanValidity(values);
  return arrow.makeData({ type: new arrow.Float64(), length: values.length, nullCount, nullBitmap: bitmap, data: values });
}

/** The record batch of a chunk's profile rows (scenario_id, grid axis, samples); null when the chunk carries no profiles. */
export function profileChunkToRecordBatch(chunk: ChunkResult, schema: arrow.Schema, axis: ProfileAxis): arrow.RecordBatch | null {
  const pr = chunk.profiles;
  if (pr === undefined) return null;
  const scenarios = chunk.end - chunk.start;
  const g = pr.points;
  const n = scenarios * g;
  const ids = new BigInt64Array(n);
  const p = new Float64Array(n);
  const z = new Float64Array(n);
  for (let i = 0; i < scenarios; i++) {
    const id = BigInt(chunk.start + i);
    const at = i * g;
    ids.fill(id, at, at + g);
    p.set(axis.pGpa, at);
    z.set(axis.depthKm, at);
  }
  const children: arrow.Data[] = [
    arrow.makeData({ type: new arrow.Int64(), length: n, nullCount: 0, data: ids }),
    floatData(p),
    floatData(z),
    floatData(pr.t_c),
    floatData(pr.f),
    floatData(pr.h2o_melt_wt_pct),
    floatData(pr.productivity_pct_per_gpa),
  ];
  return new arrow.RecordBatch(schema, arrow.makeData({ type: new arrow.Struct(schema.fields), length: n, nullCount: 0, children }));
}
