/**
 * `meltsweep submit` on a real single-node Slurm (scripts/local-slurm.sh up, which .ci/run calls):
 * the array and its merge job finish and the merged table equals a single-machine run; a task
 * cancelled mid-run and resubmitted alone gives the same table. When no Slurm can be reached the
 * tests are skipped with the reason printed (and in their names), never passed.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { spawnSync } from 'node:child_process';
import fs from 'node:fs';
import path from 'node:path';
import { setTimeout as sleep } from 'node:timers/promises';
import { readTable, runCliSync, tableColumns, tmpDir, writeSweep } from '../helpers.js';

const SLURM_DIR = process.env.MELTSWEEP_SLURM_DIR ?? '/tmp/meltsweep-slurm';
const SLURM_CONF = path.join(SLURM_DIR, 'slurm.conf');
const slurmEnv: NodeJS.ProcessEnv = { SLURM_CONF, PATH: `${process.env.PATH ?? ''}:/usr/bin:/usr/sbin:/bin` };

/** Why the local Slurm cannot be used, or null when it answers. */
function slurmUnavailable(): string | null {
  const reasonFile = path.join(SLURM_DIR, 'unavailable');
  if (fs.existsSync(reasonFile)) return `scripts/local-slurm.sh up failed: ${fs.readFileSync(reasonFile, 'utf8').trim()}`;
  if (!fs.existsSync(SLURM_CONF)) return `no local Slurm is running (no ${SLURM_CONF}); start one as root with scripts/local-slurm.sh up (.ci/run does)`;
  const r = spawnSync('sinfo', ['-h', '-o', '%T'], { encoding: 'utf8', env: { ...process.env, ...slurmEnv }, timeout: 15_000 });
  if (r.error !== undefined) return `sinfo cannot run: ${r.error.message}`;
  if (r.status !== 0) return `sinfo fails: ${(r.stderr || r.stdout).trim()}`;
  if (!/idle|mix|alloc/.test(r.stdout)) return `the local Slurm node is not usable (state: ${r.stdout.trim() || 'none'})`;
  return null;
}

const why = slurmUnavailable();
if (why !== null) {
  process.stderr.write(`\n${'!'.repeat(100)}\n!! Slurm end-to-end tests SKIPPED: ${why}\n${'!'.repeat(100)}\n\n`);
}
const suffix = why === null ? '' : ` [SKIPPED: ${why}]`;

const dir = tmpDir('slurm');
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));

// 50 x 40 x 10 = 20,000 isentropic columns
const SWEEP = `name: cluster check C-1
axes:
  tp_c: { from: 1260, to: 1540, count: 50 }
  water_ppm: { from: 0, to: 780, count: 40 }
  lid_km: { values: [0, 8, 16, 24, 32, 40, 50, 60, 75, 90] }
design: { kind: grid }
model: { thermal: isentropic, water: batch }
`;

// 20 x 10 x 30 = 6,000 conductive columns: each task computes for about a second, long enough to be cancelled mid-run
const SLOW_SWEEP = `name: cluster check C-2
axes:
  tp_c: { from: 1300, to: 1500, count: 20 }
  water_ppm: { from: 0, to: 450, count: 10 }
  upwelling_mm_yr: { from: 10, to: 100, count: 30 }
design: { kind: grid }
model: { thermal: conductive, water: batch }
`;

function slurm(cmd: string, args: readonly string[]): string {
  const r = spawnSync(cmd, args, { encoding: 'utf8', env: { ...process.env, ...slurmEnv } });
  if (r.status !== 0) throw new Error(`${cmd} ${args.join(' ')}: ${r.stderr || r.stdout}`);
  return r.stdout;
}

/** A job's state from scontrol (kept for MinJobAge after it ends). */
function jobState(id: string): string {
  const m = /JobState=(\S+)/.exec(slurm('scontrol', ['show', 'job', '-o', id]));
  return m === null ? 'UNKNOWN' : m[1];
}

const ENDED = ['COMPLETED', 'FAILED', 'CANCELLED', 'TIMEOUT', 'NODE_FAIL', 'OUT_OF_MEMORY', 'BOOT_FAIL', 'DEADLINE', 'PREEMPTED'];

async function waitForEnd(id: string, seconds: number): Promise<string> {
  const until = Date.now() + seconds * 1000;
  for (;;) {
    const state = jobState(id);
    if (ENDED.includes(state)) return state;
    if (Date.now() > until) throw new Error(`job ${id} still ${state} after ${seconds} s`);
    await sleep(250);
  }
}

