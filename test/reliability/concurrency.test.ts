/**
 * One writer per output, and bounded resources whatever the input: a second run on a running
 * output is refused and changes nothing; stale locks are taken over; a 10^12-point run stops on
 * Ctrl-C promptly with bounded memory; -w above the core count is capped.
 */
import { describe, expect, it } from 'vitest';
import { spawnSync } from 'node:child_process';
import { once } from 'node:events';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { setTimeout as sleep } from 'node:timers/promises';
import { validateSweep } from '../../src/spec/index.js';
import { runSweep } from '../../src/run/run-sweep.js';
import { lockOutput, lockPathFor } from '../../src/run/output-lock.js';
import { InputError } from '../../src/errors.js';
import { readTable, ROOT, runCliSync, scratchDir, spawnCli, tableColumns, writeSweep } from '../helpers.js';

const dir = scratchDir('concurrency');

// 6,000 isentropic columns on one worker: several seconds, long enough to be interfered with
const SWEEP = `
name: lock test L-1
axes:
  tp_c: { from: 1250, to: 1550, count: 60 }
  water_ppm: { from: 0, to: 600, count: 25 }
  lid_km: { values: [0, 20, 40, 60] }
design: { kind: grid }
model: { thermal: isentropic, water: batch }
`;

async function waitFor(cond: () => boolean, ms: number): Promise<void> {
  const t0 = Date.now();
  while (!cond()) {
    if (Date.now() - t0 > ms) throw new Error('timed out waiting');
    await sleep(20);
  }
}

/** The pid of a process that has already exited (a stale lock's owner). */
function deadPid(): number {
  const r = spawnSync(process.execPath, ['-e', 'process.stdout.write(String(process.pid))'], { encoding: 'utf8' });
  return Number(r.stdout);
}

