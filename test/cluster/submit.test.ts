/**
 * `meltsweep submit` without a scheduler: a stand-in sbatch on PATH records what it is asked and
 * answers like `sbatch --parsable`; the written job scripts are then run by bash with the array
 * variable set, as Slurm would, and the merge script must refuse until every part is there.
 * (The same path under a real Slurm: slurm-e2e.test.ts.)
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { spawnSync } from 'node:child_process';
import fs from 'node:fs';
import path from 'node:path';
import { arrayList, shellQuote } from '../../src/cluster/job-scripts.js';
import { parseSbatchAnswer } from '../../src/cluster/sbatch.js';
import { submitSweep } from '../../src/cluster/submit.js';
import { readTable, runCliSync, tableColumns, tmpDir, writeSweep } from '../helpers.js';

const dir = tmpDir('submit');
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));

// 3 x 4 = 12 isentropic columns in 3 shards of 4
const SWEEP = `name: submit check S-1
axes:
  tp_c: { values: [1300, 1400, 1500] }
  water_ppm: { values: [0, 100, 300, 1000] }
design: { kind: grid }
model: { thermal: isentropic }
`;

const fakeBin = path.join(dir, 'bin');
const sbatchLog = path.join(dir, 'sbatch.log');
/** PATH with the stand-in sbatch first and nothing else of Slurm */
const fakePath = `${fakeBin}:/usr/local/bin:/bin`;

beforeAll(() => {
  fs.mkdirSync(fakeBin);
  // answers "ID;CLUSTER" like sbatch --parsable, or refuses like sbatch does when FAKE_SBATCH_FAIL is set
  fs.writeFileSync(
    path.join(fakeBin, 'sbatch'),
    [
      '#!/bin/sh',
      `echo "$@" >> ${shellQuote(sbatchLog)}`,
      'if [ -n "$FAKE_SBATCH_FAIL" ]; then echo "sbatch: error: Batch job submission failed: Invalid partition name specified" >&2; exit 1; fi',
      `n=$(wc -l < ${shellQuote(sbatchLog)})`,
      'echo "$((100 + n));test-cluster"',
      '',
    ].join('\n'),
    { mode: 0o755 },
  );
});

function runBash(script: string, env: NodeJS.ProcessEnv = {}) {
  return spawnSync('bash', [script], { encoding: 'utf8', env: { ...process.env, ...env } });
}

/** Data of a results table, column by column. */
function data(file: string): Record<string, unknown[]> {
  return tableColumns(readTable(file));
}

describe('submit helpers', () => {
  it('compresses task lists the way Slurm writes arrays', () => {
    expect(arrayList([7, 2, 3, 4])).toBe('2-4,7');
    expect(arrayList([5])).toBe('5');
    expect(arrayList([1, 3, 5, 6])).toBe('1,3,5-6');
  });

  it('reads the job id from sbatch --parsable answers and refuses anything else', () => {
    expect(parseSbatchAnswer('4242\n')).toBe('4242');
    expect(parseSbatchAnswer('4242;cluster-a\n')).toBe('4242');
    expect(() => parseSbatchAnswer('Submitted batch job 4242\n')).toThrow(/holds no job id/);
  });

  it('quotes shell words only when needed', () => {
    expect(shellQuote('/data/run-1/r7.arrow')).toBe('/data/run-1/r7.arrow');
    expect(shellQuote("my sweep's folder")).toBe(`'my sweep'\\''s folder'`);
  });
});

