/**
 * Pictures as files for papers and slides: SVG, PNG and PDF at a chosen physical width and
 * resolution. One path for all three: the vega SVG is parsed and laid out once more by resvg
 * (@resvg/resvg-js, a Rust renderer shipped as a per-platform npm binary) with the house font
 * (DejaVu Sans from the dejavu-fonts-ttf package), which turns every text into glyph outlines.
 * - SVG: that outlined SVG, its width and height given in mm (viewBox in layout px);
 * - PNG: resvg's rasterisation of it at width x dpi pixels, with the resolution in a pHYs chunk;
 * - PDF: one page of the physical size, the outlined SVG drawn as vector paths by pdfkit with
 *   svg-to-pdfkit (pure JavaScript; no fonts needed since there is no text left).
 * So the three files look the same on every machine; nothing depends on installed fonts and no
 * browser is involved. Loaded only when a file is exported.
 */
import { fontFiles, FONT_FAMILY } from './font.js';

import { DEFAULT_DPI, LAYOUT_PX_PER_IN, type ExportSize, type FigureFormat } from './export-options.js';

export * from './export-options.js';

const MM_PER_IN = 25.4;
const PT_PER_IN = 72;

/** Physical width (inches) of an export: the requested width, or the layout width at 96 px/in. */
export function physicalWidthIn(size: ExportSize, layoutWidthPx: number): number {
  const dpi = size.dpi ?? DEFAULT_DPI;
  if (size.width === undefined) return layoutWidthPx / LAYOUT_PX_PER_IN;
  return 'mm' in size.width ? size.width.mm / MM_PER_IN : size.width.px / dpi;
}

/** Layout width (px) to lay a figure out at for an export of this size; undefined: its natural width. */
export function layoutWidthFor(size: ExportSize): number | undefined {
  if (size.width === undefined) return undefined;
  return physicalWidthIn(size, 0) * LAYOUT_PX_PER_IN;
}

/** Width and height (layout px) of an SVG document, from its width/height attributes or viewBox. */
export function svgSize(svg: string): { width: number; height: number } {
  const head = /<svg\b[^>]*>/.exec(svg)?.[0] ?? '';
  const attr = (n: string): number => Number(new RegExp(`\\s${n}="([0-9.]+)(px)?"`).exec(head)?.[1] ?? NaN);
  let width = attr('width');
  let height = attr('height');
  if (!(width > 0) || !(height > 0)) {
    const vb = /viewBox="([^"]+)"/.exec(head)?.[1].split(/[\s,]+/).map(Number);
    if (vb !== undefined && vb.length === 4) [width, height] = [vb[2], vb[3]];
  }
  if (!(width > 0) || !(height > 0)) throw new Error('report: the SVG has no size');
  return { width, height };
}

type ResvgModule = typeof import('@resvg/resvg-js');
let resvgModule: ResvgModule | null = null;

async function resvg(): Promise<ResvgModule> {
  resvgModule ??= await import('@resvg/resvg-js');
  return resvgModule;
}

function resvgOptions(): ConstructorParameters<ResvgModule['Resvg']>[1] {
  const f = fontFiles();
  return {
    font: { fontFiles: [f.regular, f.bold], loadSystemFonts: false, defaultFontFamily: FONT_FAMILY, sansSerifFamily: FONT_FAMILY },
    shapeRendering: 2,
    textRendering: 2,
    logLevel: 'off',
  };
}

/**
 * The SVG with every text turned into outlines of the house font (resvg's normalised SVG), with
 * width and height set to the physical size in mm and the layout kept in the viewBox.
 */
export async function outlinedSvg(svg: string, size: ExportSize = {}): Promise<string> {
  const { Resvg } = await resvg();
  const { width, height } = svgSize(svg);
  const out = new Resvg(svg, resvgOptions()).toString();
  const widthMm = physicalWidthIn(size, width) * MM_PER_IN;
  const heightMm = (widthMm * height) / width;
  const fmt = (v: number): string => String(Number(v.toFixed(3)));
  return out.replace(/<svg\b[^>]*>/, (head) =>
    head
      .replace(/\swidth="[^"]*"/, ` width="${fmt(widthMm)}mm"`)
      .replace(/\sheight="[^"]*"/, ` height="${fmt(heightMm)}mm"`)
      .replace(/\sviewBox="[^"]*"/, '')
      .replace(/<svg\b/, `<svg viewBox="0 0 ${fmt(width)} ${fmt(height)}"`),
  );
}

