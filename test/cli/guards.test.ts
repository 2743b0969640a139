/**
 * Every error is a message with exit 2 (bad input, bad path) or 1 (a failed run), never a stack
 * trace; what cannot run is refused before any work; nothing is overwritten without --force.
 * The commands run in this process (runCli), with stdout and stderr captured.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import fs from 'node:fs';
import path from 'node:path';
import { runCli } from '../../src/cli/program.js';
import { validateSweep } from '../../src/spec/index.js';
import { runSweep } from '../../src/run/run-sweep.js';
import { tmpDir } from '../helpers.js';

const dir = tmpDir('cli-guards');
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));

/** Run the CLI in this process; stdout and stderr captured. */
async function cli(args: string[]): Promise<{ code: number; stdout: string; stderr: string }> {
  const out: string[] = [];
  const err: string[] = [];
  const writeOut = process.stdout.write.bind(process.stdout);
  const writeErr = process.stderr.write.bind(process.stderr);
  process.stdout.write = ((c: string | Uint8Array) => (out.push(String(c)), true)) as typeof process.stdout.write;
  process.stderr.write = ((c: string | Uint8Array) => (err.push(String(c)), true)) as typeof process.stderr.write;
  const exitCode = process.exitCode;
  try {
    const code = await runCli(args);
    return { code, stdout: out.join(''), stderr: err.join('') };
  } finally {
    process.stdout.write = writeOut;
    process.stderr.write = writeErr;
    process.exitCode = exitCode;
  }
}

/** A message, not a trace: starts with "meltsweep:", no "    at ..." lines, short. */
function expectMessage(r: { stderr: string }): void {
  expect(r.stderr).toMatch(/^meltsweep: /);
  expect(r.stderr).not.toMatch(/\n\s+at .+:\d+/);
  expect(r.stderr.length).toBeLessThan(2000);
}

const write = (name: string, text: string | Buffer): string => {
  const f = path.join(dir, name);
  fs.writeFileSync(f, text);
  return f;
};

const SMALL = 'name: guard test G-1\naxes:\n  tp_c: { from: 1300, to: 1450, count: 6 }\n  water_ppm: { values: [0, 200] }\nmodel: { thermal: isentropic }\n';
let results = '';

beforeAll(async () => {
  results = path.join(dir, 'g1.arrow');
  await runSweep({ spec: validateSweep((await import('yaml')).parse(SMALL)), outPath: results, workers: 1 });
}, 60_000);

describe('combinations that cannot run are refused before any work (exit 2)', () => {
  it('fractional water with a conductive column, explicit or through thermal auto with an upwelling rate', async () => {
    const explicit = write('frac-cond.yaml', 'name: f C-1\naxes:\n  tp_c: { from: 1300, to: 1400, count: 3 }\nfixed: { water_ppm: 100, upwelling_mm_yr: 20 }\nmodel: { thermal: conductive, water: fractional }\n');
    const before = fs.readdirSync(dir).sort();
    for (const args of [['plan', explicit], ['run', explicit, '-o', path.join(dir, 'fc.arrow'), '-q']]) {
      const r = await cli(args);
      expect(r.code).toBe(2);
      expectMessage(r);
      expect(r.stderr).toContain('model.water: "fractional" cannot run with a conductive column: the conductive model computes batch water only');
    }
    expect(fs.readdirSync(dir).sort()).toEqual(before);
    const auto = write('frac-auto.yaml', 'name: f C-2\naxes:\n  upwelling_mm_yr: { values: [10, 40] }\nfixed: { tp_c: 1350, water_ppm: 100 }\nmodel: { water: fractional }\n');
    const r = await cli(['plan', auto]);
    expect(r.code).toBe(2);
    expect(r.stderr).toContain('(thermal auto picks the conductive column because an upwelling rate is given)');
  });

  it('a folder, an empty name or the sweep file itself as the output (even with --force)', async () => {
    const sweep = write('g1.yaml', SMALL);
    const folder = path.join(dir, 'a-folder');
    fs.mkdirSync(folder);
    let r = await cli(['run', sweep, '-o', folder, '-q', '--force']);
    expect(r.code).toBe(2);
    expect(r.stderr).toContain('is a folder; give a file name inside it');
    r = await cli(['run', sweep, '-o', '', '-q']);
    expect(r.code).toBe(2);
    expect(r.stderr).toContain('the output name is empty');
    r = await cli(['run', sweep, '-o', sweep, '-q', '--force']);
    expect(r.code).toBe(2);
    expect(r.stderr).toContain('is the input file');
    expect(fs.readFileSync(sweep, 'utf8')).toBe(SMALL);
  });

  it('a step that does not land on `to`, duplicate JSON keys, control characters in the name', async () => {
    let r = await cli(['plan', write('step.yaml', 'name: s\naxes:\n  tp_c: { from: 1300, to: 1400, step: 30 }\nfixed: { water_ppm: 0 }\n')]);
    expect(r.code).toBe(2);
    expect(r.stderr).toContain('axes.tp_c.step: 30 does not divide the range 1300 to 1400: the values would stop at 1390 and leave 1400 out');
    r = await cli(['plan', write('dup.json', '{"name": "d", "axes": {"tp_c": {"values": [1300]}}, "fixed": {"water_ppm": 0, "water_ppm": 5}}')]);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/dup\.json:1:\d+: JSON error: a key appears twice in one object/);
    r = await cli(['plan', write('ctl.yaml', 'name: "ridge \\e[31mR-7"\naxes:\n  tp_c: { values: [1300] }\nfixed: { water_ppm: 0 }\n')]);
    expect(r.code).toBe(2);
    expect(r.stderr).toContain('name: holds a control character (U+001B) at position 7');
    expect(r.stderr).not.toContain('\u001b');
  });

  it('sweep files: a device, an oversized file and a binary file are refused before being read whole', async () => {
    let r = await cli(['plan', '/dev/zero']);
    expect(r.code).toBe(2);
    expect(r.stderr).toContain('/dev/zero: not a regular file');
    const big = write('big.yaml', `name: big\n# ${'x'.repeat(5 * 1024 * 1024)}\n`);
    r = await cli(['plan', big]);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/5\.0 MiB is too large for a sweep file; at most 4\.0 MiB/);
    const binary = write('binary.yaml', Buffer.from(Array.from({ length: 7000 }, (_, i) => (i * 37) % 256)));
    r = await cli(['plan', binary]);
    expect(r.code).toBe(2);
    expectMessage(r);
    expect(r.stderr).toContain('not a text file (it holds NUL bytes)');
  });
});

