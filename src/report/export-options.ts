/**
 * Options of picture export (format, width, resolution): parsing and checking only, so that the CLI
 * can check them without loading the export libraries (src/report/export.ts).
 */
import { InputError } from '../errors.js';

/** File formats of exported pictures. */
export type FigureFormat = 'svg' | 'png' | 'pdf';

/** Every export format, in the order `report --figures` writes them. */
export const FIGURE_FORMATS: readonly FigureFormat[] = ['svg', 'png', 'pdf'];

/** CSS pixels per inch: the unit of the layout (a 10.5 px label prints at 7.9 pt). */
export const LAYOUT_PX_PER_IN = 96;
const MM_PER_IN = 25.4;

/** Default resolution of PNG export, dots per inch (common practice for print). */
export const DEFAULT_DPI = 300;

/** A requested width: physical (mm) or in image pixels. */
export type WidthRequest = { readonly mm: number } | { readonly px: number };

/** Size options of an export. */
export interface ExportSize {
  /** physical width or PNG pixel width; default: the figure's natural layout width at 96 px per inch */
  readonly width?: WidthRequest;
  /** PNG resolution, dots per inch (default 300); also converts a pixel width to a physical one */
  readonly dpi?: number;
}

/** Smallest and largest accepted widths and resolutions. */
export const WIDTH_LIMITS = { mm: [20, 1000], px: [100, 20000], dpi: [36, 2400] } as const;

/**
 * Parse a --width value: "85mm", "8.5cm", "3.35in" or pixels ("1200", "1200px").
 * @throws InputError naming the option, the value and what is allowed
 */
export function parseWidthOption(raw: string, option = '--width'): WidthRequest {
  const m = /^\s*([0-9]*\.?[0-9]+)\s*(mm|cm|in|px)?\s*$/i.exec(raw);
  const allowed = `allowed: a width in mm, cm or in (${WIDTH_LIMITS.mm[0]}-${WIDTH_LIMITS.mm[1]} mm, e.g. 85mm for a journal column) or in pixels (${WIDTH_LIMITS.px[0]}-${WIDTH_LIMITS.px[1]}, e.g. 1200px)`;
  if (m === null) throw new InputError(`${option}: ${JSON.stringify(raw)} is not a width; ${allowed}`);
  const v = Number(m[1]);
  const unit = (m[2] ?? 'px').toLowerCase();
  if (unit === 'px') {
    if (!Number.isInteger(v) || v < WIDTH_LIMITS.px[0] || v > WIDTH_LIMITS.px[1]) throw new InputError(`${option}: ${raw} is not allowed; ${allowed}`);
    return { px: v };
  }
  const mm = unit === 'mm' ? v : unit === 'cm' ? v * 10 : v * MM_PER_IN;
  if (mm < WIDTH_LIMITS.mm[0] || mm > WIDTH_LIMITS.mm[1]) throw new InputError(`${option}: ${raw} is not allowed; ${allowed}`);
  return { mm };
}

/** Parse a --dpi value. @throws InputError */
export function parseDpiOption(raw: string, option = '--dpi'): number {
  const v = Number(raw);
  if (raw.trim() === '' || !Number.isFinite(v) || v < WIDTH_LIMITS.dpi[0] || v > WIDTH_LIMITS.dpi[1]) {
    throw new InputError(`${option}: ${JSON.stringify(raw)} is not allowed; give dots per inch, ${WIDTH_LIMITS.dpi[0]}-${WIDTH_LIMITS.dpi[1]} (300 for print)`);
  }
  return v;
}

/** The format named by a file's extension, or null. */
export function formatOfPath(file: string): FigureFormat | null {
  const m = /\.(svg|png|pdf)$/i.exec(file);
  return m === null ? null : (m[1].toLowerCase() as FigureFormat);
}

