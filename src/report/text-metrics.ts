/**
 * Text widths for laying out pictures in Node. Without a canvas, vega estimates every character as
 * 0.8 em wide, which over-sizes axis titles and legends and truncates long labels. This module
 * gives vega per-character advance widths close to those of the house font's common fallback
 * (DejaVu Sans; Inter and Segoe UI are narrower), so the layout matches what a browser draws.
 * Widths are approximate, in em, and err slightly wide so that text never overflows its slot.
 */
import * as vega from 'vega';

/** Advance width (em) of common characters; others use DEFAULT_EM. */
const EM: Readonly<Record<string, number>> = (() => {
  const table: Record<string, number> = {};
  const set = (chars: string, w: number): void => {
    for (const c of chars) table[c] = w;
  };
  set('0123456789', 0.636);
  set(' ', 0.318);
  set('.,', 0.318);
  set(':;', 0.337);
  set('ijl', 0.278);
  set('IJ', 0.295);
  set("'|!", 0.275);
  set('()[]{}', 0.39);
  set('-', 0.361);
  set('f', 0.352);
  set('t', 0.392);
  set('r', 0.411);
  set('/\\', 0.337);
  set('sz', 0.523);
  set('c', 0.55);
  set('kvxy', 0.592);
  set('aeo', 0.615);
  set('bdghnpqu', 0.635);
  set('_', 0.5);
  set('w', 0.818);
  set('m', 0.974);
  set('LFTYP', 0.6);
  set('EKSZ', 0.66);
  set('ABRVX', 0.69);
  set('CUHN', 0.74);
  set('DGOQ', 0.78);
  set('M', 0.863);
  set('W', 0.989);
  set('=+×<>~', 0.838);
  set('%', 0.95);
  set('…', 1.0);
  set('·', 0.318);
  set('°', 0.5);
  return table;
})();
const DEFAULT_EM = 0.62;

/** Width in px of `text` set at fontSize px (bold text is about 8 % wider). */
export function estimateTextWidth(text: string, fontSize: number, bold = false): number {
  let em = 0;
  for (const c of text) em += EM[c] ?? DEFAULT_EM;
  return em * fontSize * (bold ? 1.08 : 1.02);
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

/** Make vega measure text with estimateTextWidth (once per process; idempotent). */
export function installTextMetrics(): void {
  if (installed) return;
  const metrics = (vega as unknown as { readonly textMetrics?: TextMetrics }).textMetrics;
  if (metrics === undefined) return;
  metrics.width = (item: TextItem, text: unknown): number => {
    const size = item.fontSize != null ? Number(item.fontSize) || 0 : 11;
    const s = text == null ? '' : String(text).trim();
    const weight = item.fontWeight;
    const bold = weight === 'bold' || (typeof weight === 'number' && weight >= 600) || (typeof weight === 'string' && Number(weight) >= 600);
    return estimateTextWidth(s, size, bold);
  };
  installed = true;
}
