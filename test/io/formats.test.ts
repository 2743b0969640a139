/**
 * Independent readers open what meltsweep writes: Polars (nodejs-polars) reads the Arrow IPC file
 * and the CSV, DuckDB reads the Parquet file and the CSV; they agree with meltsweep's own reader
 * (apache-arrow) on row counts, column types and aggregates. CSV keeps full double precision.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import fs from 'node:fs';
import path from 'node:path';
import * as arrow from 'apache-arrow';
import pl from 'nodejs-polars';
import { DuckDBInstance } from '@duckdb/node-api';
import { validateSweep } from '../../src/spec/index.js';
import { runSweep } from '../../src/run/run-sweep.js';
import { mergeShards } from '../../src/run/merge.js';
import { INPUT_FIELDS, RESULT_NUMERIC_FIELDS, RESULT_NUMERIC_NAMES } from '../../src/physics/fields.js';
import { readTableBatches, readTableSchema, detectTableFormat } from '../../src/io/table-reader.js';
import { resolveOutputFormat, profilesPathFor } from '../../src/io/output-format.js';
import { batchToCsv, csvSidecarPath, CsvRecordParser, readCsvSidecar } from '../../src/io/csv-file.js';
import { InputError } from '../../src/errors.js';
import { readTable, tableColumns, tmpDir } from '../helpers.js';

const dir = tmpDir('formats');
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));

// wet and dry columns with and without a lid; the hottest ones start melting beyond the model range
const spec = validateSweep({
  name: 'format check F-1',
  axes: {
    tp_c: { from: 1250, to: 1500, count: 6 },
    water_ppm: { values: [0, 100, 1000] },
    lid_km: { values: [0, 15, 40] },
  },
  design: { kind: 'grid' },
  model: { thermal: 'isentropic', water: 'batch' },
});
const ROWS = 54;
const files = { arrow: path.join(dir, 'r.arrow'), parquet: path.join(dir, 'r.parquet'), csv: path.join(dir, 'r.csv') };

beforeAll(async () => {
  for (const f of Object.values(files)) await runSweep({ spec, outPath: f, workers: 2, chunkSize: 8 });
});

/** Mean of crust_km by status, nulls skipped (null when a status has no value), from apache-arrow. */
function meanCrustByStatus(t: arrow.Table): Record<string, number | null> {
  const cols = tableColumns(t);
  const sums: Record<string, { s: number; n: number }> = {};
  for (let i = 0; i < t.numRows; i++) {
    const st = String(cols.status[i]);
    const v = cols.crust_km[i] as number | null;
    sums[st] ??= { s: 0, n: 0 };
    if (v !== null) {
      sums[st].s += v;
      sums[st].n++;
    }
  }
  return Object.fromEntries(Object.entries(sums).map(([k, { s, n }]) => [k, n === 0 ? null : s / n]));
}

async function readAll(file: string): Promise<arrow.Table> {
  const batches: arrow.RecordBatch[] = [];
  for await (const b of readTableBatches(file)) batches.push(b);
  return new arrow.Table(batches);
}

function expectClose(a: number | null, b: number | null): void {
  if (a === null || b === null) {
    expect(a).toBe(b);
    return;
  }
  expect(Math.abs(a - b)).toBeLessThanOrEqual(1e-12 * Math.max(1, Math.abs(b)));
}

describe('output format choice', () => {
  it('follows --format, else the extension, else arrow', () => {
    expect(resolveOutputFormat('a.parquet')).toBe('parquet');
    expect(resolveOutputFormat('a.CSV')).toBe('csv');
    expect(resolveOutputFormat('a.feather')).toBe('arrow');
    expect(resolveOutputFormat('a.ipc')).toBe('arrow');
    expect(resolveOutputFormat('a.results')).toBe('arrow');
    expect(resolveOutputFormat('a.arrow', 'parquet')).toBe('parquet');
    expect(() => resolveOutputFormat('a.arrow', 'xlsx')).toThrow(InputError);
    expect(() => resolveOutputFormat('a.arrow', 'xlsx')).toThrow(/--format: "xlsx" is not a table format; choose one of arrow, parquet, csv/);
    expect(profilesPathFor('/x/r7.parquet')).toBe('/x/r7.profiles.parquet');
    expect(profilesPathFor('/x/r7')).toBe('/x/r7.profiles');
  });

  it('writes the format asked for, whatever the extension, and finds it from the bytes', async () => {
    const out = path.join(dir, 'as-parquet.dat');
    await runSweep({ spec, outPath: out, workers: 1, format: 'parquet' });
    expect(fs.readFileSync(out).subarray(0, 4).toString('latin1')).toBe('PAR1');
    expect(detectTableFormat(out)).toBe('parquet');
    expect(detectTableFormat(files.arrow)).toBe('arrow');
    expect(detectTableFormat(files.csv)).toBe('csv');
    expect(fs.readdirSync(dir).filter((n) => n.includes('.tmp-'))).toEqual([]);
  });
});

