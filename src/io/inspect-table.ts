/**
 * What a table file holds, for `meltsweep inspect`: format, kind (results, profiles,
 * sensitivity), schema with units, the sweep metadata, row counts by status and the first rows.
 * Works on every format meltsweep writes (Arrow IPC, Parquet, CSV with its sidecar).
 */
import { checkResultsMetadata } from './results-meta-check.js';
import type * as arrow from 'apache-arrow';
import { InputError } from '../errors.js';
import { META } from './arrow-schema.js';
import type { OutputFormat } from './output-format.js';
import { detectTableFormat, readTableBatches, readTableSchema } from './table-reader.js';

/** One column of an inspected table. */
export interface InspectedColumn {
  readonly name: string;
  readonly type: string;
  readonly unit: string;
  readonly nullable: boolean;
  readonly description: string;
}

/** A cell of the first rows: numbers, text, or null. */
export type InspectedValue = number | string | boolean | null;

/** The result of inspectTable. */
export interface TableInspection {
  readonly file: string;
  readonly format: OutputFormat;
  /** meltsweep.table: results, profiles, sensitivity (or "unknown" for a table without it) */
  readonly table: string;
  readonly rows: number;
  readonly columns: readonly InspectedColumn[];
  /** labelled sweep metadata, in display order (label, value) */
  readonly about: ReadonlyArray<readonly [string, string]>;
  /** the schema metadata as stored */
  readonly metadata: Readonly<Record<string, string>>;
  /** rows by status, for tables with a status column; null otherwise */
  readonly statusCounts: Readonly<Record<string, number>> | null;
  /** the first rows (at most the number asked for), by column */
  readonly head: ReadonlyArray<Readonly<Record<string, InspectedValue>>>;
}

function cell(v: unknown): InspectedValue {
  if (v === null || v === undefined) return null;
  if (typeof v === 'bigint') return Number(v);
  if (typeof v === 'number' || typeof v === 'string' || typeof v === 'boolean') return v;
  return String(v);
}

function describeDesign(sweep: Record<string, unknown>): string {
  const d = sweep.design as Record<string, unknown> | undefined;
  if (d === undefined || typeof d.kind !== 'string') return 'unknown';
  const extras = Object.entries(d).filter(([k]) => k !== 'kind').map(([k, v]) => `${k} ${String(v)}`);
  return extras.length === 0 ? d.kind : `${d.kind} (${extras.join(', ')})`;
}

function aboutTable(md: ReadonlyMap<string, string>): Array<[string, string]> {
  const out: Array<[string, string]> = [];
  const sweepJson = md.get(META.sweep);
  if (sweepJson !== undefined) {
    try {
      const sweep = JSON.parse(sweepJson) as Record<string, unknown>;
      if (typeof sweep.name === 'string') out.push(['sweep', sweep.name]);
      out.push(['design', describeDesign(sweep)]);
      const axes = sweep.axes as Array<{ name?: string }> | undefined;
      if (Array.isArray(axes)) out.push(['swept inputs', axes.map((a) => a.name ?? '?').join(', ')]);
    } catch {
      out.push(['sweep', '(unreadable sweep metadata)']);
    }
  }
  const show: Array<[string, string]> = [
    ['design', 'meltsweep.design'],
    ['process', META.process],
    ['points in sweep', META.pointCount],
    ['row range', META.rowRange],
    ['shard', META.shard],
    ['sweep hash', META.sweepHash],
    ['meltsweep version', META.version],
    ['profile grid (GPa)', META.profileGrid],
    ['source', 'meltsweep.source'],
    ['counts', 'meltsweep.counts'],
  ];
  for (const [label, key] of show) {
    const v = md.get(key);
    if (v !== undefined && !(label === 'design' && out.some(([l]) => l === 'design'))) out.push([label, v]);
  }
  return out;
}

/**
 * Inspect a table file.
 * @param rows how many first rows to return (default 5)
 * @throws InputError when the file is missing or is not a table meltsweep can read
 */
