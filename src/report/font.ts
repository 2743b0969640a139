/**
 * The one typeface of every picture: DejaVu Sans (regular and bold) from the `dejavu-fonts-ttf`
 * npm package, so that layout, PNG and PDF look the same on every machine. Text is measured with
 * the font's own advance widths and kerning (fontkit), and exported files have their text turned
 * into outlines of these glyphs (src/report/export.ts), so nothing depends on installed fonts.
 * A browser showing the HTML report uses DejaVu Sans where installed, else a similar-width fallback.
 */
import fs from 'node:fs';
import { createRequire } from 'node:module';
import path from 'node:path';
import type * as Fontkit from 'fontkit';

/** The CSS family name of the house font. */
export const FONT_FAMILY = 'DejaVu Sans';

/** Font stack of SVG text and of the HTML report: the house font first, then fonts of similar width. */
export const FONT = `'${FONT_FAMILY}', 'Bitstream Vera Sans', Verdana, sans-serif`;

/** Paths of the regular and bold TrueType files. @throws Error when the font package is missing */
export function fontFiles(): { readonly regular: string; readonly bold: string } {
  const dir = path.join(path.dirname(createRequire(import.meta.url).resolve('dejavu-fonts-ttf/package.json')), 'ttf');
  const regular = path.join(dir, 'DejaVuSans.ttf');
  const bold = path.join(dir, 'DejaVuSans-Bold.ttf');
  for (const f of [regular, bold]) if (!fs.existsSync(f)) throw new Error(`report: font file ${f} is missing (npm package dejavu-fonts-ttf)`);
  return { regular, bold };
}

let fonts: { regular: Fontkit.Font; bold: Fontkit.Font } | null = null;
const cache = new Map<string, number>();

function loaded(): { regular: Fontkit.Font; bold: Fontkit.Font } {
  if (fonts === null) {
    // loaded on first use: commands that draw nothing never pay for the font engine
    const fontkit = createRequire(import.meta.url)('fontkit') as typeof Fontkit;
    const f = fontFiles();
    fonts = { regular: fontkit.openSync(f.regular), bold: fontkit.openSync(f.bold) };
  }
  return fonts;
}

/** A CSS font weight that is drawn with the bold face (600 and above, as CSS font matching does). */
export function isBold(weight: number | string | null | undefined): boolean {
  if (weight === 'bold' || weight === 'bolder') return true;
  const n = typeof weight === 'number' ? weight : Number(weight);
  return Number.isFinite(n) && n >= 600;
}

/**
 * Width in px of one line of `text` set at fontSize px in the house font (advance widths and
 * kerning of the font itself, as the renderer places the glyphs).
 */
export function textWidthPx(text: string, fontSize: number, bold = false): number {
  if (text === '') return 0;
  const key = `${bold ? 'b' : 'r'}${text}`;
  let em = cache.get(key);
  if (em === undefined) {
    const f = bold ? loaded().bold : loaded().regular;
    em = f.layout(text).advanceWidth / f.unitsPerEm;
    if (cache.size > 20000) cache.clear();
    cache.set(key, em);
  }
  return em * fontSize;
}

/**
 * Break text into lines no wider than maxWidthPx at the given size (at spaces, and after ", " or
 * "; " first where possible). A single word wider than the width stays whole on its own line.
 */
export function wrapText(text: string, maxWidthPx: number, fontSize: number, bold = false): string[] {
  const words = text.split(/ +/).filter((w) => w !== '');
  const lines: string[] = [];
  let line = '';
  for (const w of words) {
    const next = line === '' ? w : `${line} ${w}`;
    if (line !== '' && textWidthPx(next, fontSize, bold) > maxWidthPx) {
      lines.push(line);
      line = w;
    } else line = next;
  }
  if (line !== '' || lines.length === 0) lines.push(line);
  return lines;
}