describe('Arrow IPC read by Polars', () => {
  it('gives the same rows, types and mean crust by status as apache-arrow', () => {
    const own = readTable(files.arrow);
    const df = pl.readIPC(fs.readFileSync(files.arrow));
    expect(df.height).toBe(ROWS);
    expect(df.columns).toEqual(own.schema.fields.map((f) => f.name));
    const types = Object.fromEntries(df.columns.map((c, i) => [c, String(df.dtypes[i]).replace(/^DataType\((.*)\)$/, '$1')]));
    expect(types.scenario_id).toBe('Int64');
    for (const f of [...INPUT_FIELDS, ...RESULT_NUMERIC_FIELDS]) expect(types[f.name], f.name).toBe('Float64');
    expect(types.status).toBe('Categorical');
    expect(types.reason).toBe('String');
    const agg = df.groupBy('status').agg(pl.col('crust_km').mean()).toRecords() as Array<{ status: string; crust_km: number | null }>;
    const mine = meanCrustByStatus(own);
    expect(agg.map((r) => r.status).sort()).toEqual(Object.keys(mine).sort());
    for (const r of agg) expectClose(r.crust_km, mine[r.status]);
    expect(Object.keys(mine)).toContain('onset_beyond_range'); // the test covers null rows
  });
});

describe('Parquet', () => {
  it('is read by DuckDB with the same rows, types and mean crust by status', async () => {
    const own = readTable(files.arrow);
    const db = await DuckDBInstance.create(':memory:');
    const con = await db.connect();
    try {
      const q = `'${files.parquet.replace(/'/g, "''")}'`;
      const desc = (await con.runAndReadAll(`DESCRIBE SELECT * FROM read_parquet(${q})`)).getRowObjects();
      const types = Object.fromEntries(desc.map((r) => [String(r.column_name), String(r.column_type)]));
      expect(Object.keys(types)).toEqual(own.schema.fields.map((f) => f.name));
      expect(types.scenario_id).toBe('BIGINT');
      for (const f of [...INPUT_FIELDS, ...RESULT_NUMERIC_FIELDS]) expect(types[f.name], f.name).toBe('DOUBLE');
      expect(types.status).toBe('VARCHAR');
      const rows = (await con.runAndReadAll(`SELECT status, avg(crust_km) AS m, count(*) AS n FROM read_parquet(${q}) GROUP BY status`)).getRowObjects();
      const mine = meanCrustByStatus(own);
      expect(rows.reduce((a, r) => a + Number(r.n), 0)).toBe(ROWS);
      for (const r of rows) expectClose(r.m === null ? null : Number(r.m), mine[String(r.status)]);
      // units and sweep metadata as plain key-value metadata too (for readers that skip ARROW:schema)
      const kv = (await con.runAndReadAll(`SELECT decode(key) AS k, decode(value) AS v FROM parquet_kv_metadata(${q})`)).getRowObjects();
      const map = new Map(kv.map((r) => [String(r.k), String(r.v)]));
      expect(map.has('ARROW:schema')).toBe(true);
      expect(JSON.parse(map.get('meltsweep.units')!).crust_km).toBe('km');
      expect(map.get('meltsweep.sweep_hash')).toBe(own.schema.metadata.get('meltsweep.sweep_hash'));
    } finally {
      con.closeSync();
      db.closeSync();
    }
  });

  it('keeps column names, types, units and sweep metadata through a round trip', async () => {
    const own = readTable(files.arrow);
    const schema = await readTableSchema(files.parquet);
    expect(schema.fields.map((f) => `${f.name}:${String(f.type)}:${f.metadata.get('unit')}`)).toEqual(
      own.schema.fields.map((f) => `${f.name}:${String(f.type)}:${f.metadata.get('unit')}`),
    );
    // the schema metadata comes back, plus the units key the Parquet footer carries for other readers
    // and the Parquet file's own data checksum (the Arrow file's meltsweep.data_crc32 belongs to that file only)
    const ownMeta = Object.fromEntries([...own.schema.metadata].filter(([k]) => k !== 'meltsweep.data_crc32'));
    expect(own.schema.metadata.get('meltsweep.data_crc32')).toMatch(/^[0-9a-f]{8}$/);
    expect(Object.fromEntries(schema.metadata)).toEqual({ ...ownMeta, 'meltsweep.units': expect.any(String), 'meltsweep.data_crc32': expect.stringMatching(/^[0-9a-f]{8}$/) });
    expect(schema.metadata.get('meltsweep.data_crc32')).not.toBe(own.schema.metadata.get('meltsweep.data_crc32'));
    expect(tableColumns(await readAll(files.parquet))).toEqual(tableColumns(own));
  });
});

