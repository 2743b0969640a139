import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import fs from 'node:fs';
import path from 'node:path';
import { InputError } from '../../src/errors.js';
import { plotColumnInputs } from '../../src/cli/commands/plot.js';
import { readResultsInfo } from '../../src/report/results-columns.js';
import { runCliSync, tmpDir } from '../helpers.js';
import { gridSweepFile, xmlProblem } from './helpers.js';

// These tests run the built CLI (dist/), as `npm test` builds it first.
const dir = tmpDir('report-cli');
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));

describe('meltsweep plot column', () => {
  it('writes an outlined SVG of the cartesian product, and never replaces a file without --force', () => {
    const out = path.join(dir, 'column.svg');
    const args = ['plot', 'column', '--tp', '1300,1400', '--water', '0,150', '--lid', '8', '--width', '120mm', '-o', out];
    const r = runCliSync(args);
    expect(r.stderr).toBe('');
    expect(r.status).toBe(0);
    expect(r.stdout).toContain(`column diagram: ${out} (4 scenarios)`);
    const svg = fs.readFileSync(out, 'utf8');
    expect(xmlProblem(svg)).toBeNull();
    expect(svg).toMatch(/<svg[^>]*\swidth="120mm"/);
    expect(svg).not.toContain('<text');
    fs.writeFileSync(out, 'mine');
    const again = runCliSync(args);
    expect(again.status).toBe(2);
    expect(again.stderr).toContain(`-o: ${out} already exists; give --force to replace it`);
    expect(fs.readFileSync(out, 'utf8')).toBe('mine');
    expect(runCliSync([...args, '--force']).status).toBe(0);
    expect(fs.readFileSync(out, 'utf8')).not.toBe('mine');
  });

  it('refuses bad options with exit 2, naming the option, the value and what is allowed', () => {
    const r = runCliSync(['plot', 'column', '--tp', '1300,abc', '--lid', '-5', '--mode', 'wet', '--dpi', '5', '-o', path.join(dir, 'x.jpg')]);
    expect(r.status).toBe(2);
    expect(r.stderr).toContain('--tp: "abc" is not a number; allowed 1100-1800 degC');
    expect(r.stderr).toContain("--lid: -5 is below the model's range 0-200 km");
    expect(r.stderr).toContain('--mode: "wet" is not a water mode; allowed: batch, fractional');
    expect(r.stderr).toContain('-o: ');
    expect(r.stderr).toContain('give a file name ending in .svg, .png or .pdf');
    expect(r.stderr).toContain('--dpi: "5" is not allowed');
    expect(fs.existsSync(path.join(dir, 'x.jpg'))).toBe(false);
  });

  it('combines the lists as a cartesian product, at most 8 scenarios, and checks the model options', () => {
    const base = { tp: '1300', water: '0', lid: '0', thermal: 'auto', mode: 'batch', step: '0.05', output: 'a.svg' };
    const inputs = plotColumnInputs({ ...base, tp: '1300,1400', water: '0,100', upwelling: '5' });
    expect(inputs.scenarios.map((s) => [s.tp_c, s.water_ppm, s.upwelling_mm_yr])).toEqual([[1300, 0, 5], [1300, 100, 5], [1400, 0, 5], [1400, 100, 5]]);
    const problem = (o: Partial<typeof base> & { upwelling?: string }): string => {
      try {
        plotColumnInputs({ ...base, ...o });
      } catch (err) {
        expect(err).toBeInstanceOf(InputError);
        return (err as InputError).message;
      }
      throw new Error('no error');
    };
    expect(problem({ tp: '1300,1350,1400', water: '0,100,200' })).toBe('--tp, --water, --lid, --upwelling: the lists combine into 3 x 3 x 1 x 1 = 9 scenarios; one diagram draws at most 8');
    expect(problem({ thermal: 'conductive' })).toBe('--thermal conductive needs an upwelling rate: give --upwelling <mm/yr>');
    expect(problem({ upwelling: '5', mode: 'fractional' })).toMatch(/^--mode fractional: the conductive model computes batch water only/);
    expect(problem({ upwelling: '0' })).toBe("--upwelling: 0 is outside the model's range 0-10000 mm/yr (0 excluded)");
    expect(problem({ step: '2' })).toBe("--step: 2 is above the model's range 0.0001-0.5 GPa");
  });
});

describe('meltsweep report', () => {
  let results = '';
  beforeAll(async () => {
    results = await gridSweepFile(dir, 'r7.arrow');
  });

  it('writes RESULTS.report.html by default', () => {
    const r = runCliSync(['report', results, '--outputs', 'crust_km,f_max']);
    expect(r.stderr).toBe('');
    expect(r.status).toBe(0);
    const out = path.join(dir, 'r7.report.html');
    expect(r.stdout).toContain(`report: ${out} (7 pictures)`);
    expect(xmlProblem(fs.readFileSync(out, 'utf8'))).toBeNull();
  });

  it('exits 2 for a bad option', () => {
    const bad = runCliSync(['report', results, '-o', path.join(dir, 'b.html'), '--x', 'tp', '--at', 'lid_km=10']);
    expect(bad.status).toBe(2);
    expect(bad.stderr).toContain('--x: "tp" is not an input; did you mean tp_c? swept inputs: tp_c, water_ppm, lid_km');
    expect(fs.existsSync(path.join(dir, 'b.html'))).toBe(false);
  });

  it('refuses a file that is not a results table', async () => {
    const foreign = path.join(dir, 'foreign.arrow');
    fs.writeFileSync(foreign, 'not arrow');
    await expect(readResultsInfo(foreign)).rejects.toThrow(/^RESULTS: .*foreign.arrow is not a meltsweep results table/);
  });
});
