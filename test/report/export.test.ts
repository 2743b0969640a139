/**
 * Export of pictures to SVG, PNG and PDF: the files open (signatures, PNG header and pixels, PDF
 * page count and page size), have the requested physical size and resolution, carry no live text
 * (outlined glyphs of the bundled font), and a PNG is not blank.
 */
import { describe, expect, it } from 'vitest';
import zlib from 'node:zlib';
import { defaultModel } from '../../src/physics/column.js';
import { renderColumnDiagram } from '../../src/report/column-diagram.js';
import { exportFigure, layoutWidthFor, parseDpiOption, parseWidthOption, pngSize } from '../../src/report/export.js';
import { pointsOutsideFrame, xmlProblem } from './helpers.js';

/** Decode an 8-bit RGBA, non-interlaced PNG (the only kind resvg writes) into its pixels. */
function decodePng(png: Buffer): { width: number; height: number; dpi: number | null; pixels: Uint8Array } {
  expect(png.subarray(0, 8)).toEqual(Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]));
  let at = 8;
  let width = 0;
  let height = 0;
  let dpi: number | null = null;
  const idat: Buffer[] = [];
  while (at < png.length) {
    const len = png.readUInt32BE(at);
    const type = png.toString('latin1', at + 4, at + 8);
    const body = png.subarray(at + 8, at + 8 + len);
    if (type === 'IHDR') {
      width = body.readUInt32BE(0);
      height = body.readUInt32BE(4);
      expect([body[8], body[9], body[12]]).toEqual([8, 6, 0]);
    } else if (type === 'pHYs') dpi = body.readUInt32BE(0) * 0.0254;
    else if (type === 'IDAT') idat.push(body);
    at += 12 + len;
  }
  const raw = zlib.inflateSync(Buffer.concat(idat));
  const stride = width * 4;
  const pixels = new Uint8Array(stride * height);
  for (let y = 0; y < height; y++) {
    const filter = raw[y * (stride + 1)];
    for (let i = 0; i < stride; i++) {
      const x = raw[y * (stride + 1) + 1 + i];
      const a = i >= 4 ? pixels[y * stride + i - 4] : 0;
      const b = y > 0 ? pixels[(y - 1) * stride + i] : 0;
      const c = i >= 4 && y > 0 ? pixels[(y - 1) * stride + i - 4] : 0;
      let pred = 0;
      if (filter === 1) pred = a;
      else if (filter === 2) pred = b;
      else if (filter === 3) pred = (a + b) >> 1;
      else if (filter === 4) {
        const p = a + b - c;
        const pa = Math.abs(p - a);
        const pb = Math.abs(p - b);
        const pc = Math.abs(p - c);
        pred = pa <= pb && pa <= pc ? a : pb <= pc ? b : c;
      }
      pixels[y * stride + i] = (x + pred) & 0xff;
    }
  }
  return { width, height, dpi, pixels };
}

describe('export options', () => {
  it('parses widths in mm, cm, in and pixels, and refuses the rest naming the option', () => {
    expect(parseWidthOption('85mm')).toEqual({ mm: 85 });
    expect(parseWidthOption('17.8cm')).toEqual({ mm: 178 });
    expect(parseWidthOption('1in')).toEqual({ mm: 25.4 });
    expect(parseWidthOption('1200px')).toEqual({ px: 1200 });
    expect(parseWidthOption('1200')).toEqual({ px: 1200 });
    expect(() => parseWidthOption('wide')).toThrow(/^--width: "wide" is not a width; allowed: a width in mm/);
    expect(() => parseWidthOption('5mm')).toThrow(/^--width: 5mm is not allowed/);
    expect(() => parseDpiOption('0')).toThrow(/^--dpi: "0" is not allowed; give dots per inch, 36-2400/);
    // 85 mm at 96 layout px per inch (CSS px): 85 / 25.4 * 96
    expect(layoutWidthFor({ width: { mm: 85 } })).toBeCloseTo((85 / 25.4) * 96, 9);
    // 85 mm at 300 dpi: 85 / 25.4 * 300 = 1003.9 -> 1004 px (definition of dpi)
    expect(pngSize({ width: { mm: 85 }, dpi: 300 }, { width: 300, height: 150 })).toEqual({ width: 1004, height: 502 });
    expect(pngSize({ width: { px: 1200 } }, { width: 300, height: 200 })).toEqual({ width: 1200, height: 800 });
  });

  it('finds marks outside their frame (the checker itself)', () => {
    const svg = '<svg width="100" height="100"><g transform="translate(10,10)"><path class="background" d="M0,0h50v50h-50Z"/><g class="mark-line role-mark curve_marks"><path d="M0,0L49,49L60,20"/></g></g></svg>';
    expect(pointsOutsideFrame(svg, ['curve'])).toEqual([{ mark: 'curve', x: 70, y: 30, frame: [10, 10, 60, 60] }]);
  });
});