describe('CSV', () => {
  it('round-trips every double bit for bit and writes nulls as empty fields', async () => {
    const own = tableColumns(readTable(files.arrow));
    const back = tableColumns(await readAll(files.csv));
    expect(back).toEqual(own);
    for (const name of [...RESULT_NUMERIC_NAMES, 'tp_c']) {
      for (let i = 0; i < ROWS; i++) {
        const a = own[name][i] as number | null;
        const b = back[name][i] as number | null;
        expect(a === null ? b === null : Object.is(a, b), `${name} row ${i}`).toBe(true);
      }
    }
    const text = fs.readFileSync(files.csv, 'utf8');
    const lines = text.trimEnd().split('\n');
    expect(lines[0]).toBe(readTable(files.arrow).schema.fields.map((f) => f.name).join(','));
    expect(lines).toHaveLength(ROWS + 1);
    const beyond = own.status.indexOf('onset_beyond_range');
    expect(beyond).toBeGreaterThanOrEqual(0);
    // upwelling is null on every row; a row beyond the range has null numbers and a quoted reason
    const fields = new CsvRecordParser().push(`${lines[beyond + 1]}\n`)[0];
    expect(fields[4]).toBeNull();
    expect(fields[5]).toBe('onset_beyond_range');
    expect(lines[beyond + 1]).toContain(',onset_beyond_range,"melting starts deeper than');
    expect(lines[beyond + 1]).toMatch(/,,,,,,,,,,,,$/); // the twelve numeric results are empty
  });

  it('is read by Polars and DuckDB with their defaults, to the same doubles', async () => {
    const own = tableColumns(readTable(files.arrow));
    const df = pl.readCSV(fs.readFileSync(files.csv));
    expect(df.height).toBe(ROWS);
    const crust = df.getColumn('crust_km').toArray() as Array<number | null>;
    for (let i = 0; i < ROWS; i++) {
      const a = own.crust_km[i] as number | null;
      expect(a === null ? crust[i] === null : Object.is(a, crust[i]), `row ${i}`).toBe(true);
    }
    const db = await DuckDBInstance.create(':memory:');
    const con = await db.connect();
    try {
      const rows = (await con.runAndReadAll(`SELECT f_max FROM read_csv('${files.csv}') ORDER BY scenario_id`)).getRowObjects();
      expect(rows.map((r) => (r.f_max === null ? null : Number(r.f_max)))).toEqual(own.f_max);
    } finally {
      con.closeSync();
      db.closeSync();
    }
  });

  it('puts units and the sweep metadata into the sidecar', () => {
    const sc = readCsvSidecar(files.csv);
    expect(fs.existsSync(csvSidecarPath(files.csv))).toBe(true);
    expect(sc.rows).toBe(ROWS);
    expect(sc.columns.find((c) => c.name === 'crust_km')).toMatchObject({ unit: 'km', arrow_type: 'Float64' });
    expect(sc.metadata['meltsweep.sweep_hash']).toMatch(/^[0-9a-f]{64}$/);
    expect(JSON.parse(sc.metadata['meltsweep.sweep']).name).toBe('format check F-1');
  });

  it('quotes text per RFC 4180 and keeps -0, tiny and huge numbers', () => {
    const reasons = ['plain', 'has "quotes", commas', 'two\nlines\r\nand CR', '', null];
    const values = [-0, 5e-324, 1.7976931348623157e308, 0.1 + 0.2, null];
    const t = new arrow.Table({
      reason: arrow.vectorFromArray(reasons, new arrow.Utf8()),
      x: arrow.vectorFromArray(values, new arrow.Float64()),
    });
    const csv = batchToCsv(t.batches[0]);
    const p = new CsvRecordParser();
    const recs = [...p.push(csv.slice(0, 17)), ...p.push(csv.slice(17)), ...p.end()];
    expect(recs.map((r) => r[0])).toEqual(reasons);
    expect(recs.map((r) => (r[1] === null ? null : Number(r[1])))).toEqual(values);
    expect(Object.is(Number(recs[0][1]), -0)).toBe(true);
  });
});

describe('merge in any format', () => {
  it('merges shards of different formats into Parquet equal to a single run', async () => {
    const a = path.join(dir, 'part-1.csv');
    const b = path.join(dir, 'part-2.arrow');
    await runSweep({ spec, outPath: a, workers: 1, shard: { k: 1, n: 2 } });
    await runSweep({ spec, outPath: b, workers: 1, shard: { k: 2, n: 2 } });
    const merged = path.join(dir, 'merged.parquet');
    const m = await mergeShards([b, a], merged);
    expect(m.format).toBe('parquet');
    expect(m.rows).toBe(ROWS);
    expect(m.profilesPath).toBeNull();
    expect(tableColumns(await readAll(merged))).toEqual(tableColumns(readTable(files.arrow)));
    await expect(mergeShards([a, b], merged)).rejects.toThrow(/already exists/);
  });
});
