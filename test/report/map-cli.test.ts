/**
 * `meltsweep plot map` and `meltsweep report --contour / --figures` through the built CLI: the
 * files open (signatures, PNG header and resolution, PDF page count and size), options are checked
 * with clear messages and "did you mean", and nothing is replaced without --force.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import fs from 'node:fs';
import path from 'node:path';
import { runCliSync, tmpDir } from '../helpers.js';
import { gridSweepFile, xmlProblem } from './helpers.js';

const dir = tmpDir('map-cli');
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));
let results = '';
beforeAll(async () => {
  results = await gridSweepFile(dir, 'r7.arrow');
});

/** Width, height and resolution (dots per inch) from a PNG's IHDR and pHYs chunks. */
function pngHeader(png: Buffer): { width: number; height: number; dpi: number | null } {
  expect(png.subarray(0, 8)).toEqual(Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]));
  expect(png.toString('latin1', 12, 16)).toBe('IHDR');
  let dpi: number | null = null;
  for (let at = 8; at < png.length; ) {
    const len = png.readUInt32BE(at);
    if (png.toString('latin1', at + 4, at + 8) === 'pHYs') dpi = png.readUInt32BE(at + 8) * 0.0254;
    at += 12 + len;
  }
  return { width: png.readUInt32BE(16), height: png.readUInt32BE(20), dpi };
}

/** Page count and first page size (pt) of a PDF. */
function pdfPages(pdf: Buffer): { pages: number; width: number; height: number } {
  const text = pdf.toString('latin1');
  expect(text.startsWith('%PDF-1.')).toBe(true);
  expect(text.trimEnd().endsWith('%%EOF')).toBe(true);
  const box = /\/MediaBox \[0 0 ([0-9.]+) ([0-9.]+)\]/.exec(text)!;
  return { pages: (text.match(/\/Type \/Page\b/g) ?? []).length, width: Number(box[1]), height: Number(box[2]) };
}

describe('meltsweep plot map', () => {
  it('writes a PNG at 85 mm and 300 dpi, a one-page PDF of that width and an outlined SVG', () => {
    const base = ['plot', 'map', results, '--x', 'tp_c', '--y', 'water_ppm', '--z', 'crust_km', '--contour', '7,9', '--at', 'lid_km=10', '--width', '85mm'];
    const png = path.join(dir, 'map.png');
    const r = runCliSync([...base, '--dpi', '300', '-o', png]);
    expect(r.stderr).toBe('');
    expect(r.status).toBe(0);
    expect(r.stdout).toContain(`map: ${png} (crust_km over tp_c and water_ppm, 15 cells)`);
    const head = pngHeader(fs.readFileSync(png));
    // 85 mm at 300 dpi = 1004 px (85 / 25.4 x 300)
    expect(head.width).toBe(1004);
    expect(head.dpi).toBeCloseTo(300, 0);
    expect(head.height).toBeGreaterThan(500);

    const pdf = path.join(dir, 'map.pdf');
    expect(runCliSync([...base, '-o', pdf]).status).toBe(0);
    const p = pdfPages(fs.readFileSync(pdf));
    expect(p.pages).toBe(1);
    // 85 mm = 240.94 pt (72 pt per inch); same proportions as the PNG
    expect(p.width).toBeCloseTo((85 / 25.4) * 72, 1);
    expect(p.height / p.width).toBeCloseTo(head.height / head.width, 2);

    const svgFile = path.join(dir, 'map.svg');
    expect(runCliSync([...base, '-o', svgFile]).status).toBe(0);
    const svg = fs.readFileSync(svgFile, 'utf8');
    expect(xmlProblem(svg)).toBeNull();
    expect(svg).toMatch(/<svg[^>]*\swidth="85mm"/);
    expect(svg).not.toContain('<text');

    // never replaced without --force
    fs.writeFileSync(svgFile, 'mine');
    const again = runCliSync([...base, '-o', svgFile]);
    expect(again.status).toBe(2);
    expect(again.stderr).toContain(`-o: ${svgFile} already exists; give --force to replace it`);
    expect(fs.readFileSync(svgFile, 'utf8')).toBe('mine');
    expect(runCliSync([...base, '-o', svgFile, '--force']).status).toBe(0);
  });

  it('refuses bad options with exit 2, naming the option and the value, with "did you mean"', () => {
    const out = path.join(dir, 'bad.svg');
    const run = (...args: string[]) => runCliSync(['plot', 'map', results, '-o', out, ...args]);
    const cases: [string[], string][] = [
      [['--z', 'crust'], '--z: "crust" is not an output column of this table; did you mean crust_km?'],
      [['--z', 'crust_km', '--x', 'tp'], '--x: "tp" is not an input; did you mean tp_c? swept inputs: tp_c, water_ppm, lid_km'],
      [['--z', 'crust_km', '--contour', '7,deep'], '--contour: "deep" is not a number'],
      [['--z', 'crust_km', '--at', 'lid_km=90'], '--at: lid_km=90 km is outside the swept range 0-20 km'],
      [['--z', 'crust_km', '--width', '3km'], '--width: "3km" is not a width'],
    ];
    for (const [args, message] of cases) {
      const r = run(...args);
      expect(r.status, args.join(' ')).toBe(2);
      expect(r.stderr).toContain(message);
    }
    const noExt = runCliSync(['plot', 'map', results, '--z', 'crust_km', '-o', path.join(dir, 'map.gif')]);
    expect(noExt.status).toBe(2);
    expect(noExt.stderr).toContain('is not allowed; give a file name ending in .svg, .png or .pdf');
    expect(fs.existsSync(out)).toBe(false);
  });
});

