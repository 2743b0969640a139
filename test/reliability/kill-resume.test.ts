import { afterAll, describe, expect, it } from 'vitest';
import fs from 'node:fs';
import path from 'node:path';
import { once } from 'node:events';
import { setTimeout as sleep } from 'node:timers/promises';
import { readTable, runCliSync, spawnCli, tableColumns, tmpDir, writeSweep } from '../helpers.js';

const dir = tmpDir('kill');
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));

// 40,000 isentropic columns: a few seconds on two workers, long enough to be killed a dozen times.
// (A fixed 0.05 GPa step keeps the run as long as this test was designed for; what it checks, the
// rows committed and resumed, does not depend on how a column is integrated.)
const ROWS = 40_000;
const SWEEP = `
name: kill test K-1
axes:
  tp_c: { from: 1250, to: 1550, count: 100 }
  water_ppm: { from: 0, to: 800, count: 40 }
  lid_km: { values: [0, 10, 20, 35, 50, 70, 90, 110, 130, 150] }
design: { kind: grid }
model: { thermal: isentropic, water: batch, step_gpa: 0.05 }
`;

/** Deterministic pseudo-random numbers in [0, 1), so a failing sequence of kills can be replayed. */
function uniforms(count: number, seed: number): number[] {
  let s = seed >>> 0;
  return Array.from({ length: count }, () => {
    s = (Math.imul(s, 1664525) + 1013904223) >>> 0;
    return s / 2 ** 32;
  });
}

const KILLS_WANTED = 12;

/** Rows committed in a partial run folder (from its segment names). */
function committedRows(partialDir: string): number {
  if (!fs.existsSync(partialDir)) return 0;
  let rows = 0;
  for (const name of fs.readdirSync(partialDir)) {
    const m = /^seg-(\d+)-(\d+)\.arrows$/.exec(name);
    if (m) rows += Number(m[2]) - Number(m[1]);
  }
  return rows;
}

describe('kill -9 and resume', () => {
  it('resumed runs after repeated SIGKILLs at random moments equal an uninterrupted run: no lost, no duplicated rows', async () => {
    // (kill count and committed rows are printed for the record)
    const sweep = writeSweep(dir, 'k1.yaml', SWEEP);
    const reference = path.join(dir, 'reference.arrow');
    const t0 = performance.now();
    const ref = runCliSync(['run', sweep, '-o', reference, '--workers', '2', '--quiet', '--no-summary']);
    const referenceMs = performance.now() - t0;
    expect(ref.status, ref.stderr).toBe(0);

    // Kills at random moments of every stage: one in four lands at a random time during
    // start-up; the others wait until the process has committed new rows, then strike after a
    // further random delay (mid-computation, mid-commit or mid-publication).
    const out = path.join(dir, 'killed.arrow');
    let kills = 0;
    let finished = false;
    const committed: number[] = [];
    for (const [i, u] of uniforms(KILLS_WANTED + 4, 7).entries()) {
      const args = ['run', sweep, '-o', out, '--workers', '2', '--quiet', '--no-summary', '--commit-seconds', '0.05'];
      if (kills > 0) args.push('--resume');
      const before = committedRows(`${out}.partial`);
      const child = spawnCli(args);
      let exitedEarly = false;
      const exited = once(child, 'exit').then((r) => {
        exitedEarly = true;
        return r as [number | null, string | null];
      });
      if (i % 4 === 0) {
        await sleep(u * 300);
      } else {
        while (!exitedEarly && committedRows(`${out}.partial`) <= before) await sleep(10);
        await sleep(u * referenceMs * 0.05);
      }
      child.kill('SIGKILL');
      const [code, signal] = await exited;
      if (signal === 'SIGKILL') {
        kills++;
        committed.push(committedRows(`${out}.partial`));
        // never a half-written file under the final name
        if (fs.existsSync(out)) expect(fs.existsSync(`${out}.partial`)).toBe(true);
        if (kills >= KILLS_WANTED) break;
      } else {
        expect(code).toBe(0);
        finished = true;
        break;
      }
    }
    if (!finished) {
      const last = runCliSync(['run', sweep, '-o', out, '--workers', '2', '--quiet', '--no-summary', '--resume']);
      expect(last.status, last.stderr).toBe(0);
    }
    expect(kills).toBeGreaterThanOrEqual(10);
    // the kills landed while rows were being computed and committed, not only at start-up
    expect(new Set(committed).size).toBeGreaterThan(3);
    process.stdout.write(`kill test: ${kills} kills; committed rows after each: ${committed.join(', ')}\n`);
    expect(fs.existsSync(`${out}.partial`)).toBe(false);
    const a = tableColumns(readTable(out));
    const b = tableColumns(readTable(reference));
    expect(a.scenario_id.length).toBe(ROWS);
    expect(a.scenario_id).toEqual(Array.from({ length: ROWS }, (_, i) => i));
    expect(a).toEqual(b);
    // about a minute alone on the shared 2-core machine, more than two under the whole suite
  }, 300_000);
});
