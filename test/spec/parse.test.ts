import { mkdtemp, writeFile, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { detectSweepFormat, loadSweepFile, parseSweepData } from '../../src/spec/index.js';
import { findJsonSyntaxError } from '../../src/spec/json-syntax.js';
import { positionAt } from '../../src/spec/text-position.js';
import { editDistance, suggestName } from '../../src/spec/suggest.js';
import { problemsOf } from './helpers.js';

describe('format and syntax', () => {
  it('picks the format by extension, else by content', () => {
    expect(detectSweepFormat('{}', 'a.yaml')).toBe('yaml');
    expect(detectSweepFormat('a: 1', 'a.json')).toBe('json');
    expect(detectSweepFormat('  {"a": 1}', 'stdin')).toBe('json');
    expect(detectSweepFormat('a: 1', 'stdin')).toBe('yaml');
  });

  it('reads YAML numbers and strips a byte-order mark', () => {
    expect(parseSweepData('\uFEFFa: 1e3\nb: [1, 2.5]\n', 'x.yaml')).toEqual({ a: 1000, b: [1, 2.5] });
  });

  it('line and column from an offset (1-based, CRLF counted once)', () => {
    expect(positionAt('ab\ncd', 0)).toEqual({ line: 1, column: 1 });
    expect(positionAt('ab\ncd', 4)).toEqual({ line: 2, column: 2 });
    expect(positionAt('ab\r\ncd', 4)).toEqual({ line: 2, column: 1 });
  });

  it('JSON scanner agrees with JSON.parse and places the first error', () => {
    const good = ['{}', '[]', '{"a": [1, -2.5e3, true, false, null, "x\\u00e9\\n"]}', ' 0 '];
    for (const t of good) {
      expect(() => JSON.parse(t) as unknown).not.toThrow();
      expect(findJsonSyntaxError(t)).toBeNull();
    }
    expect(findJsonSyntaxError('{"a": 01}')).toEqual({ offset: 7, message: "invalid number, found '1'" });
    expect(findJsonSyntaxError("{'a': 1}")).toEqual({ offset: 1, message: "expected a property name in double quotes, found '''" });
    expect(findJsonSyntaxError('{"a": 1')).toEqual({ offset: 7, message: "expected ',' or '}' after a property value, found end of file" });
    expect(findJsonSyntaxError('{"a": 1} x')).toEqual({ offset: 9, message: "unexpected 'x' after the end of the data" });
    expect(findJsonSyntaxError('{"a": NaN}')).toEqual({ offset: 6, message: "expected a value, found 'N'" });
  });

  it('a second YAML document is refused with its position', () => {
    expect(problemsOf(() => parseSweepData('a: 1\n---\nb: 2\n', 'two.yaml'))).toEqual([
      'two.yaml:2:1: YAML syntax error: a sweep file holds one document; found a second one',
    ]);
  });

  it('an unreadable file is an InputError naming the path', async () => {
    await expect(loadSweepFile('/nonexistent/sweep.yaml')).rejects.toThrow('/nonexistent/sweep.yaml: cannot read the sweep file (no such file)');
  });

  it('loads JSON files', async () => {
    const dir = await mkdtemp(join(tmpdir(), 'meltsweep-spec-'));
    try {
      const path = join(dir, 'j.json');
      await writeFile(path, JSON.stringify({ axes: { tp_c: { values: [1300, 1400] } } }));
      const spec = await loadSweepFile(path);
      expect(spec.name).toBe('j');
      expect(spec.axes[0].values).toEqual([1300, 1400]);
    } finally {
      await rm(dir, { recursive: true, force: true });
    }
  });
});

describe('suggestions', () => {
  it('edit distance counts a transposition as one edit', () => {
    expect(editDistance('desing', 'design')).toBe(1);
    expect(editDistance('', 'abc')).toBe(3);
    expect(editDistance('kitten', 'sitting')).toBe(3);
  });
  it('suggests close names and prefixes, not far ones', () => {
    expect(suggestName('tp', ['tp_c', 'water_ppm'])).toBe('tp_c');
    expect(suggestName('water', ['tp_c', 'water_ppm'])).toBe('water_ppm');
    expect(suggestName('Upwelling-mm-yr', ['tp_c', 'upwelling_mm_yr'])).toBe('upwelling_mm_yr');
    expect(suggestName('colour', ['name', 'axes', 'fixed', 'design', 'model'])).toBeNull();
  });
});