describe('one writer per output', () => {
  it('a second run or --resume on a running output is refused (exit 2) and does not disturb the first', async () => {
    const sweep = writeSweep(dir, 'l1.yaml', SWEEP);
    const spec = validateSweep((await import('yaml')).parse(SWEEP));
    const out = path.join(dir, 'busy.arrow');
    const first = spawnCli(['run', sweep, '-o', out, '--workers', '1', '--quiet', '--no-summary', '--commit-seconds', '0.1']);
    let stderr = '';
    first.stderr!.on('data', (d: Buffer) => (stderr += d.toString()));
    const exited = once(first, 'exit');
    const tmp = `${out}.tmp-${first.pid}`;
    await waitFor(() => fs.existsSync(tmp) && fs.existsSync(`${out}.partial`), 60_000);
    // in this process: the library refuses with the owner named
    await expect(runSweep({ spec, outPath: out, workers: 1, resume: true })).rejects.toThrow(InputError);
    await expect(runSweep({ spec, outPath: out, workers: 1, resume: true })).rejects.toThrow(
      new RegExp(`being written by another meltsweep command \\(process ${first.pid}, run`),
    );
    await expect(runSweep({ spec, outPath: out, workers: 1 })).rejects.toThrow(/being written by another meltsweep command/);
    await expect(runSweep({ spec, outPath: out, workers: 1, force: true })).rejects.toThrow(/being written by another meltsweep command/);
    // the first run's temporary output and partial run are untouched
    expect(fs.existsSync(tmp)).toBe(true);
    expect(fs.existsSync(`${out}.partial/manifest.json`)).toBe(true);
    const [code] = (await exited) as [number | null];
    expect(code, stderr).toBe(0);
    const t = readTable(out);
    expect(t.numRows).toBe(6000);
    expect(tableColumns(t).scenario_id).toEqual(Array.from({ length: 6000 }, (_, i) => i));
    expect(fs.existsSync(lockPathFor(out))).toBe(false);
  }, 120_000);

  it('a stale lock (its process is gone) is taken over; a lock held on another host is refused naming it', () => {
    const sweep = writeSweep(dir, 'small.yaml', 'name: small S-2\naxes:\n  tp_c: { from: 1300, to: 1400, count: 5 }\nfixed: { water_ppm: 0 }\nmodel: { thermal: isentropic }\n');
    const out = path.join(dir, 'stale.arrow');
    const lock = lockPathFor(out);
    const owner = { kind: 'meltsweep output lock', pid: deadPid(), host: os.hostname(), since: '2000-01-01T00:00:00.000Z', command: 'run' };
    fs.writeFileSync(lock, JSON.stringify(owner));
    const r = runCliSync(['run', sweep, '-o', out, '--quiet', '--no-summary', '--workers', '1']);
    expect(r.status, r.stderr).toBe(0);
    expect(r.stderr).toContain(`note: took over the lock ${lock} of process ${owner.pid} (run, since 2000-01-01T00:00:00.000Z), which is no longer running`);
    expect(fs.existsSync(lock)).toBe(false);
    // merge takes a stale lock over the same way
    fs.writeFileSync(lockPathFor(path.join(dir, 'merged.arrow')), JSON.stringify({ ...owner, command: 'merge' }));
    const m = runCliSync(['merge', out, '-o', path.join(dir, 'merged.arrow')]);
    expect(m.status, m.stderr).toBe(0);
    expect(m.stderr).toContain(`of process ${owner.pid} (merge, since 2000-01-01T00:00:00.000Z), which is no longer running`);
    expect(fs.existsSync(lockPathFor(path.join(dir, 'merged.arrow')))).toBe(false);
    const elsewhere = path.join(dir, 'elsewhere.arrow');
    fs.writeFileSync(lockPathFor(elsewhere), JSON.stringify({ ...owner, host: 'node-z9', pid: 4242 }));
    const refused = runCliSync(['run', sweep, '-o', elsewhere, '--quiet', '--no-summary']);
    expect(refused.status).toBe(2);
    expect(refused.stderr).toContain('process 4242 on host node-z9');
    expect(refused.stderr).toContain(`delete ${lockPathFor(elsewhere)} if that process is gone`);
    expect(fs.readdirSync(dir).filter((n) => n.startsWith('elsewhere.arrow'))).toEqual(['elsewhere.arrow.lock']);
  }, 60_000);

  it('a live lock (its process runs on this host) refuses run, --resume, --force and merge, and nothing on disk changes', () => {
    const sweep = writeSweep(dir, 'live.yaml', 'name: live lock L-3\naxes:\n  tp_c: { from: 1300, to: 1400, count: 5 }\nfixed: { water_ppm: 0 }\nmodel: { thermal: isentropic }\n');
    const folder = fs.mkdtempSync(path.join(dir, 'live-'));
    const out = path.join(folder, 'live.arrow');
    expect(runCliSync(['run', sweep, '-o', out, '--quiet', '--no-summary', '--workers', '1']).status).toBe(0);
    // a partial run and a lock held by this (running) test process
    fs.mkdirSync(`${out}.partial`);
    fs.writeFileSync(`${out}.partial/manifest.json`, '{}');
    const owner = { kind: 'meltsweep output lock', pid: process.pid, host: os.hostname(), since: '2001-02-03T04:05:06.000Z', command: 'run' };
    fs.writeFileSync(lockPathFor(out), JSON.stringify(owner));
    const merged = path.join(folder, 'merged.arrow');
    fs.writeFileSync(lockPathFor(merged), JSON.stringify({ ...owner, command: 'merge' }));
    const snapshot = (): string[] =>
      fs.readdirSync(folder, { recursive: true }).map(String).sort().map((n) => {
        const st = fs.statSync(path.join(folder, n));
        return `${n} ${st.size} ${st.mtimeMs}${st.isFile() ? ` ${fs.readFileSync(path.join(folder, n)).toString('base64').slice(-40)}` : ''}`;
      });
    const before = snapshot();
    for (const args of [['run', sweep, '-o', out], ['run', sweep, '-o', out, '--resume'], ['run', sweep, '-o', out, '--force'], ['merge', out, '-o', merged, '--force']]) {
      const r = runCliSync(args[0] === 'run' ? [...args, '--quiet', '--no-summary'] : args);
      expect(r.status, `${args.join(' ')}: ${r.stderr}`).toBe(2);
      // a plain run is refused because the output exists; the others because of the lock
      if (args.length > 4) expect(r.stderr).toContain(`being written by another meltsweep command (process ${process.pid}, ${args[0]}, since 2001-02-03T04:05:06.000Z)`);
      expect(snapshot(), args.join(' ')).toEqual(before);
    }
  }, 60_000);

  it('the lock is exclusive within one process too, and released only by its owner', () => {
    const out = path.join(dir, 'twice.arrow');
    const a = lockOutput(out, 'test');
    expect(() => lockOutput(out, 'test')).toThrow(/being written by another meltsweep command/);
    a.release();
    const b = lockOutput(out, 'test');
    a.release(); // a second release by the old owner must not free the new lock
    expect(fs.existsSync(lockPathFor(out))).toBe(true);
    b.release();
    expect(fs.existsSync(lockPathFor(out))).toBe(false);
  });
});

