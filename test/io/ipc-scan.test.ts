/** The buffer-reusing IPC scan reads exactly what the library's reader reads. */
import { afterAll, describe, expect, it } from 'vitest';
import * as arrow from 'apache-arrow';
import fs from 'node:fs';
import path from 'node:path';
import { canScanIpcFiles, isIpcFile, scanIpcFile } from '../../src/io/ipc-scan.js';
import { IpcFileSink } from '../../src/io/ipc-file.js';
import { tmpDir } from '../helpers.js';

const dir = tmpDir('ipc-scan');
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));

describe('scanIpcFile', () => {
  it('gives the same batches as the library reader (large bodies in reused buffers, a dictionary, nulls)', async () => {
    expect(canScanIpcFiles()).toBe(true);
    const file = path.join(dir, 't.arrow');
    const dictionary = arrow.vectorFromArray(['ok', 'failed'], new arrow.Utf8());
    const type = new arrow.Dictionary(new arrow.Utf8(), new arrow.Int8(), 0, false);
    const schema = new arrow.Schema([new arrow.Field('x', new arrow.Float64(), true), new arrow.Field('s', type, false)]);
    const sink = new IpcFileSink(file, `${file}.tmp`, schema);
    const rows = 20_000;
    for (let b = 0; b < 5; b++) {
      const x = Float64Array.from({ length: rows }, (_, i) => b * rows + i);
      const bitmap = new Uint8Array(rows / 8).fill(0xff);
      bitmap[3] = 0xfe; // row 24 of each batch is null
      const codes = Int8Array.from({ length: rows }, (_, i) => (i % 7 === 0 ? 1 : 0));
      const children = [
        arrow.makeData({ type: new arrow.Float64(), length: rows, nullCount: 1, nullBitmap: bitmap, data: x }),
        arrow.makeData({ type, length: rows, nullCount: 0, data: codes, dictionary }),
      ];
      await sink.write(new arrow.RecordBatch(schema, arrow.makeData({ type: new arrow.Struct(schema.fields), length: rows, nullCount: 0, children })));
    }
    await sink.publish();
    expect(isIpcFile(file)).toBe(true);
    const expected = arrow.tableFromIPC(fs.readFileSync(file));
    let at = 0;
    for (const batch of scanIpcFile(file)) {
      for (const r of [0, 24, 7, rows - 1]) {
        expect(batch.getChild('x')!.get(r)).toBe(expected.getChild('x')!.get(at + r));
        expect(batch.getChild('s')!.get(r)).toBe(expected.getChild('s')!.get(at + r));
      }
      expect(batch.getChild('x')!.nullCount).toBe(1);
      at += batch.numRows;
    }
    expect(at).toBe(5 * rows);
  });
});
