import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { spawnSync } from 'node:child_process';
import crypto from 'node:crypto';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { runCliSync, tmpDir, writeSweep } from '../helpers.js';

const dir = tmpDir('faults');
const mnt = path.join(dir, 'small-disk');

// 12,000 isentropic columns: small, but its table is a few MB.
const SWEEP = `
name: full disk test D-1
axes:
  tp_c: { from: 1250, to: 1550, count: 60 }
  water_ppm: { from: 0, to: 600, count: 20 }
  lid_km: { values: [0, 10, 20, 30, 45, 60, 80, 100, 120, 150] }
design: { kind: grid }
model: { thermal: isentropic, water: batch }
`;

function sha256(file: string): string {
  return crypto.createHash('sha256').update(fs.readFileSync(file)).digest('hex');
}

/** A real small disk: a tmpfs of the given size (root only; the CI machine runs as root). */
function mountSmallDisk(bytes: number): boolean {
  fs.mkdirSync(mnt, { recursive: true });
  const r = spawnSync('mount', ['-t', 'tmpfs', '-o', `size=${bytes}`, 'tmpfs', mnt]);
  return r.status === 0;
}
function resizeSmallDisk(bytes: number): void {
  const r = spawnSync('mount', ['-o', `remount,size=${bytes}`, mnt]);
  expect(r.status, String(r.stderr)).toBe(0);
}
function unmount(): void {
  spawnSync('umount', [mnt]);
}

let sweep = '';
let reference = '';
let referenceBytes = 0;
/** A real probe: root in a sandbox that allows tmpfs mounts (this project's machines do). */
function probeMount(): boolean {
  if (process.getuid?.() !== 0) return false;
  const probe = fs.mkdtempSync(path.join(os.tmpdir(), 'meltsweep-mount-probe-'));
  const ok = spawnSync('mount', ['-t', 'tmpfs', '-o', 'size=64k', 'tmpfs', probe]).status === 0;
  if (ok) spawnSync('umount', [probe]);
  fs.rmSync(probe, { recursive: true, force: true });
  return ok;
}
const canMount = probeMount();

beforeAll(() => {
  sweep = writeSweep(dir, 'd1.yaml', SWEEP);
  reference = path.join(dir, 'reference.arrow');
  const r = runCliSync(['run', sweep, '-o', reference, '--workers', '2', '--quiet', '--no-summary']);
  expect(r.status, r.stderr).toBe(0);
  referenceBytes = fs.statSync(reference).size;
});

afterAll(() => {
  unmount();
  fs.rmSync(dir, { recursive: true, force: true });
});