describe('bounded resources', () => {
  /** Peak resident memory of a process, MB (Linux /proc). */
  function peakRssMb(pid: number): number {
    const m = /VmHWM:\s+(\d+) kB/.exec(fs.readFileSync(`/proc/${pid}/status`, 'utf8'));
    return m ? Number(m[1]) / 1024 : NaN;
  }

  it.runIf(process.platform === 'linux')('a 10^12-point run stops within 2 s of Ctrl-C with its memory under 300 MB, and is resumable', async () => {
    const sweep = path.join(ROOT, 'test', 'fixtures', 'huge-sweep.yaml');
    const out = path.join(dir, 'huge.arrow');
    const child = spawnCli(['run', sweep, '-o', out, '--quiet', '--no-summary', '--commit-seconds', '0.2']);
    let stderr = '';
    child.stderr!.on('data', (d: Buffer) => (stderr += d.toString()));
    const exited = once(child, 'exit');
    // running: the output's temporary file exists once the pool is computing
    await waitFor(() => fs.existsSync(`${out}.tmp-${child.pid}`), 60_000);
    await sleep(1500);
    const rssMb = peakRssMb(child.pid!);
    const t0 = performance.now();
    child.kill('SIGINT');
    const [code] = (await exited) as [number | null];
    const stopMs = performance.now() - t0;
    process.stdout.write(`10^12-point run: peak RSS ${rssMb.toFixed(0)} MB, stopped ${stopMs.toFixed(0)} ms after SIGINT\n`);
    expect(code, stderr).toBe(130);
    expect(rssMb).toBeLessThan(300);
    // the bound the issue asks for, measured from the signal: Ctrl-C cancels the unfinished chunks
    // (a running one stops its thread) and the process exits as soon as the partial run is
    // committed; scripts/interrupt-timing.mjs measured 0.15-0.33 s at load 4.5 and 0.22-1.1 s
    // (median 0.5 s) at load 9 on the 2-core machine, 0.96 s here once under the whole suite at load 12
    expect(stopMs).toBeLessThan(2000);
    expect(stderr).toContain('--resume');
    expect(fs.existsSync(`${out}.partial/manifest.json`)).toBe(true);
    expect(fs.readdirSync(dir).filter((n) => n.startsWith('huge.arrow.tmp-'))).toEqual([]);
    expect(fs.existsSync(lockPathFor(out))).toBe(false);
  }, 120_000);

  it('--workers above the core count is capped (with a note) unless --oversubscribe', async () => {
    const sweep = writeSweep(dir, 'cap.yaml', 'name: cap C-3\naxes:\n  tp_c: { from: 1300, to: 1400, count: 40 }\nfixed: { water_ppm: 0 }\nmodel: { thermal: isentropic }\n');
    const cores = os.availableParallelism();
    const r = runCliSync(['run', sweep, '-o', path.join(dir, 'cap.arrow'), '-w', '1024', '--quiet', '--no-summary']);
    expect(r.status, r.stderr).toBe(0);
    expect(r.stderr).toContain(`--workers 1024 is more than the ${cores} available cores; using ${cores} (add --oversubscribe to use 1024)`);
    expect(r.stdout).toContain(`on ${cores} worker`);
    const spec = validateSweep((await import('yaml')).parse(fs.readFileSync(sweep, 'utf8')));
    const capped = await runSweep({ spec, outPath: path.join(dir, 'capped.arrow'), workers: cores + 1 });
    expect(capped.workers).toBe(cores);
    const over = await runSweep({ spec, outPath: path.join(dir, 'over.arrow'), workers: cores + 1, oversubscribe: true });
    expect(over.workers).toBe(cores + 1);
  }, 60_000);
});
