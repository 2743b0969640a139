/**
 * Text widths for laying out pictures in Node. Without a canvas, vega estimates every character as
 * 0.8 em wide, which over-sizes axis titles and legends and truncates long labels. This module
 * hands vega the widths of the house font itself (src/report/font.ts), so the layout is the one the
 * exported pictures are drawn with.
 */
import * as vega from 'vega';
import { isBold, textWidthPx } from './font.js';

/** Width in px of `text` set at fontSize px in the house font. */
export function estimateTextWidth(text: string, fontSize: number, bold = false): number {
  return textWidthPx(text, fontSize, bold);
}

/** The subset of a scenegraph text item this module reads. */
interface TextItem {
  readonly fontSize?: number | string | null;
  readonly fontWeight?: number | string | null;
  readonly limit?: number;
}

/** vega's text-measuring hook (exported at runtime by vega, not in its type declarations). */
interface TextMetrics {
  width: (item: TextItem, text: unknown) => number;
}

let installed = false;

/** Make vega measure text with the house font (once per process; idempotent). */
export function installTextMetrics(): void {
  if (installed) return;
  const metrics = (vega as unknown as { readonly textMetrics?: TextMetrics }).textMetrics;
  if (metrics === undefined) return;
  metrics.width = (item: TextItem, text: unknown): number => {
    const size = item.fontSize != null ? Number(item.fontSize) || 0 : 11;
    const s = text == null ? '' : String(text);
    return estimateTextWidth(s, size, isBold(item.fontWeight));
  };
  installed = true;
}