function submit(sweep: string, out: string): { shards: string; merge: string } {
  const r = runCliSync(['submit', sweep, '-o', out, '--shards', '4', '--workers-per-task', '1'], { env: slurmEnv });
  expect(r.status, r.stderr).toBe(0);
  const shards = /shard tasks: job (\d+)/.exec(r.stdout)?.[1];
  const merge = /merge: +job (\d+)/.exec(r.stdout)?.[1];
  expect(shards, r.stdout).toBeDefined();
  expect(merge, r.stdout).toBeDefined();
  return { shards: shards!, merge: merge! };
}

function localRun(sweep: string, out: string): void {
  const r = runCliSync(['run', sweep, '-o', out, '-q', '--no-summary', '-w', '2']);
  expect(r.status, r.stderr).toBe(0);
}

function logOf(file: string): string {
  return fs.existsSync(file) ? fs.readFileSync(file, 'utf8') : '(no log)';
}

describe.skipIf(why !== null)('meltsweep submit on a real Slurm', () => {
  beforeAll(() => {
    writeSweep(dir, 'c1.yaml', SWEEP);
    writeSweep(dir, 'c2.yaml', SLOW_SWEEP);
  });

  it(`runs a 4-shard array and its merge job; the merged table equals a single-machine run${suffix}`, async () => {
    const t0 = performance.now();
    const sweep = path.join(dir, 'c1.yaml');
    const out = path.join(dir, 'c1.arrow');
    const jobs = submit(sweep, out);
    localRun(sweep, path.join(dir, 'c1-local.arrow'));
    const state = await waitForEnd(jobs.merge, 180);
    expect(state, logOf(path.join(`${out}.parts`, 'logs', `merge-${jobs.merge}.log`))).toBe('COMPLETED');
    expect(tableColumns(readTable(out))).toEqual(tableColumns(readTable(path.join(dir, 'c1-local.arrow'))));
    expect(readTable(out).numRows).toBe(20_000);
    process.stdout.write(`slurm e2e: 4-shard submit of 20,000 columns, array + merge: ${((performance.now() - t0) / 1000).toFixed(1)} s wall\n`);
  });

  it(`a task cancelled mid-run and resubmitted alone resumes its committed rows; the table is the same${suffix}`, async () => {
    const t0 = performance.now();
    const sweep = path.join(dir, 'c2.yaml');
    const out = path.join(dir, 'c2.arrow');
    const jobs = submit(sweep, out);
    // cancel task 2 as soon as its run has started (its partial run folder exists)
    const partial = path.join(`${out}.parts`, 'part-2.arrow.partial');
    const until = Date.now() + 120_000;
    while (!fs.existsSync(partial)) {
      if (Date.now() > until) throw new Error(`task 2 did not start: ${logOf(path.join(`${out}.parts`, 'logs', 'part-2.log'))}`);
      await sleep(20);
    }
    slurm('scancel', [`${jobs.shards}_2`]);
    expect(await waitForEnd(`${jobs.shards}_2`, 60)).toBe('CANCELLED');
    expect(fs.existsSync(path.join(`${out}.parts`, 'part-2.arrow')), 'task 2 finished before it could be cancelled').toBe(false);
    const committed = fs.readdirSync(partial).filter((f) => f.endsWith('.arrows')).map((f) => /^seg-(\d+)-(\d+)/.exec(f)!).reduce((n, m) => n + Number(m[2]) - Number(m[1]), 0);

    // the other tasks finish; the merge job cannot start (afterok failed): cancel it, as the README says
    for (const k of [1, 3, 4]) expect(await waitForEnd(`${jobs.shards}_${k}`, 180)).toBe('COMPLETED');
    slurm('scancel', [jobs.merge]);
    // merging now refuses and names the missing shard
    const early = runCliSync(['merge', `${out}.parts`, '-o', out]);
    expect(early.status).toBe(2);
    expect(early.stderr).toContain('shard 2 of 4 is missing');

    const again = slurm('sbatch', ['--parsable', '--array=2', `${out}.shards.sbatch`]).trim().split(';')[0];
    const merge = slurm('sbatch', ['--parsable', `--dependency=afterok:${again}`, `${out}.merge.sbatch`]).trim().split(';')[0];
    localRun(sweep, path.join(dir, 'c2-local.arrow'));
    const state = await waitForEnd(merge, 180);
    expect(state, logOf(path.join(`${out}.parts`, 'logs', `merge-${merge}.log`))).toBe('COMPLETED');
    const log = logOf(path.join(`${out}.parts`, 'logs', 'part-2.log'));
    if (committed > 0) expect(log).toContain(`(${committed.toLocaleString('en-US')} rows were already done)`);
    expect(tableColumns(readTable(out))).toEqual(tableColumns(readTable(path.join(dir, 'c2-local.arrow'))));
    process.stdout.write(
      `slurm e2e: cancel + resubmit of task 2 (${committed} of 1,500 rows committed at the cancel): ${((performance.now() - t0) / 1000).toFixed(1)} s wall\n`,
    );
  });
});
