/**
 * Layout helpers shared by every picture (column diagrams, maps, sensitivity pictures, and any
 * other process's diagrams): titles wrapped to the figure's width, a key drawn as its own panel
 * (entries wrap instead of being cut), and rendering a figure to a requested total width.
 * Nothing here knows what a figure shows.
 */
import { wrapText, textWidthPx } from './font.js';
import { renderSvg, type PlotSpec, type RenderedSvg } from './render.js';
import { INK, MUTED } from './theme.js';
import { ticksFromZero } from './ticks.js';

/** Type sizes of the house style, px (1 px prints at 0.75 pt). */
export const TYPE = { title: 14, subtitle: 11, key: 10.5, keyTitle: 11, note: 10 } as const;
/** Line height of key text, px. */
const KEY_LINE = 14;

/** A mark sample in the key. */
export type KeySwatch =
  | { readonly kind: 'line'; readonly colour: string; readonly dash?: readonly number[]; readonly width?: number }
  | { readonly kind: 'point'; readonly colour: string; readonly filled: boolean }
  | { readonly kind: 'bar'; readonly colour: string }
  | { readonly kind: 'none' };

/** One entry of a key: an optional tag (e.g. a lane number), a swatch and a label that wraps. */
export interface KeyEntry {
  readonly tag?: string;
  readonly swatch: KeySwatch;
  readonly label: string;
}

/** A titled group of key entries; a note is set in smaller type below them. */
export interface KeySection {
  readonly title?: string;
  readonly entries: readonly KeyEntry[];
  readonly note?: string;
}

/** Width of the swatch column and the gap after it, px. */
const SWATCH_W = 26;
const GAP = 6;

interface KeyText { x: number; y: number; text: string; size: number; weight: number; colour: string }
interface KeyRule { x: number; x2: number; y: number; colour: string; dash: number[]; width: number }
interface KeyPoint { x: number; y: number; stroke: string; fill: string }
interface KeyBar { x: number; x2: number; y: number; y2: number; colour: string }

/**
 * Lay out the sections side by side when each gets at least `minColumn` px, else one below the
 * other; every label wraps to its column. Returns the layer spec (pixel coordinates) and its height.
 */
export function keyPanel(sections: readonly KeySection[], width: number, minColumn = 230): { spec: Record<string, unknown>; height: number } {
  const columns = sections.length > 1 && width / sections.length >= minColumn ? sections.length : 1;
  const colWidth = columns > 1 ? (width - (columns - 1) * 18) / columns : width;
  const texts: KeyText[] = [];
  const rules: KeyRule[] = [];
  const points: KeyPoint[] = [];
  const bars: KeyBar[] = [];
  let bottom = 0;
  let y = 0;
  sections.forEach((sec, i) => {
    const col = columns > 1 ? i : 0;
    const x0 = col * (colWidth + 18);
    if (columns > 1) y = 0;
    else if (i > 0) y += 6;
    if (sec.title !== undefined) {
      texts.push({ x: x0, y: y + KEY_LINE / 2, text: sec.title, size: TYPE.keyTitle, weight: 600, colour: INK });
      y += KEY_LINE + 2;
    }
    const tagW = Math.max(0, ...sec.entries.map((e) => (e.tag === undefined ? 0 : textWidthPx(e.tag, TYPE.key, true) + 5)));
    for (const e of sec.entries) {
      const lines = wrapText(e.label, colWidth - tagW - SWATCH_W - GAP, TYPE.key);
      const mid = y + KEY_LINE / 2;
      if (e.tag !== undefined) texts.push({ x: x0, y: mid, text: e.tag, size: TYPE.key, weight: 700, colour: INK });
      const sx = x0 + tagW;
      const s = e.swatch;
      if (s.kind === 'line') rules.push({ x: sx + 1, x2: sx + SWATCH_W - 3, y: mid, colour: s.colour, dash: [...(s.dash ?? [])], width: s.width ?? 2 });
      else if (s.kind === 'point') points.push({ x: sx + SWATCH_W / 2 - 1, y: mid, stroke: s.colour, fill: s.filled ? s.colour : '#ffffff' });
      else if (s.kind === 'bar') bars.push({ x: sx + SWATCH_W / 2 - 4, x2: sx + SWATCH_W / 2 + 3, y: mid - 5, y2: mid + 5, colour: s.colour });
      lines.forEach((line, k) => texts.push({ x: sx + SWATCH_W + GAP - (s.kind === 'none' ? SWATCH_W + GAP : 0), y: mid + k * KEY_LINE, text: line, size: TYPE.key, weight: 400, colour: MUTED }));
      y += lines.length * KEY_LINE + 2;
    }
    if (sec.note !== undefined) {
      for (const line of wrapText(sec.note, colWidth, TYPE.note)) {
        texts.push({ x: x0, y: y + KEY_LINE / 2, text: line, size: TYPE.note, weight: 400, colour: MUTED });
        y += KEY_LINE - 1;
      }
    }
    bottom = Math.max(bottom, y);
  });
  const px = (field: string) => ({ field, type: 'quantitative' as const, scale: null });
  const raw = (field: string) => ({ field, type: 'nominal' as const, scale: null });
  const layers: Record<string, unknown>[] = [];
  if (rules.length > 0) layers.push({ data: { values: rules }, mark: { type: 'rule', strokeCap: 'butt' }, encoding: { x: px('x'), x2: { field: 'x2' }, y: px('y'), color: raw('colour'), strokeDash: raw('dash'), strokeWidth: { ...px('width') } } });
  if (bars.length > 0) layers.push({ data: { values: bars }, mark: { type: 'rect' }, encoding: { x: px('x'), x2: { field: 'x2' }, y: px('y'), y2: { field: 'y2' }, color: raw('colour') } });
  if (points.length > 0) layers.push({ data: { values: points }, mark: { type: 'point', shape: 'circle', size: 42, strokeWidth: 1.6, opacity: 1 }, encoding: { x: px('x'), y: px('y'), stroke: raw('stroke'), fill: raw('fill') } });
  // one text layer per type style (size and weight are mark properties in Vega-Lite)
  const styles = new Map<string, KeyText[]>();
  for (const t of texts) {
    const k = `${t.size}|${t.weight}|${t.colour}`;
    styles.set(k, [...(styles.get(k) ?? []), t]);
  }
  for (const group of styles.values()) {
    const { size, weight, colour } = group[0];
    layers.push({
      data: { values: group },
      mark: { type: 'text', align: 'left', baseline: 'middle', fontSize: size, fontWeight: weight, color: colour },
      encoding: { x: px('x'), y: px('y'), text: { field: 'text', type: 'nominal' } },
    });
  }
  const height = Math.max(1, Math.ceil(bottom));
  return { spec: { width, height, layer: layers, view: { stroke: null } }, height };
}