describe('meltsweep submit', () => {
  it('--dry-run returns both scripts and the sbatch commands and writes nothing', async () => {
    const sweep = writeSweep(dir, 'dry.yaml', SWEEP);
    const out = path.join(dir, 'dry.arrow');
    const r = await submitSweep({ sweepPath: sweep, output: out, shards: 3, workersPerTask: 2, sbatchOptions: ['--partition=short'], setup: ['module load nodejs'], dryRun: true });
    expect(r.shardScript).toContain('#SBATCH --array=1-3');
    expect(r.shardScript).toContain('#SBATCH --cpus-per-task=2');
    expect(r.shardScript).toContain('#SBATCH --partition=short');
    expect(r.mergeScript).toContain('#SBATCH --partition=short');
    expect(r.shardScript).toContain('module load nodejs');
    expect(r.shardScript).toContain(`node=${process.execPath}`);
    expect(r.shardScript).toContain('--shard "$task/3" --resume --workers 2');
    expect(r.shardScript).toContain(`--sweep-hash ${r.layout.sweepHash} --no-summary`);
    expect(r.mergeScript).toContain(`merge ${out}.parts --output ${out} --format arrow`);
    expect(r.commands).toEqual([
      ['sbatch', '--parsable', `${out}.shards.sbatch`],
      ['sbatch', '--parsable', '--dependency=afterok:ARRAY_ID', `${out}.merge.sbatch`],
    ]);
    expect(r.shardJobId).toBeNull();
    expect(fs.readdirSync(dir).filter((f) => f.startsWith('dry.arrow'))).toEqual([]);
    // both scripts are valid bash
    for (const [name, text] of [['shards', r.shardScript], ['merge', r.mergeScript]]) {
      const file = path.join(dir, `syntax-${name}.sh`);
      fs.writeFileSync(file, text);
      const check = spawnSync('bash', ['-n', file], { encoding: 'utf8' });
      expect(check.status, check.stderr).toBe(0);
    }
  });

  it('refuses a shard count above the point count, and sbatch options it sets itself', async () => {
    const sweep = writeSweep(dir, 'bad.yaml', SWEEP);
    const base = { sweepPath: sweep, output: path.join(dir, 'bad.arrow'), dryRun: true };
    await expect(submitSweep({ ...base, shards: 13 })).rejects.toThrow('--shards: 13 is not allowed; give a whole number from 1 to 12 (the sweep has 12 points)');
    await expect(submitSweep({ ...base, shards: 3, sbatchOptions: ['--array=1-9'] })).rejects.toThrow('--sbatch-option: "--array=1-9" is set by submit itself');
    await expect(submitSweep({ ...base, shards: 3, sbatchOptions: ['-c 4'] })).rejects.toThrow('use --workers-per-task');
    await expect(submitSweep({ ...base, shards: 3, sbatchOptions: ['partition=short'] })).rejects.toThrow('is not an sbatch option');
  });

  it('says so plainly when sbatch is not on PATH, and writes nothing', () => {
    const sweep = writeSweep(dir, 'nosb.yaml', SWEEP);
    const r = runCliSync(['submit', sweep, '-o', path.join(dir, 'nosb.arrow'), '--shards', '3'], { env: { PATH: '/nonexistent' } });
    expect(r.status).toBe(1);
    expect(r.stderr).toContain('sbatch is not on PATH');
    expect(fs.readdirSync(dir).filter((f) => f.startsWith('nosb.arrow'))).toEqual([]);
  });

  it('passes sbatch\'s own message through when it refuses the job, and leaves nothing behind', () => {
    const sweep = writeSweep(dir, 'refused.yaml', SWEEP);
    const r = runCliSync(['submit', sweep, '-o', path.join(dir, 'refused.arrow'), '--shards', '3'], { env: { PATH: fakePath, FAKE_SBATCH_FAIL: '1' } });
    expect(r.status).toBe(1);
    expect(r.stderr).toContain('sbatch refused the shard array: sbatch: error: Batch job submission failed: Invalid partition name specified');
    expect(fs.readdirSync(dir).filter((f) => f.startsWith('refused.arrow'))).toEqual([]);
  });

  it('submits the array, then the merge with afterok on its id; the scripts run shard K as task K and the merge waits for every part', async () => {
    const sweep = writeSweep(dir, 'ridge.yaml', SWEEP);
    const out = path.join(dir, 'ridge.arrow');
    fs.rmSync(sbatchLog, { force: true });
    const r = runCliSync(['submit', sweep, '-o', out, '--shards', '3'], { env: { PATH: fakePath } });
    expect(r.status, r.stderr).toBe(0);
    // the first answer is job 101: the merge depends on it
    expect(fs.readFileSync(sbatchLog, 'utf8').trim().split('\n')).toEqual([`--parsable ${out}.shards.sbatch`, `--parsable --dependency=afterok:101 ${out}.merge.sbatch`]);
    expect(r.stdout).toContain('shard tasks: job 101 (array 1-3');
    expect(r.stdout).toContain('squeue -j 101,102');
    expect(r.stdout).toContain(`sbatch --array=K ${out}.shards.sbatch`);
    const record = JSON.parse(fs.readFileSync(`${out}.parts/submission.json`, 'utf8')) as { shardJobId: string; mergeJobId: string; shards: number };
    expect(record).toMatchObject({ shardJobId: '101', mergeJobId: '102', shards: 3 });

    // a second submit to the same output refuses (the parts folder holds the first)
    await expect(submitSweep({ sweepPath: sweep, output: out, shards: 3, dryRun: true })).rejects.toThrow('exists from an earlier submission');

    // run the tasks as Slurm would, leaving out task 2: the merge refuses and names it
    for (const k of [1, 3]) {
      const t = runBash(`${out}.shards.sbatch`, { SLURM_ARRAY_TASK_ID: String(k) });
      expect(t.status, t.stderr).toBe(0);
    }
    const early = runBash(`${out}.merge.sbatch`);
    expect(early.status, early.stderr).toBe(2);
    expect(early.stderr).toContain('shard 2 of 3 is missing (part-2.arrow: not started, or failed before committing a row)');
    expect(early.stderr).toContain(`rerun them: sbatch --array=2 ${out}.shards.sbatch`);
    expect(fs.existsSync(out)).toBe(false);

    const t2 = runBash(`${out}.shards.sbatch`, { SLURM_ARRAY_TASK_ID: '2' });
    expect(t2.status, t2.stderr).toBe(0);
    const merged = runBash(`${out}.merge.sbatch`);
    expect(merged.status, merged.stderr).toBe(0);

    const local = path.join(dir, 'ridge-local.arrow');
    const l = runCliSync(['run', sweep, '-o', local, '-q', '--no-summary', '-w', '1']);
    expect(l.status, l.stderr).toBe(0);
    expect(data(out)).toEqual(data(local));
  });

  it('a task refuses a sweep copy edited after submission (its hash differs from the one recorded)', () => {
    const sweep = writeSweep(dir, 'edited.yaml', SWEEP);
    const out = path.join(dir, 'edited.arrow');
    const r = runCliSync(['submit', sweep, '-o', out, '--shards', '2'], { env: { PATH: fakePath } });
    expect(r.status, r.stderr).toBe(0);
    const copy = path.join(`${out}.parts`, 'sweep', 'edited.yaml');
    fs.writeFileSync(copy, SWEEP.replace('1500', '1550'));
    const t = runBash(`${out}.shards.sbatch`, { SLURM_ARRAY_TASK_ID: '1' });
    expect(t.status).toBe(2);
    expect(t.stderr).toMatch(/--sweep-hash: .*edited\.yaml is sweep [0-9a-f]{12}, not the [0-9a-f]{12} recorded when it was submitted/);
    expect(fs.existsSync(path.join(`${out}.parts`, 'part-1.arrow'))).toBe(false);
  });
});