describe('nothing is overwritten without --force', () => {
  it('report -o, plot column -o and a dangling symbolic link at -o', async () => {
    const html = write('existing.html', 'mine');
    let r = await cli(['report', results, '-o', html]);
    expect(r.code).toBe(2);
    expect(r.stderr).toContain('already exists; give --force to replace it');
    expect(fs.readFileSync(html, 'utf8')).toBe('mine');
    const svg = write('existing.svg', 'mine');
    r = await cli(['plot', 'column', '--tp', '1350', '-o', svg]);
    expect(r.code).toBe(2);
    expect(fs.readFileSync(svg, 'utf8')).toBe('mine');
    const link = path.join(dir, 'dangling.svg');
    fs.symlinkSync(path.join(dir, 'nowhere', 'target.svg'), link);
    r = await cli(['plot', 'column', '--tp', '1350', '-o', link]);
    expect(r.code).toBe(2);
    expect(r.stderr).toContain('is a symbolic link to a missing file');
    const runLink = path.join(dir, 'dangling.arrow');
    fs.symlinkSync(path.join(dir, 'nowhere.arrow'), runLink);
    r = await cli(['run', write('g2.yaml', SMALL), '-o', runLink, '-q', '--no-summary']);
    expect(r.code).toBe(2);
    expect(r.stderr).toContain('is a symbolic link to a missing file');
    expect(fs.lstatSync(runLink).isSymbolicLink()).toBe(true);
  });

  it("the sensitivity table beside an output: someone else's file is kept; its own table is refreshed", async () => {
    const copy = path.join(dir, 'g1-copy.arrow');
    fs.copyFileSync(results, copy);
    const theirs = write('g1-copy.sensitivity.arrow', 'not mine to replace');
    let r = await cli(['sensitivity', copy]);
    expect(r.code).toBe(2);
    expect(r.stderr).toContain('is not the sensitivity table of');
    expect(fs.readFileSync(theirs, 'utf8')).toBe('not mine to replace');
    r = await cli(['sensitivity', copy, '--force']);
    expect(r.code, r.stderr).toBe(0);
    r = await cli(['sensitivity', copy]);
    expect(r.code, r.stderr).toBe(0);
  });

  it('a folder at OUT.partial that meltsweep did not create is never deleted, even with --force', async () => {
    const out = path.join(dir, 'users.arrow');
    fs.mkdirSync(`${out}.partial`);
    fs.writeFileSync(`${out}.partial/notes.txt`, 'precious');
    const r = await cli(['run', write('g3.yaml', SMALL), '-o', out, '-q', '--no-summary', '--force']);
    expect(r.code).toBe(2);
    expect(r.stderr).toContain('holds files meltsweep did not write (notes.txt)');
    expect(fs.readFileSync(`${out}.partial/notes.txt`, 'utf8')).toBe('precious');
  });
});

describe('every command answers bad paths with a message', () => {
  it('missing, folder, truncated and binary inputs; unwritable outputs', async () => {
    const truncated = path.join(dir, 'truncated.arrow');
    const bytes = fs.readFileSync(results);
    fs.writeFileSync(truncated, bytes.subarray(0, Math.floor(bytes.length / 2)));
    const garbage = write('garbage.arrow', Buffer.from(Array.from({ length: 3000 }, (_, i) => (i * 91) % 256)));
    const inputs = [path.join(dir, 'missing.arrow'), dir, truncated, garbage];
    const tableCommands = (f: string): string[][] => [
      ['inspect', f],
      ['sensitivity', f, '-o', path.join(dir, 'x.sensitivity.arrow'), '--force'],
      ['report', f, '-o', path.join(dir, 'x.html'), '--force'],
      ['merge', f, '-o', path.join(dir, 'x-merged.arrow'), '--force'],
      ['plan', f],
      ['run', f, '-o', path.join(dir, 'x-run.arrow'), '--force', '-q'],
    ];
    const unwritable = [
      ['report', results, '-o', '/proc/meltsweep-test.html'],
      ['plot', 'column', '--tp', '1350', '-o', '/proc/meltsweep-test.svg'],
      ['sensitivity', results, '-o', '/proc/meltsweep-test.arrow'],
      ['merge', results, '-o', '/proc/meltsweep-test.arrow'],
      ['run', write('g4.yaml', SMALL), '-o', '/proc/meltsweep-test.arrow', '-q'],
    ];
    let tried = 0;
    for (const args of [...inputs.flatMap(tableCommands), ...unwritable]) {
      const r = await cli(args);
      expect([1, 2], `${args.join(' ')}\n${r.stderr}`).toContain(r.code);
      expectMessage(r);
      tried++;
    }
    expect(tried).toBe(29);
    const t = await cli(['inspect', truncated]);
    expect(t.stderr).toContain('truncated.arrow');
  }, 120_000);
});