describe('meltsweep report --contour and --figures', () => {
  it('draws the contours and writes every figure as SVG, PNG and PDF, refusing to overwrite', () => {
    const figs = path.join(dir, 'figs');
    const html = path.join(dir, 'r.html');
    const args = ['report', results, '-o', html, '--outputs', 'crust_km', '--contour', 'crust_km=7', '--figures', figs, '--width', '85mm', '--dpi', '150'];
    const r = runCliSync(args);
    expect(r.stderr).toBe('');
    expect(r.status).toBe(0);
    expect(r.stdout).toContain('(4 pictures)');
    expect(r.stdout).toContain(`figures: 12 files in ${figs}`);
    expect(fs.readFileSync(html, 'utf8')).toContain('Contour lines at 7\u00a0km.');
    const files = fs.readdirSync(figs).sort();
    expect(files).toEqual(
      ['01-map-crust_km', '02-indices-crust_km', '03-main-effects-crust_km', '04-column-crust_km'].flatMap((s) => [`${s}.pdf`, `${s}.png`, `${s}.svg`]),
    );
    for (const f of files.filter((x) => x.endsWith('.png'))) {
      const head = pngHeader(fs.readFileSync(path.join(figs, f)));
      // 85 mm at 150 dpi = 502 px
      expect(head.width, f).toBe(502);
      expect(head.dpi).toBeCloseTo(150, 0);
    }
    for (const f of files.filter((x) => x.endsWith('.pdf'))) expect(pdfPages(fs.readFileSync(path.join(figs, f))).pages, f).toBe(1);
    for (const f of files.filter((x) => x.endsWith('.svg'))) expect(fs.readFileSync(path.join(figs, f), 'utf8')).toMatch(/<svg[^>]*\swidth="85mm"/);

    const before = fs.statSync(path.join(figs, '01-map-crust_km.png')).mtimeMs;
    const again = runCliSync(args);
    expect(again.status).toBe(2);
    expect(again.stderr).toContain(`--figures: ${figs} already holds 12 figure files (01-map-crust_km.pdf, ...); give --force to replace them`);
    expect(fs.statSync(path.join(figs, '01-map-crust_km.png')).mtimeMs).toBe(before);
    expect(runCliSync([...args, '--force']).status).toBe(0);
    // three report runs with 12 exports each: minutes on a loaded 2-core machine
  }, 300_000);

  it('checks --contour, --width and --figures with clear messages', () => {
    const html = path.join(dir, 'bad.html');
    const cases: [string[], string][] = [
      [['--contour', 'crustkm=7'], '--contour: "crustkm" is not an output column; did you mean crust_km? allowed: '],
      [['--outputs', 'f_max', '--contour', 'crust_km=7'], '--contour: crust_km is not among the outputs drawn (f_max); add it with --outputs'],
      [['--contour', '7'], '--contour: "7" is not allowed; give output=value pairs, e.g. crust_km=7 or crust_km=7,9'],
      [['--width', '85mm'], '--width: applies to the files of --figures DIR; give --figures too'],
      [['--figures', results], `--figures: ${results} is a file; give a folder`],
    ];
    for (const [args, message] of cases) {
      const r = runCliSync(['report', results, '-o', html, ...args]);
      expect(r.status, args.join(' ')).toBe(2);
      expect(r.stderr).toContain(message);
    }
    expect(fs.existsSync(html)).toBe(false);
  }, 300_000);
});