describe('output problems', () => {
  it('refuses an existing output without --force before any work (exit 2), and replaces it with --force', () => {
    const out = path.join(dir, 'existing.arrow');
    fs.writeFileSync(out, 'precious');
    const r = runCliSync(['run', sweep, '-o', out, '--quiet', '--no-summary']);
    expect(r.status).toBe(2);
    expect(r.stderr).toContain('already exists; use --force');
    expect(fs.readFileSync(out, 'utf8')).toBe('precious');
    expect(fs.existsSync(`${out}.partial`)).toBe(false);
    const f = runCliSync(['run', sweep, '-o', out, '--quiet', '--no-summary', '--force', '--workers', '1']);
    expect(f.status, f.stderr).toBe(0);
    expect(sha256(out)).toBe(sha256(reference));
  });

  it('refuses an unwritable output folder before any work (exit 2)', () => {
    const r = runCliSync(['run', sweep, '-o', '/proc/meltsweep-test.arrow', '--quiet']);
    expect(r.status).toBe(2);
    expect(r.stderr).toContain('--output: cannot write in folder /proc');
    const missing = runCliSync(['run', sweep, '-o', path.join(dir, 'no', 'such', 'x.arrow'), '--quiet']);
    expect(missing.status).toBe(2);
    expect(missing.stderr).toContain('does not exist');
  });

  it.runIf(canMount)('a disk that fills while computing stops the run (exit 1) with a clear message; the run resumes once space is freed', () => {
    expect(mountSmallDisk(Math.floor(referenceBytes * 0.4))).toBe(true);
    try {
      const out = path.join(mnt, 'full.arrow');
      const r = runCliSync(['run', sweep, '-o', out, '--quiet', '--no-summary', '--commit-seconds', '0.05', '--workers', '2']);
      expect(r.status, r.stderr).toBe(1);
      expect(r.stderr).toMatch(/cannot write .*ENOSPC/);
      // one "cannot write FILE" per message, not the same words nested twice
      expect(r.stderr).not.toMatch(/cannot write (\S+): cannot write \1/);
      expect(r.stderr).toContain('--resume');
      expect(fs.existsSync(out)).toBe(false);
      expect(fs.existsSync(`${out}.partial`)).toBe(true);
      resizeSmallDisk(referenceBytes * 4);
      const again = runCliSync(['run', sweep, '-o', out, '--quiet', '--no-summary', '--resume']);
      expect(again.status, again.stderr).toBe(0);
      expect(again.stdout).toMatch(/rows were already done/);
      expect(sha256(out)).toBe(sha256(reference));
    } finally {
      unmount();
    }
  });

  it.runIf(canMount)('a disk that fills late, while the output copy grows beside the segments, keeps every committed row; resume publishes the same table', () => {
    // room for the segments but not for the segments and the output (written alongside) together
    expect(mountSmallDisk(Math.floor(referenceBytes * 1.5))).toBe(true);
    try {
      const out = path.join(mnt, 'publish.arrow');
      const r = runCliSync(['run', sweep, '-o', out, '--quiet', '--no-summary', '--workers', '2']);
      expect(r.status, r.stderr).toBe(1);
      expect(r.stderr).toMatch(/cannot write .*ENOSPC/);
      // one "cannot write FILE" per message, not the same words nested twice
      expect(r.stderr).not.toMatch(/cannot write (\S+): cannot write \1/);
      expect(r.stderr).toContain('--resume');
      expect(fs.existsSync(out)).toBe(false);
      expect(fs.readdirSync(mnt).filter((n) => n.includes('.tmp-'))).toEqual([]);
      resizeSmallDisk(referenceBytes * 4);
      const again = runCliSync(['run', sweep, '-o', out, '--quiet', '--no-summary', '--resume']);
      expect(again.status, again.stderr).toBe(0);
      expect(sha256(out)).toBe(sha256(reference));
    } finally {
      unmount();
    }
  });
});

describe('a read-only folder', () => {
  it.runIf(canMount)('every command that writes answers EROFS with a message (exit 2), never a stack trace, and writes nothing', () => {
    fs.mkdirSync(mnt, { recursive: true });
    // a results table on a file system that is then made read-only: every output goes beside it
    expect(mountSmallDisk(referenceBytes * 2)).toBe(true);
    const results = path.join(mnt, 'results.arrow');
    fs.copyFileSync(reference, results);
    expect(spawnSync('mount', ['-o', 'remount,ro', mnt]).status).toBe(0);
    try {
      const commands = [
        ['run', sweep, '-o', path.join(mnt, 'r.arrow'), '-q'],
        ['merge', reference, '-o', path.join(mnt, 'm.arrow')],
        ['report', results],
        ['sensitivity', results],
        ['fit', results, '--observe', 'crust_km=7+-1'],
        ['plot', 'column', '--tp', '1350', '-o', path.join(mnt, 'c.svg')],
        ['plot', 'map', results, '--z', 'crust_km', '-o', path.join(mnt, 'm.svg')],
      ];
      for (const args of commands) {
        const r = runCliSync(args);
        expect(r.status, `${args.slice(0, 2).join(' ')}: ${r.stderr}`).toBe(2);
        expect(r.stderr).toMatch(/^meltsweep: /);
        expect(r.stderr).not.toMatch(/\n\s+at .+:\d+/);
        expect(r.stderr).not.toContain('unexpected error');
        expect(r.stderr).toMatch(/read-only|EROFS/);
      }
      expect(fs.readdirSync(mnt)).toEqual(['results.arrow']);
    } finally {
      unmount();
    }
  });
});

describe('determinism', () => {
  it('the same sweep gives byte-identical files with 1 and 2 workers and across runs', () => {
    const one = path.join(dir, 'one.arrow');
    const again = path.join(dir, 'again.arrow');
    expect(runCliSync(['run', sweep, '-o', one, '--workers', '1', '--quiet', '--no-summary']).status).toBe(0);
    expect(runCliSync(['run', sweep, '-o', again, '--workers', '2', '--quiet', '--no-summary']).status).toBe(0);
    expect(sha256(one)).toBe(sha256(reference));
    expect(sha256(again)).toBe(sha256(reference));
  });
});
