/** Shared helpers for tests that run the built CLI or read result tables. */
import { spawn, spawnSync, type ChildProcess } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import * as arrow from 'apache-arrow';
import { afterAll } from 'vitest';
import { InputError } from '../src/errors.js';

export const ROOT = fileURLToPath(new URL('..', import.meta.url));
export const CLI = path.join(ROOT, 'dist', 'src', 'cli', 'main.js');

export function tmpDir(prefix: string): string {
  return fs.mkdtempSync(path.join(os.tmpdir(), `meltsweep-${prefix}-`));
}

export function runCliSync(args: readonly string[], opts: { cwd?: string; env?: NodeJS.ProcessEnv } = {}) {
  return spawnSync(process.execPath, [CLI, ...args], {
    encoding: 'utf8',
    cwd: opts.cwd ?? ROOT,
    env: { ...process.env, ...opts.env },
  });
}

export function spawnCli(args: readonly string[], opts: { cwd?: string; env?: NodeJS.ProcessEnv } = {}): ChildProcess {
  return spawn(process.execPath, [CLI, ...args], { cwd: opts.cwd ?? ROOT, env: { ...process.env, ...opts.env }, stdio: ['ignore', 'pipe', 'pipe'] });
}

export function readTable(file: string): arrow.Table {
  return arrow.tableFromIPC(fs.readFileSync(file));
}

/** Every column of a table as plain arrays (bigint ids as numbers), for deep comparison. */
export function tableColumns(t: arrow.Table): Record<string, unknown[]> {
  const out: Record<string, unknown[]> = {};
  for (const f of t.schema.fields) {
    const col = t.getChild(f.name)!;
    out[f.name] = Array.from({ length: t.numRows }, (_, i) => {
      const v = col.get(i) as unknown;
      return typeof v === 'bigint' ? Number(v) : v;
    });
  }
  return out;
}

export function writeSweep(dir: string, name: string, yaml: string): string {
  const file = path.join(dir, name);
  fs.writeFileSync(file, yaml);
  return file;
}

/**
 * The problems of the InputError that `fn` throws; other errors are rethrown. When it does not
 * throw: [] (or, with mustThrow, a failure of the test).
 */
export function problemsOf(fn: () => unknown, mustThrow = false): readonly string[] {
  try {
    fn();
  } catch (err) {
    if (err instanceof InputError) return err.problems;
    throw err;
  }
  if (mustThrow) throw new Error('expected an InputError, but the call succeeded');
  return [];
}

/** A fresh temporary folder, removed with everything in it after the test file's tests. */
export function scratchDir(prefix: string): string {
  const dir = tmpDir(prefix);
  afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));
  return dir;
}
