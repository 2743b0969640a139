import { afterAll, describe, expect, it } from 'vitest';
import fs from 'node:fs';
import path from 'node:path';
import { once } from 'node:events';
import { readTable, runCliSync, spawnCli, tableColumns, tmpDir, writeSweep } from '../helpers.js';

const dir = tmpDir('kill');
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));

// 40,000 isentropic columns: a few seconds on two workers, long enough to be killed a dozen times.
const ROWS = 40_000;
const SWEEP = `
name: kill test K-1
axes:
  tp_c: { from: 1250, to: 1550, count: 100 }
  water_ppm: { from: 0, to: 800, count: 40 }
  lid_km: { values: [0, 10, 20, 35, 50, 70, 90, 110, 130, 150] }
design: { kind: grid }
model: { thermal: isentropic, water: batch }
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

describe('kill -9 and resume', () => {
  it('resumed runs after repeated SIGKILLs at random moments equal an uninterrupted run: no lost, no duplicated rows', async () => {
    const sweep = writeSweep(dir, 'k1.yaml', SWEEP);
    const reference = path.join(dir, 'reference.arrow');
    const t0 = performance.now();
    const ref = runCliSync(['run', sweep, '-o', reference, '--workers', '2', '--quiet', '--no-summary']);
    const referenceMs = performance.now() - t0;
    expect(ref.status, ref.stderr).toBe(0);

    // Kill each process after a random delay of 3-8 % of an uninterrupted run (process start-up
    // included), so a dozen kills land at every stage: start-up, computing, committing, publishing.
    const out = path.join(dir, 'killed.arrow');
    let kills = 0;
    let finished = false;
    for (const u of uniforms(KILLS_WANTED + 4, 7)) {
      const delay = referenceMs * (0.03 + 0.05 * u);
      const args = ['run', sweep, '-o', out, '--workers', '2', '--quiet', '--no-summary', '--commit-seconds', '0.05'];
      if (kills > 0) args.push('--resume');
      const child = spawnCli(args);
      const exited = once(child, 'exit');
      const timer = setTimeout(() => child.kill('SIGKILL'), delay);
      const [code, signal] = (await exited) as [number | null, string | null];
      clearTimeout(timer);
      if (signal === 'SIGKILL') {
        kills++;
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
    expect(fs.existsSync(`${out}.partial`)).toBe(false);
    const a = tableColumns(readTable(out));
    const b = tableColumns(readTable(reference));
    expect(a.scenario_id.length).toBe(ROWS);
    expect(a.scenario_id).toEqual(Array.from({ length: ROWS }, (_, i) => i));
    expect(a).toEqual(b);
  });
});
