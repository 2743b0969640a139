import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import fs from 'node:fs';
import path from 'node:path';
import * as arrow from 'apache-arrow';
import { InputError } from '../../src/errors.js';
import { META, readResultsMeta } from '../../src/io/arrow-schema.js';
import { runSweep } from '../../src/run/run-sweep.js';
import { validateSweep } from '../../src/spec/index.js';
import { readTable, runCliSync, tmpDir } from '../helpers.js';

const dir = tmpDir('meta');
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));
const good = path.join(dir, 'good.arrow');

beforeAll(async () => {
  const spec = validateSweep({ name: 'ridge R-3 metadata', axes: { tp_c: { values: [1300, 1350, 1400] } }, design: { kind: 'grid' }, model: { thermal: 'isentropic' } });
  await runSweep({ spec, outPath: good, workers: 1 });
});

/** A copy of the good table whose schema metadata is changed by `edit`. */
function corrupt(name: string, edit: (md: Map<string, string>) => void): string {
  const t = readTable(good);
  const md = new Map(t.schema.metadata);
  edit(md);
  const schema = new arrow.Schema(t.schema.fields, md);
  const out = path.join(dir, name);
  fs.writeFileSync(out, arrow.tableToIPC(new arrow.Table(schema, t.batches.map((b) => new arrow.RecordBatch(schema, b.data))), 'file'));
  return out;
}

function problems(file: string): readonly string[] {
  try {
    readResultsMeta(readTable(file).schema, file);
  } catch (err) {
    expect(err).toBeInstanceOf(InputError);
    return (err as InputError).problems;
  }
  throw new Error('no error');
}

describe('results metadata read back from a file is validated', () => {
  it('a good table reads', () => {
    expect(readResultsMeta(readTable(good).schema, good).pointCount).toBe(3);
  });

  it('names the file, the key and the problem', () => {
    const bad = corrupt('count.arrow', (md) => md.set(META.pointCount, 'three'));
    expect(problems(bad)).toEqual([`${bad}: invalid results metadata: meltsweep.point_count: "three" is not a whole number`]);
    const range = corrupt('range.arrow', (md) => md.set(META.rowRange, '0-9'));
    expect(problems(range)).toEqual([`${range}: invalid results metadata: meltsweep.row_range: 0-9 is not a range of rows inside the sweep's 3 points`]);
    const json = corrupt('json.arrow', (md) => md.set(META.sweep, '{"name": '));
    expect(problems(json)[0]).toMatch(new RegExp(`^${json.replace(/[.*+?^${}()|[\]\\]/g, '\\$&')}: invalid results metadata: meltsweep.sweep: is not valid JSON \\(`));
    const missing = corrupt('missing.arrow', (md) => md.delete(META.params));
    expect(problems(missing)).toEqual([`${missing} is not a meltsweep results table: schema metadata meltsweep.params is missing`]);
  });

  it('checks the stored sweep: its shape and a model section its process accepts', () => {
    const shape = corrupt('shape.arrow', (md) => {
      const s = JSON.parse(md.get(META.sweep)!) as { axes: { min: unknown }[] };
      s.axes[0].min = 'low';
      md.set(META.sweep, JSON.stringify(s));
    });
    expect(problems(shape)).toEqual([`${shape}: invalid results metadata: meltsweep.sweep axes.0.min: Invalid input: expected number, received string`]);
    const model = corrupt('model.arrow', (md) => {
      const s = JSON.parse(md.get(META.sweep)!) as { model: Record<string, unknown> };
      s.model.thermal = 'lukewarm';
      md.set(META.sweep, JSON.stringify(s));
    });
    expect(problems(model)).toEqual([`${model}: invalid results metadata: meltsweep.sweep: model.thermal: "lukewarm" is not a thermal model; allowed: isentropic, conductive, auto`]);
    const params = corrupt('params.arrow', (md) => {
      const p = JSON.parse(md.get(META.params)!) as Record<string, { value: unknown }>;
      delete p.M_cpx;
      md.set(META.params, JSON.stringify(p));
    });
    expect(problems(params)).toEqual([`${params}: invalid results metadata: meltsweep.params: lacks M_cpx`]);
  });

  it('sensitivity and inspect refuse such a file with exit 2 and the message', () => {
    const bad = corrupt('cli.arrow', (md) => md.set(META.shard, 'all'));
    for (const args of [['sensitivity', bad], ['inspect', bad]]) {
      const r = runCliSync(args);
      expect(r.status, r.stderr).toBe(2);
      expect(r.stderr).toContain(`${bad}: invalid results metadata: meltsweep.shard: "all" is not K/N`);
    }
    const merged = runCliSync(['merge', bad, '-o', path.join(dir, 'm.arrow')]);
    expect(merged.status).toBe(2);
    expect(merged.stderr).toContain(`merge: ${bad}: invalid results metadata: meltsweep.shard: "all" is not K/N`);
    const rep = runCliSync(['report', bad, '-o', path.join(dir, 'r.html')]);
    expect(rep.status).toBe(2);
    expect(rep.stderr).toContain(`RESULTS: ${bad}: invalid results metadata: meltsweep.shard: "all" is not K/N`);
  });
});
