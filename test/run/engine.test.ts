import { afterAll, describe, expect, it } from 'vitest';
import fs from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { validateSweep } from '../../src/spec/index.js';
import { runSweep } from '../../src/run/run-sweep.js';
import { mergeShards } from '../../src/run/merge.js';
import { readResultsMeta } from '../../src/io/arrow-schema.js';
import { RESULT_NUMERIC_FIELDS, INPUT_FIELDS } from '../../src/physics/fields.js';
import { InputError } from '../../src/errors.js';
import { readTable, tableColumns, tmpDir } from '../helpers.js';

const dir = tmpDir('engine');
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));

// A small wet/dry grid with a lid: 6 x 4 x 3 = 72 points, isentropic.
const spec = validateSweep({
  name: 'test ridge T-1',
  axes: {
    tp_c: { from: 1250, to: 1500, count: 6 },
    water_ppm: { values: [0, 100, 300, 1000] },
    lid_km: { values: [0, 15, 40] },
  },
  fixed: { upwelling_mm_yr: 20 },
  design: { kind: 'grid' },
  model: { thermal: 'isentropic', water: 'batch' },
});

describe('runSweep', () => {
  it('writes one row per scenario, in scenario order, with units and sweep metadata', async () => {
    const out = path.join(dir, 'a.arrow');
    const s = await runSweep({ spec, outPath: out, workers: 2, chunkSize: 10 });
    expect(s.rows).toBe(72);
    expect(s.interrupted).toBe(false);
    expect(fs.existsSync(`${out}.partial`)).toBe(false);
    const t = readTable(out);
    expect(t.numRows).toBe(72);
    const ids = tableColumns(t).scenario_id;
    expect(ids).toEqual(Array.from({ length: 72 }, (_, i) => i));
    // grid order: the last axis (lid_km) varies fastest
    expect(tableColumns(t).lid_km.slice(0, 4)).toEqual([0, 15, 40, 0]);
    // every registry field is present with its unit in field metadata
    for (const f of [...INPUT_FIELDS, ...RESULT_NUMERIC_FIELDS]) {
      const field = t.schema.fields.find((x) => x.name === f.name);
      expect(field, f.name).toBeDefined();
      expect(field!.metadata.get('unit')).toBe(f.unit);
      expect(String(field!.type)).toBe('Float64');
    }
    expect(String(t.schema.fields.find((x) => x.name === 'status')!.type)).toBe('Dictionary<Int8, Utf8>');
    expect(String(t.schema.fields.find((x) => x.name === 'scenario_id')!.type)).toBe('Int64');
    const meta = readResultsMeta(t.schema);
    expect(meta.pointCount).toBe(72);
    expect(meta.sweepHash).toMatch(/^[0-9a-f]{64}$/);
    expect(meta.params.M_cpx).toBe(0.17); // default, Katz et al. (2003) Table 2 (from memory)
    expect((meta.sweep as { name: string }).name).toBe('test ridge T-1');
    // counts add up to the rows, and melting happened somewhere
    const total = Object.values(s.counts).reduce((a, b) => a + b, 0);
    expect(total).toBe(72);
    expect(s.counts.ok).toBeGreaterThan(0);
    // an ok row has no null numeric field except the conductive-only heat flow
    const cols = tableColumns(t);
    for (let i = 0; i < 72; i++) {
      if (cols.status[i] !== 'ok') continue;
      for (const f of RESULT_NUMERIC_FIELDS) {
        if (f.name === 'surface_heat_flow_mw_m2') continue;
        expect(Number.isFinite(cols[f.name][i] as number), `${f.name} row ${i}`).toBe(true);
      }
    }
  });

  it('gives identical data with 1 and 2 workers and any chunk size', async () => {
    const one = path.join(dir, 'w1.arrow');
    const two = path.join(dir, 'w2.arrow');
    await runSweep({ spec, outPath: one, workers: 1 });
    await runSweep({ spec, outPath: two, workers: 2, chunkSize: 7 });
    expect(tableColumns(readTable(two))).toEqual(tableColumns(readTable(one)));
  });

  it('refuses an existing output without --force, before any work', async () => {
    const out = path.join(dir, 'exists.arrow');
    fs.writeFileSync(out, 'not arrow');
    await expect(runSweep({ spec, outPath: out, workers: 1 })).rejects.toThrow(InputError);
    await expect(runSweep({ spec, outPath: out, workers: 1 })).rejects.toThrow(/already exists; use --force/);
    expect(fs.existsSync(`${out}.partial`)).toBe(false);
  });

  it('refuses a missing output folder before any work', async () => {
    await expect(runSweep({ spec, outPath: path.join(dir, 'nope', 'x.arrow'), workers: 1 })).rejects.toThrow(/does not exist/);
  });

  it('shards merged together equal a single run; gaps and overlaps are refused', async () => {
    const whole = path.join(dir, 'whole.arrow');
    await runSweep({ spec, outPath: whole, workers: 2 });
    const parts = [1, 2, 3].map((k) => path.join(dir, `shard-${k}.arrow`));
    for (const [i, p] of parts.entries()) await runSweep({ spec, outPath: p, workers: 1, shard: { k: i + 1, n: 3 } });
    const merged = path.join(dir, 'merged.arrow');
    const m = await mergeShards([parts[2], parts[0], parts[1]], merged);
    expect(m.rows).toBe(72);
    expect(tableColumns(readTable(merged))).toEqual(tableColumns(readTable(whole)));
    await expect(mergeShards([parts[0], parts[2]], path.join(dir, 'gap.arrow'))).rejects.toThrow(/are missing/);
    await expect(mergeShards([parts[0], parts[0], parts[1], parts[2]], path.join(dir, 'dup.arrow'))).rejects.toThrow(/covered twice/);
  });

  it('stops cleanly when aborted and finishes with resume to the same table', async () => {
    const out = path.join(dir, 'resumed.arrow');
    const controller = new AbortController();
    let seen = 0;
    const first = await runSweep({
      spec, outPath: out, workers: 1, chunkSize: 8, segmentRows: 8, signal: controller.signal,
      progress: { update: (done) => { seen = done; if (done >= 24) controller.abort(); }, finish: () => undefined },
    });
    expect(seen).toBeGreaterThanOrEqual(24);
    expect(first.interrupted).toBe(true);
    expect(first.rows).toBeLessThan(72);
    expect(fs.existsSync(out)).toBe(false);
    await expect(runSweep({ spec, outPath: out, workers: 1 })).rejects.toThrow(/use --resume/);
    const replayed: number[] = [];
    const second = await runSweep({
      spec, outPath: out, workers: 2, resume: true,
      progress: { replayed: (rows) => replayed.push(rows), update: () => undefined, finish: () => undefined },
    });
    expect(second.computedRows).toBe(72 - first.rows);
    // the progress is told once, before computing, how many rows the resume took over
    expect(replayed).toEqual([first.rows]);
    const reference = path.join(dir, 'w1.arrow');
    expect(tableColumns(readTable(out))).toEqual(tableColumns(readTable(reference)));
  });
});

