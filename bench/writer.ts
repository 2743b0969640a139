/**
 * The Arrow writer alone: rows per second from computed chunks (typed arrays) to a published
 * IPC file, through the same path the engine takes (record batches from typed arrays, segments
 * committed atomically, then concatenated into the final file), with no physics in the loop.
 *
 * Run standalone: node dist/bench/writer.js
 */
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { RESULT_NUMERIC_NAMES } from '../src/physics/fields.js';
import { DEFAULT_PARAMS } from '../src/physics/params.js';
import type * as arrow from 'apache-arrow';
import { chunkToRecordBatch } from '../src/io/arrow-batch.js';
import { makeStatusDictionary, resultsSchema } from '../src/io/arrow-schema.js';
import { decompression } from '../src/process/decompression.js';
import { IpcFileSink } from '../src/io/ipc-file.js';
import { SegmentStore } from '../src/io/segment-store.js';
import type { ChunkResult } from '../src/run/compute-chunk.js';
import { formatBench, isMain, summarise, type BenchResult } from './util.js';

/** A synthetic chunk shaped like real results (a few nulls and failure reasons). */
function syntheticChunk(start: number, n: number): ChunkResult {
  const col = (f: (i: number) => number): Float64Array => Float64Array.from({ length: n }, (_, i) => f(i));
  const numeric = Object.fromEntries(
    RESULT_NUMERIC_NAMES.map((name, k) => [name, col((i) => (name === 'surface_heat_flow_mw_m2' ? NaN : Math.sin(i * 0.001 + k) * 10 + k))]),
  ) as ChunkResult['numeric'];
  const status = new Uint8Array(n);
  for (let i = 0; i < n; i += 97) status[i] = 1;
  return {
    start, end: start + n,
    points: { inputs: { tp_c: col((i) => 1250 + (i % 250)), water_ppm: col((i) => i % 500), lid_km: col((i) => i % 30), upwelling_mm_yr: col(() => NaN) }, block: null },
    status, numeric, reasons: [[0, 'synthetic reason']], computeMs: 0,
  };
}

export async function benchWriter(rows = 2_000_000, chunkRows = 4096, repetitions = 3): Promise<{ batches: BenchResult; engine: BenchResult }> {
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'meltsweep-bench-writer-'));
  const schema = resultsSchema({
    process: decompression.name, inputs: decompression.inputsFor({ params: {} }), results: decompression.results,
    sweepJson: '{}', sweepHash: 'bench', toolVersion: 'bench', params: DEFAULT_PARAMS, pointCount: rows,
    rowStart: 0, rowEnd: rows, shard: '1/1', blockLabels: null,
  });
  const chunks: ChunkResult[] = [];
  for (let s = 0; s < rows; s += chunkRows) chunks.push(syntheticChunk(s, Math.min(chunkRows, rows - s)));
  const direct: number[] = [];
  const engine: number[] = [];
  try {
    for (let rep = 0; rep < repetitions; rep++) {
      // 1. batches straight into one IPC file
      const dictionary = makeStatusDictionary();
      const file = path.join(dir, `direct-${rep}.arrow`);
      let t0 = performance.now();
      const sink = new IpcFileSink(file, `${file}.tmp`, schema);
      for (const c of chunks) await sink.write(chunkToRecordBatch(c, schema, dictionary));
      await sink.publish();
      direct.push(rows / ((performance.now() - t0) / 1000));
      fs.rmSync(file);
      // 2. the engine's path: segments of 262,144 rows committed (fsync), each also appended to
      //    the output under its temporary name; publication writes the footer and renames
      t0 = performance.now();
      const store = SegmentStore.create(path.join(dir, `seg-${rep}.partial`), { sweepHash: 'bench', rowStart: 0, rowEnd: rows, chunkSize: chunkRows, toolVersion: 'bench' });
      const out = path.join(dir, `engine-${rep}.arrow`);
      const final = new IpcFileSink(out, `${out}.tmp`, schema);
      let pending: arrow.RecordBatch[] = [];
      let segStart = 0;
      for (const c of chunks) {
        pending.push(chunkToRecordBatch(c, schema, dictionary));
        if (c.end - segStart >= 262_144 || c.end === rows) {
          await store.commit(segStart, c.end, pending);
          for (const b of pending) await final.write(b);
          pending = [];
          segStart = c.end;
        }
      }
      await final.publish();
      store.remove();
      engine.push(rows / ((performance.now() - t0) / 1000));
      fs.rmSync(out);
    }
  } finally {
    fs.rmSync(dir, { recursive: true, force: true });
  }
  return {
    batches: summarise('Arrow writer: batches to one IPC file', 'rows/s', direct),
    engine: summarise('Arrow writer: committed segments + output alongside (engine path)', 'rows/s', engine),
  };
}

if (isMain(import.meta.url)) {
  const r = await benchWriter();
  process.stdout.write(`${formatBench(r.batches)}\n${formatBench(r.engine)}\n`);
}
