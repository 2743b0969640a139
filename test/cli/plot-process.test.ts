import { afterAll, describe, expect, it } from 'vitest';
import fs from 'node:fs';
import path from 'node:path';
import { plotProcessInputs } from '../../src/cli/commands/plot.js';
import { runCliSync, tmpDir, problemsOf } from '../helpers.js';

const dir = tmpDir('plot-process');
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));

describe('plot column --process NAME (a process with its own diagram)', () => {
  it('reads every combination of the lists as `column` reads one scenario', () => {
    const r = plotProcessInputs({ process: 'flux', tp: '1300,1350', water: '500', lid: '70', slabDepth: '100,140', heat: 'fixed', output: 'x.svg' });
    expect(r.process.name).toBe('flux');
    expect(r.items.map((i) => [i.inputs.tp_c, i.inputs.slab_depth_km])).toEqual([
      [1300, 100],
      [1300, 140],
      [1350, 100],
      [1350, 140],
    ]);
    expect(r.items.every((i) => i.inputs.water_ppm === 500 && i.inputs.lid_km === 70)).toBe(true);
    expect(r.model.heat).toBe('fixed');
  });

  it('names the option, the value and what is allowed; refuses inputs the process does not use', () => {
    const p = problemsOf(() => plotProcessInputs({ process: 'flux', tp: '1300', water: '500', lid: '70', slabDepth: '400', upwelling: '5', output: 'x.svg' }));
    expect(p.some((m) => m.startsWith('--slab-depth: 400') && m.includes('300'))).toBe(true);
    expect(p.some((m) => m.startsWith('--upwelling: upwelling_mm_yr is not an input of process flux'))).toBe(true);
    expect(problemsOf(() => plotProcessInputs({ process: 'flux', tp: '1300,1310,1320', water: '1,2,3', lid: '70', output: 'x.svg' }))[0]).toMatch(/3 x 3 = 9 scenarios; one diagram draws at most 8/);
    expect(problemsOf(() => plotProcessInputs({ process: 'lava', tp: '1300', output: 'x.svg' }))[0]).toMatch(/^--process: unknown process "lava"/);
  });

  it('writes the flux diagram of two scenarios as SVG (exit 0) and refuses an unknown heat mode (exit 2)', () => {
    const out = path.join(dir, 'flux.svg');
    const r = runCliSync(['plot', 'column', '--process', 'flux', '--tp', '1300', '--water', '300,3000', '--lid', '60', '--slab-depth', '110', '-o', out]);
    expect(r.stderr).not.toMatch(/Error|at /);
    expect(r.status).toBe(0);
    expect(r.stdout).toContain('(2 scenarios)');
    const svg = fs.readFileSync(out, 'utf8');
    expect(svg.startsWith('<svg') || svg.startsWith('<?xml')).toBe(true);
    // outlined text: the scenario labels are not stored as text, but the file has paths for the curves
    expect((svg.match(/<path/g) ?? []).length).toBeGreaterThan(10);
    const bad = runCliSync(['plot', 'column', '--process', 'flux', '--tp', '1300', '--water', '300', '--heat', 'hot', '-o', path.join(dir, 'bad.svg')]);
    expect(bad.status).toBe(2);
    expect(bad.stderr).toMatch(/--heat/);
    expect(fs.existsSync(path.join(dir, 'bad.svg'))).toBe(false);
  }, 120_000);
});
