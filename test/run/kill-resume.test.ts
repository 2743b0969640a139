import { afterAll, describe, expect, it } from 'vitest';
import fs from 'node:fs';
import path from 'node:path';
import { once } from 'node:events';
import { readTable, runCliSync, spawnCli, tableColumns, tmpDir, writeSweep } from '../helpers.js';

const dir = tmpDir('kill');
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));

// ~40,000 isentropic columns: a few seconds on two workers, long enough to be killed mid-run.
const SWEEP = `
name: kill test K-1
axes:
  tp_c: { from: 1250, to: 1550, count: 100 }
  water_ppm: { from: 0, to: 800, count: 40 }
  lid_km: { values: [0, 10, 20, 35, 50, 70, 90, 110, 130, 150] }
design: { kind: grid }
model: { thermal: isentropic, water: batch }
`;

/** Deterministic pseudo-random kill delays (ms), so a failure can be replayed. */
function killDelays(count: number, seed: number): number[] {
  let s = seed >>> 0;
  return Array.from({ length: count }, () => {
    s = (Math.imul(s, 1664525) + 1013904223) >>> 0;
    return 150 + (s % 1200);
  });
}

describe('kill -9 and resume', () => {
  it('resumed runs after repeated SIGKILLs equal an uninterrupted run: no lost, no duplicated rows', async () => {
    const sweep = writeSweep(dir, 'k1.yaml', SWEEP);
    const reference = path.join(dir, 'reference.arrow');
    const ref = runCliSync(['run', sweep, '-o', reference, '--workers', '2', '--quiet', '--no-summary']);
    expect(ref.status, ref.stderr).toBe(0);

    const out = path.join(dir, 'killed.arrow');
    let kills = 0;
    let finished = false;
    for (const [i, delay] of killDelays(4, 7).entries()) {
      const args = ['run', sweep, '-o', out, '--workers', '2', '--quiet', '--no-summary', '--commit-seconds', '0.1'];
      if (i > 0) args.push('--resume');
      const child = spawnCli(args);
      const exited = once(child, 'exit');
      const timer = setTimeout(() => child.kill('SIGKILL'), delay);
      const [code, signal] = (await exited) as [number | null, string | null];
      clearTimeout(timer);
      if (signal === 'SIGKILL') kills++;
      else {
        expect(code).toBe(0);
        finished = true;
        break;
      }
      expect(fs.existsSync(out)).toBe(false); // never a half-written file under the final name
    }
    if (!finished) {
      const last = runCliSync(['run', sweep, '-o', out, '--workers', '2', '--quiet', '--no-summary', '--resume']);
      expect(last.status, last.stderr).toBe(0);
    }
    expect(kills).toBeGreaterThanOrEqual(2);
    expect(fs.existsSync(`${out}.partial`)).toBe(false);
    const a = tableColumns(readTable(out));
    const b = tableColumns(readTable(reference));
    expect(a.scenario_id.length).toBe(40_000);
    expect(a).toEqual(b);
  });
});
