/**
 * merge refuses damaged shards: a dropped CSV line, a bit flip in an Arrow or a Parquet shard, a
 * truncated Parquet shard, a shard of another meltsweep version. Nothing is published when a shard fails.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import fs from 'node:fs';
import path from 'node:path';
import { validateSweep } from '../../src/spec/index.js';
import { runSweep } from '../../src/run/run-sweep.js';
import { mergeShards } from '../../src/run/merge.js';
import { InputError } from '../../src/errors.js';
import { verifyTableChecksum } from '../../src/io/table-checksum.js';
import { parquetFooterStart } from '../../src/io/parquet-file.js';
import { readTable, tmpDir } from '../helpers.js';

const dir = tmpDir('merge-verify');
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));

const spec = validateSweep({
  name: 'merge check M-4',
  axes: { tp_c: { from: 1300, to: 1500, count: 20 }, water_ppm: { from: 0, to: 300, count: 20 } },
  design: { kind: 'grid' },
  model: { thermal: 'isentropic', water: 'batch' },
});

const shard = (k: number, ext: string): string => path.join(dir, `part-${k}.${ext}`);

beforeAll(async () => {
  for (const k of [1, 2]) {
    for (const ext of ['arrow', 'csv', 'parquet']) await runSweep({ spec, outPath: shard(k, ext), workers: 1, shard: { k, n: 2 } });
  }
}, 60_000);

/** Copies of the shards under new names (the CSV with its sidecar), to damage one of them. */
function copyShard(k: number, ext: string, name: string): string {
  const to = path.join(dir, `${name}.${ext}`);
  fs.copyFileSync(shard(k, ext), to);
  if (ext === 'csv') fs.copyFileSync(`${shard(k, ext)}.units.json`, `${to}.units.json`);
  return to;
}

function expectNothingPublished(out: string): void {
  expect(fs.existsSync(out)).toBe(false);
  expect(fs.readdirSync(dir).filter((n) => n.startsWith(`${path.basename(out)}.`))).toEqual([]);
}

