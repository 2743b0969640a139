#!/usr/bin/env node
/**
 * Ctrl-C on a 10^12-point run, measured: start `meltsweep run` on a 4-axis grid of 1000^4 points,
 * wait until the pool computes, send SIGINT after a random extra delay, and time signal -> exit.
 * Prints one line per trial and a summary (median, max), with the peak resident memory, and checks
 * that no temporary file or lock is left and that the partial run is resumable.
 * Usage: node scripts/interrupt-timing.mjs [TRIALS=10] [SIGNAL=SIGINT]   (after npm run build)
 */
import { spawn } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { once } from 'node:events';
import { setTimeout as sleep } from 'node:timers/promises';

const ROOT = fileURLToPath(new URL('..', import.meta.url));
const CLI = path.join(ROOT, 'dist', 'src', 'cli', 'main.js');
const trials = Number(process.argv[2] ?? 10);
const signal = process.argv[3] ?? 'SIGINT';
const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'meltsweep-stop-'));
const sweep = path.join(ROOT, 'test', 'fixtures', 'huge-sweep.yaml');

function peakRssMb(pid) {
  const m = /VmHWM:\s+(\d+) kB/.exec(fs.readFileSync(`/proc/${pid}/status`, 'utf8'));
  return m ? Number(m[1]) / 1024 : NaN;
}

const times = [];
let bad = 0;
for (let t = 0; t < trials; t++) {
  const out = path.join(dir, `huge-${t}.arrow`);
  const child = spawn(process.execPath, [CLI, 'run', sweep, '-o', out, '--quiet', '--no-summary', '--commit-seconds', '0.2'], { stdio: ['ignore', 'ignore', 'pipe'] });
  let stderr = '';
  child.stderr.on('data', (d) => (stderr += d));
  const exited = once(child, 'exit');
  const t0 = Date.now();
  while (!fs.existsSync(`${out}.tmp-${child.pid}`)) {
    if (Date.now() - t0 > 60_000) throw new Error('the run did not start');
    await sleep(20);
  }
  await sleep(300 + Math.random() * 2000);
  const rss = peakRssMb(child.pid);
  const s0 = performance.now();
  child.kill(signal);
  const [code] = await exited;
  const ms = performance.now() - s0;
  const left = fs.readdirSync(dir).filter((n) => n.startsWith(`huge-${t}.arrow`) && !n.endsWith('.partial'));
  const resumable = fs.existsSync(`${out}.partial/manifest.json`);
  const ok = code === 130 && left.length === 0 && resumable;
  if (!ok) bad++;
  times.push(ms);
  console.log(`trial ${t + 1}: ${signal} -> exit ${code} in ${ms.toFixed(0)} ms, peak RSS ${rss.toFixed(0)} MB, left behind: ${left.join(', ') || 'nothing'}, resumable: ${resumable}${ok ? '' : `\n${stderr}`}`);
  fs.rmSync(`${out}.partial`, { recursive: true, force: true });
}
times.sort((a, b) => a - b);
console.log(`${trials} trials: median ${times[Math.floor(trials / 2)].toFixed(0)} ms, max ${times[trials - 1].toFixed(0)} ms, failures ${bad}; load ${os.loadavg().map((x) => x.toFixed(2)).join(' ')}`);
fs.rmSync(dir, { recursive: true, force: true });
process.exitCode = bad === 0 ? 0 : 1;
