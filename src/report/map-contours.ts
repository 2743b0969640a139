/**
 * Contour lines of a map: marching squares on the grid of cell centres (Lorensen & Cline 1987 in
 * two dimensions), with linear interpolation along each edge and the centre average deciding the
 * two ambiguous (saddle) cases. A square with a corner without a value draws nothing, so a contour
 * stops where the data stop. Pure functions on plain numbers; the map figure places the result.
 */

/** A grid of values at nodes: `values[j * nx + i]` at (xs[i], ys[j]); NaN = no value. */
export interface NodeGrid {
  readonly nx: number;
  readonly ny: number;
  /** node positions along x (strictly increasing), in whatever coordinate the caller draws in */
  readonly xs: readonly number[];
  /** node positions along y (strictly increasing) */
  readonly ys: readonly number[];
  readonly values: ArrayLike<number>;
}

/** One straight piece of a contour line; `from`/`to` name the grid edges its ends lie on. */
export interface ContourSegment {
  readonly x1: number;
  readonly y1: number;
  readonly x2: number;
  readonly y2: number;
  readonly from: string;
  readonly to: string;
}

/** The contour of one level: its segments and the polylines they join into. */
export interface ContourLevel {
  readonly level: number;
  readonly segments: readonly ContourSegment[];
  /** segments joined end to end (a closed loop repeats its first point at the end) */
  readonly lines: readonly (readonly (readonly [number, number])[])[];
}

type Edge = 'bottom' | 'right' | 'top' | 'left';

/** The two edges that meet at each corner (a = (i, j), b = (i+1, j), c = (i+1, j+1), d = (i, j+1)). */
const CORNER_EDGES: readonly (readonly [Edge, Edge])[] = [
  ['bottom', 'left'],
  ['bottom', 'right'],
  ['right', 'top'],
  ['top', 'left'],
];

/** Contour segments of `level` over the grid. */
export function contourSegments(grid: NodeGrid, level: number): ContourSegment[] {
  const { nx, ny, xs, ys, values } = grid;
  const out: ContourSegment[] = [];
  for (let j = 0; j + 1 < ny; j++) {
    for (let i = 0; i + 1 < nx; i++) {
      const v = [values[j * nx + i], values[j * nx + i + 1], values[(j + 1) * nx + i + 1], values[(j + 1) * nx + i]];
      if (!v.every(Number.isFinite)) continue;
      const above = v.map((x) => x >= level);
      const count = above.filter(Boolean).length;
      if (count === 0 || count === 4) continue;
      const [x0, x1, y0, y1] = [xs[i], xs[i + 1], ys[j], ys[j + 1]];
      const cross = (va: number, vb: number, pa: number, pb: number): number => pa + ((level - va) / (vb - va)) * (pb - pa);
      const point = (e: Edge): [number, number] => {
        if (e === 'bottom') return [cross(v[0], v[1], x0, x1), y0];
        if (e === 'right') return [x1, cross(v[1], v[2], y0, y1)];
        if (e === 'top') return [cross(v[3], v[2], x0, x1), y1];
        return [x0, cross(v[0], v[3], y0, y1)];
      };
      // an end is identified by its grid edge, not by its position: where the level passes
      // exactly through a node, two edges' crossings coincide but the lines still join correctly
      const edgeId = (e: Edge): string => (e === 'bottom' ? `h${i},${j}` : e === 'top' ? `h${i},${j + 1}` : e === 'left' ? `v${i},${j}` : `v${i + 1},${j}`);
      const seg = (a: Edge, b: Edge): void => {
        const [p, q] = [point(a), point(b)];
        out.push({ x1: p[0], y1: p[1], x2: q[0], y2: q[1], from: edgeId(a), to: edgeId(b) });
      };
      // edges between corners on opposite sides of the level: two, or all four at a saddle
      const crossed = (['bottom', 'right', 'top', 'left'] as const).filter((_, k) => above[k] !== above[(k + 1) % 4]);
      if (crossed.length === 2) {
        seg(crossed[0], crossed[1]);
        continue;
      }
      // saddle: the corners on the other side of the centre value are cut off one by one
      const centreAbove = (v[0] + v[1] + v[2] + v[3]) / 4 >= level;
      for (let k = 0; k < 4; k++) if (above[k] !== centreAbove) seg(...CORNER_EDGES[k]);
    }
  }
  return out;
}

/** Join segments that share an end (the same grid edge) into polylines. */
export function joinSegments(segments: readonly ContourSegment[]): [number, number][][] {
  const ends = new Map<string, number[]>();
  segments.forEach((s, k) => {
    for (const id of [s.from, s.to]) ends.set(id, [...(ends.get(id) ?? []), k]);
  });
  const used = new Uint8Array(segments.length);
  const lines: [number, number][][] = [];
  // follow unused segments from the edge `id`, appending their far ends
  const extend = (line: [number, number][], id: string): void => {
    for (;;) {
      const next = (ends.get(id) ?? []).find((k) => used[k] === 0);
      if (next === undefined) return;
      used[next] = 1;
      const s = segments[next];
      const forward = s.from === id;
      line.push(forward ? [s.x2, s.y2] : [s.x1, s.y1]);
      id = forward ? s.to : s.from;
    }
  };
  segments.forEach((s, k) => {
    if (used[k] === 1) return;
    used[k] = 1;
    const forward: [number, number][] = [[s.x1, s.y1], [s.x2, s.y2]];
    extend(forward, s.to);
    const backward: [number, number][] = [[s.x1, s.y1]];
    extend(backward, s.from);
    lines.push([...backward.slice(1).reverse(), ...forward]);
  });
  return lines;
}

/** Contours of several levels (segments and joined lines). */
export function contourLevels(grid: NodeGrid, levels: readonly number[]): ContourLevel[] {
  return levels.map((level) => {
    const segments = contourSegments(grid, level);
    return { level, segments, lines: joinSegments(segments) };
  });
}
