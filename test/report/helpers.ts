/** Helpers of the picture tests: XML well-formedness, counting marks in vega SVG, small sweeps. */
import path from 'node:path';
import { XMLValidator } from 'fast-xml-parser';
import { COLUMN_STATUSES } from '../../src/physics/types.js';
import { textWidthPx } from '../../src/report/font.js';
import type { ResultsColumns } from '../../src/report/results-columns.js';
import { runSweep } from '../../src/run/run-sweep.js';
import { validateSweep } from '../../src/spec/index.js';

/** null when `text` is well-formed XML, else the parser's message with line and column. */
export function xmlProblem(text: string): string | null {
  const r = XMLValidator.validate(text);
  return r === true ? null : `${r.err.code}: ${r.err.msg} (line ${r.err.line}, col ${r.err.col})`;
}

/** Number of mark groups of a named Vega-Lite layer in an SVG (one group per line series). */
export function markGroups(svg: string, name: string): number {
  return svg.split(`role-mark ${name}_marks"`).length - 1;
}

/** Values of every id attribute in a document. */
export function ids(text: string): string[] {
  return [...text.matchAll(/\sid="([^"]+)"/g)].map((m) => m[1]);
}

/** Axis titles (aria labels of vega axes) in an SVG. */
export function axisTitles(svg: string): string[] {
  return [...svg.matchAll(/aria-label="[XY]-axis titled '([^']*)'/g)].map((m) => m[1]);
}

/** Every text of an SVG in document order (entities decoded; the lines of a multi-line text joined), e.g. axis labels and titles. */
export function svgTexts(svg: string): string[] {
  const decode = (t: string): string => t.replace(/&lt;/g, '<').replace(/&gt;/g, '>').replace(/&quot;/g, '"').replace(/&#39;/g, "'").replace(/&amp;/g, '&');
  // a multi-line text (<tspan> lines) is one string, its lines joined by spaces
  return [...svg.matchAll(/<text[^>]*>([\s\S]*?)<\/text>/g)].map((m) => decode(m[1].replace(/<\/tspan><tspan[^>]*>/g, ' ').replace(/<[^>]+>/g, '')));
}

/** One line of text of a vega SVG, placed on the page: its extent measured with the house font. */
export interface TextBox {
  readonly text: string;
  readonly size: number;
  readonly bold: boolean;
  readonly left: number;
  readonly right: number;
  /** baseline, page px */
  readonly y: number;
  /** width of the whole picture, px */
  readonly pictureWidth: number;
}

/**
 * Every line of text of a vega SVG with its extent on the page: the translations of its groups and
 * of the text summed, its anchor applied, its width measured (textWidthPx). Multi-line texts
 * (<tspan> lines) give one box per line.
 */
export function textBoxes(svg: string): TextBox[] {
  const pictureWidth = Number(/<svg[^>]*\swidth="([0-9.]+)"/.exec(svg)![1]);
  const decode = (t: string): string => t.replace(/&lt;/g, '<').replace(/&gt;/g, '>').replace(/&quot;/g, '"').replace(/&#39;/g, "'").replace(/&amp;/g, '&');
  const out: TextBox[] = [];
  const stack: [number, number][] = [[0, 0]];
  for (const m of svg.matchAll(/<(\/?)(g|text)\b([^>]*)>/g)) {
    const [, closing, tag, attrs] = m;
    const start = m.index + m[0].length;
    const body = tag === 'text' && closing !== '/' ? svg.slice(start, svg.indexOf('</text>', start)) : '';
    if (closing === '/') {
      if (tag === 'g') stack.pop();
      continue;
    }
    const t = /transform="translate\((-?[0-9.e-]+),(-?[0-9.e-]+)\)"/.exec(attrs);
    const [x0, y0] = stack[stack.length - 1];
    const x = x0 + (t === null ? 0 : Number(t[1]));
    const y = y0 + (t === null ? 0 : Number(t[2]));
    if (tag === 'g') {
      if (!attrs.endsWith('/')) stack.push([x, y]);
      continue;
    }
    const size = Number(/font-size="([0-9.]+)px"/.exec(attrs)?.[1] ?? 11);
    const bold = /font-weight="(bold|[6-9]00)"/.test(attrs);
    const anchor = /text-anchor="(start|middle|end)"/.exec(attrs)?.[1] ?? 'start';
    const spans = [...body.matchAll(/<tspan\b([^>]*)>([^<]*)<\/tspan>/g)];
    const lines = spans.length > 0 ? spans.map((s) => ({ text: decode(s[2]), dy: Number(/\sdy="(-?[0-9.e-]+)"/.exec(s[1])?.[1] ?? 0) })) : [{ text: decode(body), dy: 0 }];
    let baseline = y;
    for (const line of lines) {
      baseline += line.dy;
      const w = textWidthPx(line.text, size, bold);
      const left = anchor === 'start' ? x : anchor === 'middle' ? x - w / 2 : x - w;
      out.push({ text: line.text, size, bold, left, right: left + w, y: baseline, pictureWidth });
    }
  }
  return out;
}

/**
 * Pairs of text lines that touch or overlap: on the same baseline (to 1 px) and horizontally
 * closer than `gap` px. Axis tick labels, legends and key entries must have none.
 */
export function touchingTexts(svg: string, gap = 2): [string, string][] {
  const boxes = textBoxes(svg).filter((b) => b.text.trim() !== '');
  const out: [string, string][] = [];
  for (let a = 0; a < boxes.length; a++) {
    for (let b = a + 1; b < boxes.length; b++) {
      const [p, q] = [boxes[a], boxes[b]];
      if (Math.abs(p.y - q.y) > 1 || Math.abs(p.size - q.size) > 0.01) continue;
      if (p.left < q.right + gap && q.left < p.right + gap) out.push([p.text, q.text]);
    }
  }
  return out;
}

/** A results table over the given axes (grid order, last axis fastest) whose output crust_km = f(row inputs); every row ok. */
export function gridTable(axes: Record<string, number[]>, f: (r: Record<string, number>) => number): ResultsColumns {
  let rows: Record<string, number>[] = [{}];
  for (const n of Object.keys(axes)) rows = rows.flatMap((r) => axes[n].map((v) => ({ ...r, [n]: v })));
  const col = (n: string) => Float64Array.from(rows, (r) => r[n] ?? 0);
  return {
    rows: rows.length,
    inputs: { tp_c: col('tp_c'), water_ppm: col('water_ppm'), lid_km: col('lid_km'), upwelling_mm_yr: Float64Array.from(rows, () => NaN) },
    outputs: { crust_km: Float64Array.from(rows, f) },
    status: new Uint8Array(rows.length),
    statusCounts: Object.fromEntries(COLUMN_STATUSES.map((s) => [s, s === 'ok' ? rows.length : 0])) as ResultsColumns['statusCounts'],
  };
}

/** A 45-point isentropic grid (Tp x water x lid) written to dir/name. */
export async function gridSweepFile(dir: string, name = 'grid.arrow'): Promise<string> {
  const spec = validateSweep({
    name: 'ridge segment R-7 test grid',
    axes: { tp_c: { from: 1250, to: 1450, count: 5 }, water_ppm: { values: [0, 100, 300] }, lid_km: { values: [0, 10, 20] } },
    fixed: { upwelling_mm_yr: 30 },
    design: { kind: 'grid' },
    model: { thermal: 'isentropic' },
  });
  const out = path.join(dir, name);
  await runSweep({ spec, outPath: out, workers: 2 });
  return out;
}

/** A 32-row saltelli sweep (base 8, two inputs) written to dir/name. */
export async function saltelliSweepFile(dir: string, name = 'saltelli.arrow'): Promise<string> {
  const spec = validateSweep({
    name: 'plume flank P-3 test saltelli',
    axes: { tp_c: { from: 1300, to: 1500 }, water_ppm: { from: 0, to: 400 } },
    fixed: { lid_km: 10 },
    design: { kind: 'saltelli', base: 8 },
    model: { thermal: 'isentropic' },
  });
  const out = path.join(dir, name);
  await runSweep({ spec, outPath: out, workers: 2 });
  return out;
}

/** A drawn point that lies outside the frame of the view that draws it. */
export type OutsidePoint = MarkPoint;

/** End points of every segment of an SVG path's d (absolute and relative M, L, H, V, C, Q, A, Z). */
export function pathPoints(d: string): [number, number][] {
  const out: [number, number][] = [];
  const tokens = d.match(/[MLHVCSQTAZmlhvcsqtaz]|-?(?:\d+\.?\d*|\.\d+)(?:e[-+]?\d+)?/g) ?? [];
  let x = 0;
  let y = 0;
  let sx = 0;
  let sy = 0;
  let cmd = 'M';
  let i = 0;
  const num = (): number => Number(tokens[i++]);
  const arity: Record<string, number> = { M: 2, L: 2, H: 1, V: 1, C: 6, S: 4, Q: 4, T: 2, A: 7, Z: 0 };
  while (i < tokens.length) {
    if (/[A-Za-z]/.test(tokens[i])) cmd = tokens[i++];
    const up = cmd.toUpperCase();
    const rel = cmd !== up;
    if (up === 'Z') {
      [x, y] = [sx, sy];
      continue;
    }
    const args = Array.from({ length: arity[up] }, num);
    if (up === 'H') x = rel ? x + args[0] : args[0];
    else if (up === 'V') y = rel ? y + args[0] : args[0];
    else {
      const nx = args[args.length - 2];
      const ny = args[args.length - 1];
      [x, y] = rel ? [x + nx, y + ny] : [nx, ny];
    }
    if (up === 'M') {
      [sx, sy] = [x, y];
      cmd = rel ? 'l' : 'L';
    }
    out.push([x, y]);
  }
  return out;
}

/** A drawn point of a named mark with the frame (plot area) of the view that draws it, page px. */
export interface MarkPoint {
  readonly mark: string;
  readonly x: number;
  readonly y: number;
  readonly frame: readonly [number, number, number, number];
}

/**
 * Every vertex of the named marks (Vega-Lite layer names), in page px, with the frame of the view
 * drawing it. Works on vega's SVG: every view is a group translated into place whose background
 * path gives its size; paths count by their vertices, rules (<line>) by both ends, a symbol
 * (point) and a text by their anchor.
 */
export function markPoints(svg: string, marks: readonly string[]): MarkPoint[] {
  const out: MarkPoint[] = [];
  const stack: { dx: number; dy: number; frame: [number, number, number, number] | null; mark: string | null }[] = [{ dx: 0, dy: 0, frame: null, mark: null }];
  const top = () => stack[stack.length - 1];
  for (const m of svg.matchAll(/<(\/?)(g|path|line|text)\b([^>]*?)(\/?)>/g)) {
    const [, closing, tag, attrs, selfClosing] = m;
    if (closing === '/') {
      if (tag === 'g') stack.pop();
      continue;
    }
    const t = /transform="translate\((-?[0-9.e-]+),(-?[0-9.e-]+)\)"/.exec(attrs);
    const dx = top().dx + (t === null ? 0 : Number(t[1]));
    const dy = top().dy + (t === null ? 0 : Number(t[2]));
    if (tag === 'g') {
      if (selfClosing === '/') continue;
      const markName = /role-mark ([A-Za-z0-9_]+)_marks/.exec(attrs)?.[1] ?? null;
      stack.push({ dx, dy, frame: top().frame, mark: markName ?? top().mark });
      continue;
    }
    const d = /\sd="([^"]*)"/.exec(attrs)?.[1] ?? '';
    if (tag === 'path' && /class="background"/.test(attrs)) {
      const size = /^M0,0h(-?[0-9.]+)v(-?[0-9.]+)/.exec(d);
      if (size !== null && Number(size[1]) > 1 && Number(size[2]) > 1) top().frame = [top().dx, top().dy, top().dx + Number(size[1]), top().dy + Number(size[2])];
      continue;
    }
    const mark = top().mark;
    const frame = top().frame;
    if (mark === null || !marks.includes(mark) || frame === null) continue;
    const num = (name: string): number => Number(new RegExp(`\\s${name}="(-?[0-9.e-]+)"`).exec(attrs)?.[1] ?? 0);
    let pts: [number, number][];
    if (tag === 'line') pts = [[num('x1'), num('y1')], [num('x2'), num('y2')]];
    else if (tag === 'text') pts = [[num('x'), num('y')]];
    else pts = /role-mark|aria-roledescription="point"/.test(attrs) && t !== null ? [[0, 0]] : pathPoints(d);
    for (const [px, py] of pts) out.push({ mark, x: dx + px, y: dy + py, frame });
  }
  return out;
}

/**
 * Points of the named marks that fall outside the plot area of the view drawing them, by more
 * than `tolerance` px (see markPoints).
 */
export function pointsOutsideFrame(svg: string, marks: readonly string[], tolerance = 0.5): OutsidePoint[] {
  const points = markPoints(svg, marks);
  if (points.length === 0) throw new Error(`no points of ${marks.join(', ')} found in the SVG`);
  return points
    .filter(({ x, y, frame }) => x < frame[0] - tolerance || x > frame[2] + tolerance || y < frame[1] - tolerance || y > frame[3] + tolerance)
    .map(({ mark, x, y, frame }) => ({ mark, x, y, frame }));
}
