import { describe, expect, it } from 'vitest';
import { spawnSync } from 'node:child_process';
import { fileURLToPath } from 'node:url';

const CLI = fileURLToPath(new URL('../../dist/src/cli/main.js', import.meta.url));

function cli(...args: string[]) {
  return spawnSync(process.execPath, [CLI, ...args], { encoding: 'utf8' });
}

describe('meltsweep CLI surface', () => {
  it('--help exits 0 and lists the program', () => {
    const r = cli('--help');
    expect(r.status).toBe(0);
    expect(r.stdout).toContain('Usage: meltsweep');
  });

  it('an unknown command exits 2 with a clear error', () => {
    const r = cli('no-such-command');
    expect(r.status).toBe(2);
    expect(r.stderr).toMatch(/error/i);
  });

  it('an unknown option exits 2 and names it', () => {
    const r = cli('--no-such-option');
    expect(r.status).toBe(2);
    expect(r.stderr).toContain('--no-such-option');
  });
});