/**
 * A pressure axis on the right of a depth scale (z = P / (rho_s g)): an empty panel one pixel wide
 * whose axis has ticks at round pressures placed at their depths. `depth` gives the panel's depth
 * encoding with a title and axis properties (the diagram's own depth scale).
 */
export function pressureAxisPanel(
  depth: (title: string, axis: Record<string, unknown>) => Record<string, unknown>,
  title: string,
  pressureMaxGpa: number,
  depthMaxKm: number,
  height: number,
): Record<string, unknown> {
  const gpaPerKm = pressureMaxGpa / depthMaxKm;
  const axis = { orient: 'right', grid: false, values: ticksFromZero(pressureMaxGpa).map((pg) => pg / gpaPerKm), labelExpr: `format(datum.value * ${gpaPerKm}, '.1~f')` };
  return { width: 1, height, data: { values: [{ depth_km: 0 }] }, mark: { type: 'tick', opacity: 0 }, encoding: { y: depth(title, axis) } };
}

/** A title (and subtitle lines) wrapped to a width, as a Vega-Lite title object. */
export function wrappedTitle(text: string, subtitle: readonly string[], width: number): Record<string, unknown> {
  const title = wrapText(text, width, TYPE.title, true);
  const sub = subtitle.flatMap((s) => wrapText(s, width, TYPE.subtitle));
  return { text: title, ...(sub.length > 0 ? { subtitle: sub } : {}), anchor: 'start' };
}

/** A figure whose layout follows one width parameter (its main panel's width, px). */
export interface FigureLayout {
  /** the spec at main-panel width w */
  readonly build: (w: number) => PlotSpec;
  /** main-panel width of the natural layout, px */
  readonly natural: number;
  /** narrowest main panel that stays legible, px */
  readonly min: number;
}

/** Total width (px) of a rendered SVG. */
function widthOf(svg: string): number {
  return Number(/<svg\b[^>]*\swidth="([0-9.]+)"/.exec(svg)?.[1] ?? NaN);
}

/**
 * Render a figure; with a target total width (px), lay it out again so its whole width (axes,
 * legends and padding included) matches: the total is linear in the main panel's width, so two
 * trial renders give the width to draw at. A target narrower than the figure at its minimum main
 * width gives that minimum (the exported file is then scaled to the requested physical width).
 */
export async function renderFigure(layout: FigureLayout, targetWidthPx?: number, idPrefix?: string): Promise<RenderedSvg & { readonly mainWidth: number }> {
  const render = (w: number) => renderSvg(layout.build(w), { idPrefix });
  if (targetWidthPx === undefined) return { ...(await render(layout.natural)), mainWidth: layout.natural };
  const w0 = layout.natural;
  const t0 = widthOf((await render(w0)).svg);
  const w1 = Math.max(layout.min, w0 + (targetWidthPx - t0));
  const r1 = await render(w1);
  const t1 = widthOf(r1.svg);
  if (Math.abs(t1 - targetWidthPx) < 1 || w1 === w0) return { ...r1, mainWidth: w1 };
  const slope = (t1 - t0) / (w1 - w0);
  const w2 = Math.max(layout.min, slope > 0.05 ? w1 + (targetWidthPx - t1) / slope : w1);
  return { ...(await render(w2)), mainWidth: w2 };
}