describe('worker faults', () => {
  const flaky = fileURLToPath(new URL('../fixtures/flaky-worker.mjs', import.meta.url));
  const reference = (): Record<string, unknown[]> => tableColumns(readTable(path.join(dir, 'w1.arrow')));

  /** Run the test sweep with the fault-injecting worker: `kind` strikes the chunk starting at `start`. */
  async function runWithFault(kind: string, start: number, name: string) {
    const faultDir = tmpDir(`fault-${kind}`);
    process.env.FAULT_DIR = faultDir;
    process.env.FAULT_START = String(start);
    process.env.FAULT_KIND = kind;
    try {
      const out = path.join(dir, `${name}.arrow`);
      const summary = await runSweep({ spec, outPath: out, workers: 2, chunkSize: 8, workerFile: flaky });
      return { summary, cols: tableColumns(readTable(out)) };
    } finally {
      delete process.env.FAULT_DIR;
      fs.rmSync(faultDir, { recursive: true, force: true });
    }
  }

  it('retries a chunk whose worker threw once; the table is unchanged', async () => {
    const { summary, cols } = await runWithFault('throw-once', 16, 'retry');
    expect(summary.retriedChunks).toBe(1);
    expect(summary.lostChunks).toBe(0);
    expect(cols).toEqual(reference());
  });

  it('records the rows of a chunk that fails twice as failed, with the reason, and completes', async () => {
    const { summary, cols } = await runWithFault('throw-always', 24, 'lost');
    expect(summary.lostChunks).toBe(1);
    expect(summary.counts.failed).toBeGreaterThanOrEqual(8);
    for (let i = 24; i < 32; i++) {
      expect(cols.status[i]).toBe('failed');
      expect(String(cols.reason[i])).toContain('injected fault at row 24');
      expect(cols.crust_km[i]).toBeNull();
    }
    const ref = reference();
    expect(cols.crust_km.slice(0, 24)).toEqual(ref.crust_km.slice(0, 24));
    expect(cols.crust_km.slice(32)).toEqual(ref.crust_km.slice(32));
  });

  it('survives a worker thread that exits abruptly', async () => {
    const { summary, cols } = await runWithFault('exit-once', 40, 'exit');
    expect(summary.retriedChunks).toBe(1);
    expect(cols).toEqual(reference());
  });
});
