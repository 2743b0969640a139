/**
 * Damaged state never yields a short table with exit 0: damaged, emptied, truncated and deleted
 * segments are named and recomputed; a corrupt manifest or another version is refused without
 * touching anything; the rows of a publication must cover the range exactly once.
 */
import { beforeAll, describe, expect, it } from 'vitest';
import crypto from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';
import * as arrow from 'apache-arrow';
import { validateSweep } from '../../src/spec/index.js';
import { runSweep } from '../../src/run/run-sweep.js';
import { checkScenarioIds } from '../../src/run/publication.js';
import { crc32, crc32Portable } from '../../src/io/checksum.js';
import { InputError, RunError } from '../../src/errors.js';
import { runCliSync, scratchDir } from '../helpers.js';

const dir = scratchDir('integrity');

const SWEEP_YAML = `
name: integrity test I-1
axes:
  tp_c: { from: 1280, to: 1520, count: 20 }
  water_ppm: { from: 0, to: 500, count: 15 }
  lid_km: { values: [0, 30, 60, 90] }
design: { kind: grid }
model: { thermal: isentropic, water: batch }
`;
const CHUNK = 100;
const SEGMENT_ROWS = 200;

const sweepFile = path.join(dir, 'i1.yaml');
let spec: ReturnType<typeof validateSweep>;
let reference = '';
let partialTemplate = '';

function sha256(file: string): string {
  return crypto.createHash('sha256').update(fs.readFileSync(file)).digest('hex');
}

function segmentNames(partial: string): string[] {
  return fs.readdirSync(partial).filter((n) => /^seg-\d+-\d+\.arrows$/.test(n)).sort();
}

/** A fresh copy of the interrupted run (3 or more of 6 segments committed) at `name`.arrow. */
function interruptedCopy(name: string): { out: string; partial: string; segments: string[] } {
  const out = path.join(dir, `${name}.arrow`);
  const partial = `${out}.partial`;
  fs.cpSync(partialTemplate, partial, { recursive: true });
  return { out, partial, segments: segmentNames(partial) };
}

function resumeCli(out: string, extra: string[] = []) {
  return runCliSync(['run', sweepFile, '-o', out, '--resume', '--workers', '2', '--quiet', '--no-summary', ...extra]);
}

beforeAll(async () => {
  fs.writeFileSync(sweepFile, SWEEP_YAML);
  const { loadSweepFile } = await import('../../src/spec/index.js');
  spec = await loadSweepFile(sweepFile);
  reference = path.join(dir, 'reference.arrow');
  await runSweep({ spec, outPath: reference, workers: 2, chunkSize: CHUNK, segmentRows: SEGMENT_ROWS });
  // an interrupted run: stopped once 600 of 1,200 rows are committed (3 segments of 200; the chunks in the
  // window may add a few more)
  const template = path.join(dir, 'template.arrow');
  const controller = new AbortController();
  const first = await runSweep({
    spec, outPath: template, workers: 1, chunkSize: CHUNK, segmentRows: SEGMENT_ROWS, signal: controller.signal,
    progress: { update: (done) => { if (done >= 600) controller.abort(); }, finish: () => undefined },
  });
  expect(first.interrupted).toBe(true);
  partialTemplate = `${template}.partial`;
  expect(segmentNames(partialTemplate).length).toBeGreaterThanOrEqual(3);
}, 120_000);

describe('CRC-32', () => {
  it('matches the standard check value and the table implementation', () => {
    // check value of CRC-32/ISO-HDLC for "123456789" (the CRC catalogue's standard check)
    expect(crc32(Buffer.from('123456789'))).toBe(0xcbf43926);
    expect(crc32Portable(Buffer.from('123456789'))).toBe(0xcbf43926);
    const bytes = crypto.randomBytes(10_000);
    expect(crc32Portable(bytes.subarray(5000), crc32Portable(bytes.subarray(0, 5000)))).toBe(crc32(bytes));
  });
});