/** Pixel size of a PNG export of an SVG of the given layout size. */
export function pngSize(size: ExportSize, layout: { width: number; height: number }): { width: number; height: number } {
  const dpi = size.dpi ?? DEFAULT_DPI;
  const width = size.width !== undefined && 'px' in size.width ? size.width.px : Math.round(physicalWidthIn(size, layout.width) * dpi);
  return { width, height: Math.max(1, Math.round((width * layout.height) / layout.width)) };
}

/** PNG of an SVG picture at the requested width and resolution (pHYs chunk holds the dpi). */
export async function svgToPng(svg: string, size: ExportSize = {}): Promise<Buffer> {
  const { Resvg } = await resvg();
  const layout = svgSize(svg);
  const px = pngSize(size, layout);
  const image = new Resvg(svg, { ...resvgOptions(), fitTo: { mode: 'width', value: px.width }, background: '#ffffff' }).render();
  return withResolution(image.asPng(), size.dpi ?? DEFAULT_DPI);
}

/** A one-page PDF of an SVG picture at the requested physical width, text as outlines (vector). */
export async function svgToPdf(svg: string, size: ExportSize = {}, title = 'meltsweep figure'): Promise<Buffer> {
  const [{ default: PDFDocument }, { default: SVGtoPDF }] = await Promise.all([import('pdfkit'), import('svg-to-pdfkit')]);
  const layout = svgSize(svg);
  const outlined = await outlinedSvg(svg, size);
  const wPt = physicalWidthIn(size, layout.width) * PT_PER_IN;
  const hPt = (wPt * layout.height) / layout.width;
  const doc = new PDFDocument({ size: [wPt, hPt], margin: 0, compress: true, info: { Title: title, Creator: 'meltsweep', Producer: 'meltsweep (pdfkit)' } });
  const chunks: Buffer[] = [];
  doc.on('data', (c) => chunks.push(c));
  const done = new Promise<void>((resolve) => doc.on('end', () => resolve()));
  SVGtoPDF(doc, outlined, 0, 0, { width: wPt, height: hPt, preserveAspectRatio: 'xMinYMin meet' });
  doc.end();
  await done;
  return Buffer.concat(chunks);
}

/** A picture in one format: outlined SVG text, PNG or PDF bytes. */
export async function exportFigure(svg: string, format: FigureFormat, size: ExportSize = {}, title?: string): Promise<Buffer> {
  if (format === 'svg') return Buffer.from(await outlinedSvg(svg, size), 'utf8');
  if (format === 'png') return svgToPng(svg, size);
  return svgToPdf(svg, size, title);
}

const CRC_TABLE = (() => {
  const t = new Uint32Array(256);
  for (let n = 0; n < 256; n++) {
    let c = n;
    for (let k = 0; k < 8; k++) c = c & 1 ? 0xedb88320 ^ (c >>> 1) : c >>> 1;
    t[n] = c >>> 0;
  }
  return t;
})();

function crc32(bytes: Uint8Array): number {
  let c = 0xffffffff;
  for (const b of bytes) c = CRC_TABLE[(c ^ b) & 0xff] ^ (c >>> 8);
  return (c ^ 0xffffffff) >>> 0;
}

/** Insert a pHYs chunk (pixels per metre) after a PNG's IHDR chunk. */
export function withResolution(png: Buffer, dpi: number): Buffer {
  const ppm = Math.round(dpi / 0.0254);
  const body = Buffer.alloc(13);
  body.write('pHYs', 0, 'latin1');
  body.writeUInt32BE(ppm, 4);
  body.writeUInt32BE(ppm, 8);
  body.writeUInt8(1, 12);
  const chunk = Buffer.alloc(4 + 13 + 4);
  chunk.writeUInt32BE(9, 0);
  body.copy(chunk, 4);
  chunk.writeUInt32BE(crc32(body), 17);
  const ihdrEnd = 8 + 8 + 13 + 4;
  return Buffer.concat([png.subarray(0, ihdrEnd), chunk, png.subarray(ihdrEnd)]);
}
