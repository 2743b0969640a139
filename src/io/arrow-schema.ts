/**
 * The Arrow schema of a results table, derived from the sweep's process (src/process/: its
 * inputs and result fields) plus the sweep's metadata. Units travel in field metadata,
 * the sweep, its hash, the tool version and the model parameters in schema metadata.
 */
import * as arrow from 'apache-arrow';
import { REASON_FIELD, STATUS_FIELD, type FieldInfo } from '../physics/fields.js';
import { DEFAULT_PROCESS, processNamed, processNameOf, resultsOf } from '../process/registry.js';
import type { SweepSpec } from '../spec/types.js';
import { COLUMN_STATUSES } from '../physics/types.js';
import { PARAM_INFO, PARAM_NAMES, type MeltParams } from '../physics/params.js';
import { checkResultsMetadata } from './results-meta-check.js';

/** Metadata keys written by meltsweep (schema level). */
export const META = {
  sweep: 'meltsweep.sweep',
  sweepHash: 'meltsweep.sweep_hash',
  version: 'meltsweep.version',
  params: 'meltsweep.params',
  pointCount: 'meltsweep.point_count',
  rowRange: 'meltsweep.row_range',
  shard: 'meltsweep.shard',
  blockLabels: 'meltsweep.block_labels',
  table: 'meltsweep.table',
  profileGrid: 'meltsweep.profile_grid',
  /** the process that computed the rows (absent in tables written before processes: decompression) */
  process: 'meltsweep.process',
} as const;

export const STATUS_TYPE = new arrow.Dictionary(new arrow.Utf8(), new arrow.Int8(), 0, false);

/** One dictionary vector shared by every batch a writer sees (the IPC file format forbids replacements). */
export function makeStatusDictionary(): arrow.Vector<arrow.Utf8> {
  return arrow.vectorFromArray([...COLUMN_STATUSES], new arrow.Utf8());
}

export const SCENARIO_ID_FIELD: FieldInfo = {
  name: 'scenario_id', unit: '', label: 'scenario', displayUnit: '', kind: 'int64', nullable: false,
  description: 'index of the scenario in the sweep (0-based; stable across shards and resumes)',
};

export const BLOCK_FIELD: FieldInfo = {
  name: 'block', unit: '', label: 'sample block', displayUnit: '', kind: 'uint8', nullable: false,
  description: 'saltelli sample block: 0 = A, 1 = B, 2 + i = AB_i (labels in schema metadata meltsweep.block_labels)',
};

function fieldMeta(info: FieldInfo): Map<string, string> {
  const m = new Map<string, string>();
  m.set('unit', info.unit);
  m.set('description', info.description);
  return m;
}

/** The Arrow field of a registry entry, with its unit and description in field metadata. */
export function arrowField(info: FieldInfo): arrow.Field {
  const type =
    info.kind === 'float64' ? new arrow.Float64()
    : info.kind === 'int64' ? new arrow.Int64()
    : info.kind === 'uint8' ? new arrow.Uint8()
    : info.kind === 'status' ? STATUS_TYPE
    : new arrow.Utf8();
  return new arrow.Field(info.name, type, info.nullable, fieldMeta(info));
}

/** The columns a process gives a results table: its name, inputs and numeric results, in table order. */
export interface TableFields {
  readonly process: string;
  readonly inputs: readonly FieldInfo[];
  readonly results: readonly FieldInfo[];
}

/** The table fields of a spec: its process's inputs (under the spec's model options) and results. */
export function tableFieldsOf(spec: SweepSpec): TableFields {
  const name = processNameOf(spec);
  const process = processNamed(name, 'model.process');
  return { process: name, inputs: process.inputsFor(spec.model), results: resultsOf(process, spec.model) };
}

/** Column order of a results table: scenario_id, inputs, [block], status, reason, results. */
export function resultFieldInfos(fields: TableFields, withBlock: boolean): FieldInfo[] {
  return [
    SCENARIO_ID_FIELD,
    ...fields.inputs,
    ...(withBlock ? [BLOCK_FIELD] : []),
    STATUS_FIELD,
    REASON_FIELD,
    ...fields.results,
  ];
}

export interface ResultsTableMeta extends TableFields {
  readonly sweepJson: string;
  readonly sweepHash: string;
  readonly toolVersion: string;
  readonly params: MeltParams;
  readonly pointCount: number;
  readonly rowStart: number;
  readonly rowEnd: number;
  /** "k/n" of a shard, "1/1" for a whole sweep */
  readonly shard: string;
  /** saltelli block labels, by code; null for other designs */
  readonly blockLabels: readonly string[] | null;
}

/** Parameter values with their units, as written to metadata. */
function paramsWithUnits(params: MeltParams): Record<string, { value: number; unit: string }> {
  return Object.fromEntries(PARAM_NAMES.map((n) => [n, { value: params[n], unit: PARAM_INFO[n].unit }]));
}

export function resultsSchema(meta: ResultsTableMeta): arrow.Schema {
  const md = new Map<string, string>([
    [META.table, 'results'],
    [META.sweep, meta.sweepJson],
    [META.sweepHash, meta.sweepHash],
    [META.version, meta.toolVersion],
    [META.params, JSON.stringify(paramsWithUnits(meta.params))],
    [META.pointCount, String(meta.pointCount)],
    [META.rowRange, `${meta.rowStart}-${meta.rowEnd}`],
    [META.shard, meta.shard],
  ]);
  if (meta.blockLabels) md.set(META.blockLabels, JSON.stringify(meta.blockLabels));
  md.set(META.process, meta.process);
  return new arrow.Schema(resultFieldInfos(meta, meta.blockLabels !== null).map(arrowField), md);
}

/**
 * Read back the metadata written by resultsSchema, validated first (results-meta-check.ts).
 * @param file the table's path, named in messages
 * @throws InputError naming the file, each metadata key at fault and its problem
 */
export function readResultsMeta(schema: arrow.Schema, file = 'the table'): ResultsTableMeta & { sweep: unknown } {
  const md = schema.metadata;
  checkResultsMetadata(md, META, file);
  const get = (k: string): string => md.get(k) as string;
  const [rowStart, rowEnd] = get(META.rowRange).split('-').map(Number);
  const paramsMeta = JSON.parse(get(META.params)) as Record<string, { value: number }>;
  const params = Object.fromEntries(Object.entries(paramsMeta).map(([k, v]) => [k, v.value])) as unknown as MeltParams;
  const labels = md.get(META.blockLabels);
  const sweepJson = get(META.sweep);
  const sweep = JSON.parse(sweepJson) as SweepSpec;
  const processName = md.get(META.process) ?? DEFAULT_PROCESS;
  const process = processNamed(processName, `schema metadata ${META.process}`);
  return {
    process: processName,
    inputs: process.inputsFor(sweep.model),
    results: resultsOf(process, sweep.model),
    sweepJson,
    sweep,
    sweepHash: get(META.sweepHash),
    toolVersion: get(META.version),
    params,
    pointCount: Number(get(META.pointCount)),
    rowStart,
    rowEnd,
    shard: get(META.shard),
    blockLabels: labels === undefined ? null : (JSON.parse(labels) as string[]),
  };
}