describe('resume verifies every committed segment', () => {
  const damage: Array<[string, (file: string) => void, RegExp]> = [
    ['emptied', (f) => fs.writeFileSync(f, ''), /is empty/],
    ['truncated', (f) => fs.truncateSync(f, Math.floor(fs.statSync(f).size / 2)), /bytes, \d+ were committed/],
    ['deleted', (f) => fs.rmSync(f), /is missing/],
    ['bit-flipped', (f) => {
      const b = fs.readFileSync(f);
      b[Math.floor(b.length * 0.6)] ^= 0x10;
      fs.writeFileSync(f, b);
    }, /fails its checksum/],
  ];
  for (const [kind, harm, message] of damage) {
    it(`a ${kind} middle segment is named, recomputed, and the table equals an uninterrupted run`, async () => {
      const { out, partial, segments } = interruptedCopy(kind);
      harm(path.join(partial, segments[1]));
      const s = await runSweep({ spec, outPath: out, workers: 2, resume: true });
      expect(s.interrupted).toBe(false);
      expect(s.repairedSegments.map((r) => r.name)).toEqual([segments[1]]);
      expect(s.repairedSegments[0].why).toMatch(message);
      const rowsOf = (name: string): number => {
        const [, a, b] = /^seg-(\d+)-(\d+)/.exec(name)!;
        return Number(b) - Number(a);
      };
      const keptRows = segments.filter((n) => n !== segments[1]).reduce((n, name) => n + rowsOf(name), 0);
      expect(s.computedRows).toBe(1200 - keptRows);
      expect(fs.existsSync(partial)).toBe(false);
      expect(sha256(out)).toBe(sha256(reference));
    }, 60_000);
  }

  it('the command line names the damaged segment and exits 0 only with the whole table', () => {
    const { out, partial, segments } = interruptedCopy('cli');
    fs.writeFileSync(path.join(partial, segments[1]), '');
    const r = resumeCli(out);
    expect(r.status, r.stderr).toBe(0);
    expect(r.stderr).toContain(`resume: committed segment ${segments[1]} is empty; its rows were computed again`);
    expect(sha256(out)).toBe(sha256(reference));
  }, 60_000);

  it('a torn journal line (crash while appending) costs only that segment', async () => {
    const { out, partial, segments } = interruptedCopy('torn');
    const journal = path.join(partial, 'segments.jsonl');
    const text = fs.readFileSync(journal, 'utf8');
    fs.writeFileSync(journal, text.slice(0, text.length - 20));
    const s = await runSweep({ spec, outPath: out, workers: 2, resume: true });
    expect(s.repairedSegments).toEqual([{ name: segments[segments.length - 1], why: 'not recorded in the journal' }]);
    expect(sha256(out)).toBe(sha256(reference));
  }, 60_000);

  it('a corrupt manifest is refused naming it; nothing in the folder is touched; --force starts over', async () => {
    const { out, partial } = interruptedCopy('manifest');
    fs.writeFileSync(path.join(partial, 'manifest.json'), '{"sweepHash": "abc", "rowSt');
    const before = fs.readdirSync(partial).sort();
    await expect(runSweep({ spec, outPath: out, workers: 2, resume: true })).rejects.toThrow(InputError);
    await expect(runSweep({ spec, outPath: out, workers: 2, resume: true })).rejects.toThrow(/manifest\.json is not valid JSON.*--force/s);
    expect(fs.readdirSync(partial).sort()).toEqual(before);
    expect(fs.existsSync(out)).toBe(false);
    await runSweep({ spec, outPath: out, workers: 2, force: true, chunkSize: CHUNK });
    expect(sha256(out)).toBe(sha256(reference));
  }, 60_000);

  it('a partial run of another meltsweep version is refused with a message saying so (exit 2)', () => {
    const { out, partial } = interruptedCopy('version');
    const file = path.join(partial, 'manifest.json');
    const m = JSON.parse(fs.readFileSync(file, 'utf8')) as Record<string, unknown>;
    fs.writeFileSync(file, JSON.stringify({ ...m, toolVersion: '0.0.1-other' }));
    const r = resumeCli(out);
    expect(r.status).toBe(2);
    expect(r.stderr).toMatch(/computed by meltsweep 0\.0\.1-other, this is .*another version may compute different numbers/);
    expect(segmentNames(partial).length).toBeGreaterThanOrEqual(3);
  }, 60_000);
});

describe('publication covers the range exactly once', () => {
  const schema = new arrow.Schema([new arrow.Field('scenario_id', new arrow.Int64(), false)]);
  const batch = (ids: number[]): arrow.RecordBatch =>
    new arrow.RecordBatch(schema, arrow.makeData({
      type: new arrow.Struct(schema.fields), length: ids.length, nullCount: 0,
      children: [arrow.makeData({ type: new arrow.Int64(), length: ids.length, nullCount: 0, data: BigInt64Array.from(ids.map(BigInt)) })],
    }));

  it('accepts consecutive ids and returns the next one', () => {
    expect(checkScenarioIds(batch([10, 11, 12]), 10, 'test')).toBe(13);
  });
  it('refuses a gap, a repeat or a wrong start, naming the row', () => {
    expect(() => checkScenarioIds(batch([10, 12]), 10, 'test')).toThrow(RunError);
    expect(() => checkScenarioIds(batch([10, 12]), 10, 'test')).toThrow(/scenario 12 found where scenario 11 belongs/);
    expect(() => checkScenarioIds(batch([10, 10]), 10, 'test')).toThrow(/scenario 10 found where scenario 11/);
    expect(() => checkScenarioIds(batch([11]), 10, 'test')).toThrow(/scenario 11 found where scenario 10/);
  });
  it('a run whose segments were altered consistently (journal forged too) is refused before publication', async () => {
    const { out, partial, segments } = interruptedCopy('forged');
    // a segment whose rows are another segment's: the journal is made to vouch for it
    const journal = path.join(partial, 'segments.jsonl');
    const lines = fs.readFileSync(journal, 'utf8').trim().split('\n').map((l) => JSON.parse(l) as Record<string, unknown>);
    fs.copyFileSync(path.join(partial, segments[0]), path.join(partial, segments[1]));
    lines[1] = { ...lines[1], bytes: lines[0].bytes, crc32: lines[0].crc32 };
    fs.writeFileSync(journal, lines.map((l) => `${JSON.stringify(l)}\n`).join(''));
    await expect(runSweep({ spec, outPath: out, workers: 2, resume: true })).rejects.toThrow(RunError);
    await expect(runSweep({ spec, outPath: out, workers: 2, resume: true })).rejects.toThrow(/scenario 0 found where scenario 200 belongs/);
    expect(fs.existsSync(out)).toBe(false);
    expect(fs.readdirSync(dir).filter((n) => n.startsWith('forged.arrow.tmp-'))).toEqual([]);
  }, 60_000);
});