describe('export of a column diagram', () => {
  it('writes a PNG, a PDF and an outlined SVG of the requested size that open', async () => {
    const size = { width: { mm: 85 }, dpi: 300 } as const;
    const items = [1300, 1400].flatMap((tp) => [0, 150].map((w) => ({ scenario: { tp_c: tp, water_ppm: w, lid_km: 8, upwelling_mm_yr: Number.NaN } })));
    const r = await renderColumnDiagram(items, defaultModel(), { targetWidth: layoutWidthFor(size) });
    // the layout followed the requested width (85 mm is 321 layout px) down to the narrowest legible
    // panels; the file is then scaled to the exact physical width
    const laidOut = Number(/<svg[^>]*\swidth="([0-9.]+)"/.exec(r.svg)![1]);
    expect(laidOut).toBeLessThan(((85 / 25.4) * 96) * 1.2);

    const png = decodePng(await exportFigure(r.svg, 'png', size));
    expect(png.width).toBe(1004);
    expect(png.dpi).toBeCloseTo(300, 0);
    expect(png.height).toBeGreaterThan(png.width);
    // not blank: the grey levels vary and there are dark (text) and coloured (path) pixels
    let sum = 0;
    let sum2 = 0;
    let dark = 0;
    let blue = 0;
    const n = png.width * png.height;
    for (let i = 0; i < png.pixels.length; i += 4) {
      const [red, green, b] = [png.pixels[i], png.pixels[i + 1], png.pixels[i + 2]];
      const grey = (red + green + b) / 3;
      sum += grey;
      sum2 += grey * grey;
      if (grey < 90) dark++;
      if (b > 150 && red < 60) blue++;
    }
    const variance = sum2 / n - (sum / n) ** 2;
    expect(variance).toBeGreaterThan(200);
    expect(dark / n).toBeGreaterThan(0.005);
    expect(blue).toBeGreaterThan(100);

    const pdf = await exportFigure(r.svg, 'pdf', size);
    const text = pdf.toString('latin1');
    expect(text.startsWith('%PDF-1.')).toBe(true);
    expect(text.trimEnd().endsWith('%%EOF')).toBe(true);
    expect(text.match(/\/Type \/Page\b/g)).toHaveLength(1);
    // 85 mm = 240.94 pt wide (72 pt per inch)
    const box = /\/MediaBox \[0 0 ([0-9.]+) ([0-9.]+)\]/.exec(text)!;
    expect(Number(box[1])).toBeCloseTo((85 / 25.4) * 72, 1);
    expect(Number(box[2]) / Number(box[1])).toBeCloseTo(png.height / png.width, 2);
    // text as outlines: no font in the file
    expect(text).not.toMatch(/\/Font\b/);

    const svg = (await exportFigure(r.svg, 'svg', size)).toString('utf8');
    expect(xmlProblem(svg)).toBeNull();
    expect(svg).toMatch(/<svg[^>]*\swidth="85mm"/);
    expect(svg).not.toContain('<text');
    expect(svg.split('<path').length).toBeGreaterThan(200);
  });
});
