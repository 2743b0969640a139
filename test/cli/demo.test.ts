import { afterAll, describe, expect, it } from 'vitest';
import fs from 'node:fs';
import path from 'node:path';
import { readTable, runCliSync, tmpDir } from '../helpers.js';

const dir = tmpDir('demo');
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));

describe('meltsweep demo (what npm start runs)', () => {
  it('runs the built-in sweep end to end and says where the table, sensitivity table and report went', () => {
    const r = runCliSync(['demo', '--quiet'], { cwd: dir });
    expect(r.status, r.stderr).toBe(0);
    const out = path.join(dir, 'out');
    const files = ['demo-ridge-r7.arrow', 'demo-ridge-r7.sensitivity.arrow', 'demo-ridge-r7.report.html'];
    for (const f of files) {
      expect(fs.existsSync(path.join(out, f)), f).toBe(true);
      expect(r.stdout).toContain(path.join(fs.realpathSync(out), f));
    }
    // 9 x 5 x 4 grid of sweeps/demo-ridge-r7.yaml
    expect(readTable(path.join(out, 'demo-ridge-r7.arrow')).numRows).toBe(180);
    expect(r.stdout).toMatch(/rows: 180 \(ok \d+/);
    // running it again replaces the earlier results
    expect(runCliSync(['demo', '--quiet'], { cwd: dir }).status).toBe(0);
  });
});