export async function inspectTable(file: string, rows = 5): Promise<TableInspection> {
  const format = detectTableFormat(file);
  try {
    const schema = await readTableSchema(file);
    const md = schema.metadata;
    // a results table's metadata is checked before it is shown (other tables are shown as they are)
    if (md.get(META.table) === 'results') checkResultsMetadata(md, META, file);
    const columns = schema.fields.map((f: arrow.Field) => ({
      name: f.name,
      type: String(f.type),
      unit: f.metadata.get('unit') ?? '',
      nullable: f.nullable,
      description: f.metadata.get('description') ?? '',
    }));
    const head: Array<Record<string, InspectedValue>> = [];
    if (rows > 0) {
      for await (const batch of readTableBatches(file)) {
        for (let i = 0; i < batch.numRows && head.length < rows; i++) {
          const row: Record<string, InspectedValue> = {};
          for (const f of schema.fields) row[f.name] = cell(batch.getChild(f.name)?.get(i));
          head.push(row);
        }
        if (head.length >= rows) break;
      }
    }
    const hasStatus = schema.fields.some((f) => f.name === 'status');
    let total = 0;
    let statusCounts: Record<string, number> | null = null;
    if (hasStatus) {
      statusCounts = {};
      for await (const batch of readTableBatches(file, ['status'])) {
        const col = batch.getChild('status');
        total += batch.numRows;
        if (col === null) continue;
        for (let i = 0; i < batch.numRows; i++) {
          const s = String(col.get(i));
          statusCounts[s] = (statusCounts[s] ?? 0) + 1;
        }
      }
    } else {
      const first = schema.fields[0]?.name;
      for await (const batch of readTableBatches(file, first === undefined ? undefined : [first])) total += batch.numRows;
    }
    return {
      file, format, table: md.get(META.table) ?? 'unknown', rows: total, columns,
      about: aboutTable(md), metadata: Object.fromEntries(md), statusCounts, head,
    };
  } catch (err) {
    if (err instanceof InputError) throw err;
    throw new InputError(`${file}: cannot read it as a ${format} table (${err instanceof Error ? err.message : String(err)})`);
  }
}

function formatCell(v: InspectedValue): string {
  if (v === null) return 'null';
  if (typeof v !== 'number') return String(v);
  if (v === 0 || !Number.isFinite(v)) return String(v);
  const a = Math.abs(v);
  return a >= 1e-3 && a < 1e7 ? String(Number(v.toPrecision(7))) : v.toExponential(5);
}

function textTable(header: readonly string[], body: ReadonlyArray<readonly string[]>, maxWidth = 40): string {
  const clip = (s: string): string => (s.length > maxWidth ? `${s.slice(0, maxWidth - 3)}...` : s);
  const rows = [header, ...body].map((r) => r.map(clip));
  const widths = header.map((_, c) => Math.max(...rows.map((r) => r[c].length)));
  return rows.map((r) => r.map((s, c) => s.padEnd(widths[c])).join('  ').trimEnd()).join('\n');
}

/** The inspection as readable text: summary, metadata, schema with units, counts, first rows. */
export function formatInspection(x: TableInspection): string {
  const fmt = (n: number): string => n.toLocaleString('en-US');
  const lines: string[] = [`file: ${x.file}`, `format: ${x.format}`, `table: ${x.table}`, `rows: ${fmt(x.rows)}`];
  for (const [label, value] of x.about) lines.push(`${label}: ${value.length > 200 ? `${value.slice(0, 197)}...` : value}`);
  if (x.statusCounts !== null) {
    lines.push(`rows by status: ${Object.entries(x.statusCounts).map(([s, n]) => `${s} ${fmt(n)}`).join(', ') || 'none'}`);
  }
  lines.push('', 'columns:');
  lines.push(textTable(['name', 'type', 'unit', 'description'], x.columns.map((c) => [c.name, `${c.type}${c.nullable ? '?' : ''}`, c.unit || '-', c.description]), 90));
  lines.push('', `first ${x.head.length} row(s):`);
  if (x.head.length > 0) {
    const names = x.columns.map((c) => c.name);
    lines.push(textTable(names, x.head.map((r) => names.map((n) => formatCell(r[n] ?? null))), 24));
  }
  return lines.join('\n');
}