describe('merge verifies every shard', () => {
  it('published tables carry a checksum that holds', async () => {
    for (const ext of ['arrow', 'csv', 'parquet']) expect(await verifyTableChecksum(shard(1, ext))).toEqual({ status: 'ok' });
    const m = await mergeShards([shard(2, 'csv'), shard(1, 'arrow')], path.join(dir, 'ok.arrow'));
    expect(m.rows).toBe(400);
    expect(readTable(path.join(dir, 'ok.arrow')).numRows).toBe(400);
  });

  it('a CSV shard with one line deleted is refused by its checksum', async () => {
    const damaged = copyShard(1, 'csv', 'dropped');
    const lines = fs.readFileSync(damaged, 'utf8').split('\n');
    lines.splice(57, 1);
    fs.writeFileSync(damaged, lines.join('\n'));
    const out = path.join(dir, 'dropped-merge.arrow');
    await expect(mergeShards([damaged, shard(2, 'csv')], out)).rejects.toThrow(InputError);
    await expect(mergeShards([damaged, shard(2, 'csv')], out)).rejects.toThrow(/dropped\.csv is damaged: its CRC-32 is/);
    expectNothingPublished(out);
  });

  it('without a checksum (older sidecar), the dropped line is still caught by the row ids', async () => {
    const damaged = copyShard(1, 'csv', 'unsummed');
    const sidecar = JSON.parse(fs.readFileSync(`${damaged}.units.json`, 'utf8')) as Record<string, unknown>;
    delete sidecar.data_crc32;
    fs.writeFileSync(`${damaged}.units.json`, JSON.stringify(sidecar));
    const lines = fs.readFileSync(damaged, 'utf8').split('\n');
    lines.splice(57, 1); // line 57 (0-based, after the header) holds scenario 56
    fs.writeFileSync(damaged, lines.join('\n'));
    const out = path.join(dir, 'unsummed-merge.arrow');
    await expect(mergeShards([damaged, shard(2, 'csv')], out)).rejects.toThrow(/scenario 57 found where scenario 56 belongs/);
    expectNothingPublished(out);
    // the last line dropped: the shard ends early
    const cut = copyShard(1, 'csv', 'cut');
    fs.writeFileSync(`${cut}.units.json`, JSON.stringify(sidecar));
    const text = fs.readFileSync(cut, 'utf8').trimEnd().split('\n');
    fs.writeFileSync(cut, `${text.slice(0, -1).join('\n')}\n`);
    await expect(mergeShards([cut, shard(2, 'csv')], out)).rejects.toThrow(/cut\.csv holds rows 0-199, but its metadata claims 0-200/);
    expectNothingPublished(out);
  });

  it('a bit flip in an Arrow shard is refused by its checksum', async () => {
    const damaged = copyShard(2, 'arrow', 'flipped');
    const bytes = fs.readFileSync(damaged);
    bytes[Math.floor(bytes.length / 2)] ^= 0x04;
    fs.writeFileSync(damaged, bytes);
    const out = path.join(dir, 'flipped-merge.arrow');
    await expect(mergeShards([shard(1, 'arrow'), damaged], out)).rejects.toThrow(/flipped\.arrow is damaged: its data CRC-32 is [0-9a-f]{8}, its footer recorded [0-9a-f]{8}/);
    expectNothingPublished(out);
  });

  it('Parquet shards carry a data checksum: merged when whole, refused after a bit flip or a cut', async () => {
    const merged = path.join(dir, 'from-parquet.parquet');
    const m = await mergeShards([shard(1, 'parquet'), shard(2, 'parquet')], merged);
    expect(m.rows).toBe(400);
    // the merged Parquet table is sealed too, and read back it passes
    expect(await verifyTableChecksum(merged)).toEqual({ status: 'ok' });
    const damaged = copyShard(2, 'parquet', 'flipped-pq');
    const bytes = fs.readFileSync(damaged);
    const fd = fs.openSync(damaged, 'r');
    const footerStart = parquetFooterStart(fd, bytes.length)!;
    fs.closeSync(fd);
    // one bit of a column chunk (the data before the footer)
    bytes[Math.floor(footerStart / 2)] ^= 0x10;
    fs.writeFileSync(damaged, bytes);
    const out = path.join(dir, 'flipped-pq-merge.arrow');
    await expect(mergeShards([shard(1, 'parquet'), damaged], out)).rejects.toThrow(/flipped-pq\.parquet is damaged: its data CRC-32 is [0-9a-f]{8}, its footer recorded [0-9a-f]{8}/);
    expectNothingPublished(out);
    // cut short: its footer is gone
    const cut = copyShard(2, 'parquet', 'cut-pq');
    fs.truncateSync(cut, fs.statSync(cut).size - 100);
    expect(await verifyTableChecksum(cut)).toEqual({ status: 'bad', why: 'its footer cannot be read (truncated or damaged)' });
    await expect(mergeShards([shard(1, 'parquet'), cut], out)).rejects.toThrow(/cut-pq\.parquet/);
    expectNothingPublished(out);
  });

  it('shards of different meltsweep versions are refused with a message saying so', async () => {
    const other = copyShard(2, 'csv', 'other-version');
    const sidecar = JSON.parse(fs.readFileSync(`${other}.units.json`, 'utf8')) as { metadata: Record<string, string> };
    sidecar.metadata['meltsweep.version'] = '0.0.1-other';
    fs.writeFileSync(`${other}.units.json`, JSON.stringify(sidecar));
    const out = path.join(dir, 'versions.arrow');
    await expect(mergeShards([shard(1, 'arrow'), other], out)).rejects.toThrow(/computed by meltsweep 0\.0\.1-other, .* by .*one table must not mix them/);
    expectNothingPublished(out);
  });

  it('refuses to write the merged table over one of its shards, even with force', async () => {
    await expect(mergeShards([shard(1, 'arrow'), shard(2, 'arrow')], shard(1, 'arrow'), { force: true })).rejects.toThrow(/is the input file/);
    expect(readTable(shard(1, 'arrow')).numRows).toBe(200);
  });
});
