/**
 * Maps of issue 17: uneven grids as categories (one equal cell per grid value, ticks on the cells),
 * log axes that start at the data, cell values in every cell or in none, cells without a value
 * drawn distinctly and counted in the key, and labelled contour lines where they belong. Every
 * mark is checked inside its frame by parsing the SVG.
 */
import { describe, expect, it } from 'vitest';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { registerProcess } from '../../src/process/registry.js';
import type { ProcessDefinition } from '../../src/process/types.js';
import { COLUMN_STATUSES } from '../../src/physics/types.js';
import { contourLevels, contourSegments, joinSegments } from '../../src/report/map-contours.js';
import { cellLabel, edgeTicks, labelsFitEveryCell, MAP_MARKS, mapContourLines, sweepMapSpec } from '../../src/report/map-figure.js';
import { renderSvg } from '../../src/report/render.js';
import type { ResultsColumns } from '../../src/report/results-columns.js';
import { binEdges, binnedMap, gridSliceMap, type SweepMapData } from '../../src/report/sweep-map.js';
import { validateSweep } from '../../src/spec/index.js';
import { gridTable, markGroups, markPoints, pathPoints, pointsOutsideFrame, xmlProblem } from './helpers.js';


function gridMap(tp: number[], water: number[], f: (r: Record<string, number>) => number, scale: 'linear' | 'log' = 'linear'): SweepMapData {
  const spec = validateSweep({ name: 'm', axes: { tp_c: { values: tp }, water_ppm: { values: water, scale } }, design: { kind: 'grid' } });
  return gridSliceMap(gridTable({ tp_c: tp, water_ppm: water }, f), spec, 'crust_km', 'tp_c', 'water_ppm');
}

const ALL_MARKS = Object.values(MAP_MARKS);

/** Marks of these layers drawn in the SVG (one group per layer). */
function drawnMarks(svg: string): string[] {
  return ALL_MARKS.filter((m) => markGroups(svg, m) > 0);
}

/** Texts inside the group of a named layer. */
function layerTexts(svg: string, mark: string): string[] {
  const start = svg.indexOf(`role-mark ${mark}_marks"`);
  if (start < 0) return [];
  const end = svg.indexOf('</g>', start);
  return [...svg.slice(start, end).matchAll(/<text[^>]*>([^<]*)<\/text>/g)].map((m) => m[1]);
}

/** Labels of the axis whose title is given (vega puts each axis in its own group). */
function axisLabels(svg: string, title: string): string[] {
  const at = svg.indexOf(`titled '${title}'`);
  const end = svg.indexOf(`>${title}</text>`, at);
  return [...svg.slice(at, end).matchAll(/<text[^>]*>([^<]*)<\/text>/g)].map((m) => m[1]);
}

/** Width and height of every rect of a layer (vega draws rects as paths "M x,y h w v h h -w Z"). */
function rectSizes(svg: string, mark: string): { w: number; h: number }[] {
  const start = svg.indexOf(`role-mark ${mark}_marks"`);
  const end = svg.indexOf('</g>', start);
  return [...svg.slice(start, end).matchAll(/\sd="([^"]+)"/g)].map((m) => {
    const pts = pathPoints(m[1]);
    const xs = pts.map((p) => p[0]);
    const ys = pts.map((p) => p[1]);
    return { w: Math.max(...xs) - Math.min(...xs), h: Math.max(...ys) - Math.min(...ys) };
  });
}

describe('map layout', () => {
  it('draws an uneven grid as categories: equal cells, a tick and a label on every grid value', async () => {
    const water = [0, 50, 100, 200, 400];
    const map = gridMap([1300, 1325, 1350, 1400], water, (r) => r.tp_c / 100 + r.water_ppm / 100);
    const r = await renderSvg(sweepMapSpec(map));
    expect(xmlProblem(r.svg)).toBeNull();
    expect(r.warnings).toEqual([]);
    expect(pointsOutsideFrame(r.svg, ALL_MARKS)).toEqual([]);
    const sizes = rectSizes(r.svg, MAP_MARKS.cells);
    expect(sizes).toHaveLength(20);
    // every cell the same size on the page, though the grid steps are 50, 50, 100, 200 ppm (and 25, 25, 50 degC)
    for (const s of sizes) {
      expect(s.w).toBeCloseTo(sizes[0].w, 6);
      expect(s.h).toBeCloseTo(sizes[0].h, 6);
    }
    expect(axisLabels(r.svg, 'Source water (ppm)')).toEqual(['0', '50', '100', '200', '400']);
    expect(axisLabels(r.svg, 'Potential temperature (°C)')).toEqual(['1300', '1325', '1350', '1400']);
  });

  it('starts a log axis at the data (binned samples from 5 ppm: no tick below 5), ticks on the bin edges', async () => {
    const spec = validateSweep({ name: 'b', axes: { tp_c: { from: 1300, to: 1400 }, water_ppm: { from: 5, to: 3000, scale: 'log' } }, design: { kind: 'latin-hypercube', samples: 64 } });
    const tp = Array.from({ length: 8 }, (_, k) => 1303 + k * 12.5);
    const water = Array.from({ length: 8 }, (_, k) => 5 * (3000 / 5) ** ((k + 0.5) / 8));
    const map = binnedMap(gridTable({ tp_c: tp, water_ppm: water }, (r) => Math.log10(r.water_ppm) + r.tp_c / 1000), spec, 'crust_km', 'tp_c', 'water_ppm', 4);
    const r = await renderSvg(sweepMapSpec(map, { contours: [3] }));
    expect(r.warnings).toEqual([]);
    expect(pointsOutsideFrame(r.svg, ALL_MARKS)).toEqual([]);
    // about four bins over 2.8 decades: one bin per decade from 5 ppm, the last ending at 3000 ppm
    expect(axisLabels(r.svg, 'Source water (ppm)')).toEqual(['5', '50', '500', '3000']);
    // round bin widths on the linear axis (25 degC from 1300), each tick on an edge
    expect(map.cells.filter((c) => c.j === 0).map((c) => c.x0)).toEqual([1300, 1325, 1350, 1375]);
    expect(axisLabels(r.svg, 'Potential temperature (°C)')).toEqual(['1300', '1325', '1350', '1375', '1400']);
  });

  it('puts every tick of a binned map on a bin edge, round on linear axes, labels apart', () => {
    const tp = binEdges(1400, 1600, 18, false);
    expect(tp).toEqual(Array.from({ length: 21 }, (_, k) => 1400 + 10 * k));
    expect(edgeTicks(tp, false, 300, 'x')).toEqual([1400, 1450, 1500, 1550, 1600]);
    expect(edgeTicks(tp, false, 80, 'x')).toEqual([1400, 1500, 1600]);
    expect(edgeTicks(tp, false, 50, 'x')).toEqual([1400, 1600]);
    // water 50-500 ppm in 18 bins: 25 ppm wide, edges on its multiples
    const water = binEdges(50, 500, 18, false);
    expect(water[0]).toBe(50);
    expect(water[water.length - 1]).toBe(500);
    expect(edgeTicks(water, false, 240, 'y')).toEqual([50, 100, 150, 200, 250, 300, 350, 400, 450, 500]);
    expect(edgeTicks(water, false, 120, 'y')).toEqual([100, 200, 300, 400, 500]);
    // a range that is not a multiple of the width: the outer bins reach the next multiples
    expect(binEdges(1283, 1397, 6, false)).toEqual([1280, 1300, 1320, 1340, 1360, 1380, 1400]);
    // log: a whole number of bins per decade from the data's start; ticks are edges, decades first
    const up = binEdges(20, 200, 10, true);
    expect(up[0]).toBe(20);
    expect(up[10]).toBe(200);
    const ticks = edgeTicks(up, true, 300, 'x');
    expect(ticks.every((v) => up.includes(v))).toBe(true);
    expect(ticks[0]).toBe(20);
    // 10 to 20000 ppm in about 24 bins: 7 per decade, ticks on the decades 10, 100, 1000, 10000
    const wedge = binEdges(10, 20000, 24, true);
    expect(wedge[0]).toBe(10);
    expect(wedge[wedge.length - 1]).toBe(20000);
    expect(edgeTicks(wedge, true, 300, 'x')).toEqual([10, 100, 1000, 10000]);
  });

  it('writes values in every cell or in none', async () => {
    const small = gridMap([1300, 1350, 1400], [0, 100], (r) => r.tp_c / 100 + r.water_ppm / 1000);
    expect(labelsFitEveryCell(small, 300, 240)).toBe(true);
    const rs = await renderSvg(sweepMapSpec(small));
    expect(layerTexts(rs.svg, MAP_MARKS.values).sort()).toEqual(small.cells.map((c) => cellLabel(c.value as number)).sort());
    // with a cell without a value: every other cell still labelled, the empty one not
    const holed = gridMap([1300, 1350, 1400], [0, 100], (r) => (r.tp_c === 1350 && r.water_ppm === 0 ? NaN : r.tp_c / 100));
    const rh = await renderSvg(sweepMapSpec(holed));
    expect(layerTexts(rh.svg, MAP_MARKS.values)).toHaveLength(5);
    // narrow cells (30 columns of 5-digit values in 300 px): none, not some
    const tp = Array.from({ length: 30 }, (_, k) => 1300 + k);
    const narrow = gridMap(tp, [0, 100], (r) => r.tp_c * 10.123);
    expect(labelsFitEveryCell(narrow, 300, 240)).toBe(false);
    const rn = await renderSvg(sweepMapSpec(narrow));
    expect(markGroups(rn.svg, MAP_MARKS.values)).toBe(0);
    expect(markGroups(rn.svg, MAP_MARKS.cells)).toBe(1);
    // thinned tick labels on 30 categories, but a tick on every cell
    const labels = axisLabels(rn.svg, 'Potential temperature (°C)');
    expect(labels.filter((l) => l !== '').length).toBeLessThan(30);
    expect(labels[0]).toBe('1300');
    expect(pointsOutsideFrame(rn.svg, ALL_MARKS)).toEqual([]);
  });

  it('draws cells without a value distinctly and says how many in the key', async () => {
    // an output that is null over part of the map, as water_threshold_ppm of a flux sweep can be
    const map = gridMap([1300, 1350, 1400, 1450], [0, 100, 200], (r) => (r.tp_c >= 1400 ? NaN : r.water_ppm + r.tp_c / 10));
    const r = await renderSvg(sweepMapSpec(map, { contours: [150] }));
    expect(r.warnings).toEqual([]);
    expect(drawnMarks(r.svg)).toEqual(expect.arrayContaining([MAP_MARKS.cells, MAP_MARKS.noValue, MAP_MARKS.noValueStroke, MAP_MARKS.contours]));
    expect(rectSizes(r.svg, MAP_MARKS.noValue)).toHaveLength(6);
    expect(r.svg).toContain('no value in 6 of 12 cells');
    expect(pointsOutsideFrame(r.svg, ALL_MARKS)).toEqual([]);
    // a map with no value at all still renders (grey cells and the key)
    const none = await renderSvg(sweepMapSpec(gridMap([1300, 1350], [0, 100], () => NaN), { contours: [1] }));
    expect(none.warnings).toEqual([]);
    expect(none.svg).toContain('no value in 4 of 4 cells');
    expect(none.svg).toContain('no contour of crust thickness in the map');
  });
});

describe('contours', () => {
  it('marching squares on z = x + y: every contour point lies on x + y = c (analytic solution)', () => {
    const xs = [0, 1, 2, 3, 4];
    const ys = [0, 1, 2, 3];
    const values = ys.flatMap((y) => xs.map((x) => x + y));
    for (const c of [0.5, 2.25, 3, 5.9]) {
      const segs = contourSegments({ nx: 5, ny: 4, xs, ys, values }, c);
      expect(segs.length).toBeGreaterThan(0);
      for (const s of segs) {
        expect(s.x1 + s.y1).toBeCloseTo(c, 12);
        expect(s.x2 + s.y2).toBeCloseTo(c, 12);
      }
      // one connected line across the grid
      expect(joinSegments(segs)).toHaveLength(1);
    }
    expect(contourSegments({ nx: 5, ny: 4, xs, ys, values }, 7.5)).toEqual([]);
    expect(contourLevels({ nx: 5, ny: 4, xs, ys, values }, [-1])[0].lines).toEqual([]);
  });

  it('a circle contour of z = x^2 + y^2 closes on itself; saddles and holes are handled', () => {
    const g = Array.from({ length: 21 }, (_, k) => -1 + k * 0.1);
    const values = g.flatMap((y) => g.map((x) => x * x + y * y));
    const [circle] = contourLevels({ nx: 21, ny: 21, xs: g, ys: g, values }, [0.5]);
    expect(circle.lines).toHaveLength(1);
    const line = circle.lines[0];
    expect(line[0][0]).toBeCloseTo(line[line.length - 1][0], 12);
    expect(line[0][1]).toBeCloseTo(line[line.length - 1][1], 12);
    // linear interpolation of a quadratic: radius within 1 % of sqrt(0.5) on a 0.1 grid
    for (const [x, y] of line) expect(Math.abs(Math.hypot(x, y) - Math.sqrt(0.5))).toBeLessThan(0.01);
    // saddle z = x y on [-1, 1]^2 at 0.1: two separate branches; the centre decides the pairing
    const s = [-1, 1];
    // (row-major: (-1,-1), (1,-1), (-1,1), (1,1)); the centre value 0 is below 0.5, so the two
    // corners above it are cut off separately
    const saddle = contourLevels({ nx: 2, ny: 2, xs: s, ys: s, values: [1, -1, -1, 1] }, [0.5]);
    expect(saddle[0].lines).toHaveLength(2);
    for (const line of saddle[0].lines) for (const [x, y] of line) expect(Math.abs(x) === 1 || Math.abs(y) === 1).toBe(true);
    expect(contourLevels({ nx: 2, ny: 2, xs: s, ys: s, values: [1, -1, -1, 1] }, [-0.5])[0].lines).toHaveLength(2);
    // a corner without a value: that square draws nothing
    expect(contourSegments({ nx: 2, ny: 2, xs: s, ys: s, values: [0, 1, NaN, 1] }, 0.5)).toEqual([]);
  });

  it('on a map, the contour of crust = (tp - 1300) / 10 + water / 100 lies on that line in data units', () => {
    const tp = [1300, 1310, 1320, 1330, 1340, 1350];
    const water = [0, 100, 200, 300, 400];
    const map = gridMap(tp, water, (r) => (r.tp_c - 1300) / 10 + r.water_ppm / 100);
    const [c] = mapContourLines(map, [4.5]);
    expect(c.lines).toHaveLength(1);
    for (const [x, y] of c.lines[0]) expect((x - 1300) / 10 + y / 100).toBeCloseTo(4.5, 9);
  });

  it('draws the contour in the picture where the line x + y = c is, with its label', async () => {
    const tp = [1300, 1310, 1320, 1330, 1340];
    const water = [0, 100, 200, 300, 400];
    const map = gridMap(tp, water, (r) => (r.tp_c - 1300) / 10 + r.water_ppm / 100);
    const width = 300;
    const height = 240;
    const r = await renderSvg(sweepMapSpec(map, { contours: [3.5], width, height }));
    expect(r.warnings).toEqual([]);
    expect(pointsOutsideFrame(r.svg, ALL_MARKS)).toEqual([]);
    expect(layerTexts(r.svg, MAP_MARKS.contourLabels)).toEqual(['3.5\u00a0km']);
    expect(r.svg).toContain('contour of crust thickness at 3.5\u00a0km');
    // page px -> cell units: category axes, cell k centred at (k + 0.5) / 5 of the frame; y grows upward
    const points = markPoints(r.svg, [MAP_MARKS.contours]);
    expect(points.length).toBeGreaterThan(4);
    for (const p of points) {
      expect(p.frame[2] - p.frame[0]).toBe(width);
      const i = ((p.x - p.frame[0]) / width) * 5 - 0.5;
      const j = ((p.frame[3] - p.y) / height) * 5 - 0.5;
      // within a pixel (5 cells in 300 px: 0.017 cell units per px)
      expect(Math.abs(i + j - 3.5)).toBeLessThan(0.03);
    }
    // the label sits on the line (its anchor moved down by vega's middle-baseline shift, 3 px = 0.0625 cells)
    const [label] = markPoints(r.svg, [MAP_MARKS.contourLabels]);
    const li = ((label.x - label.frame[0]) / width) * 5 - 0.5;
    const lj = ((label.frame[3] - label.y) / height) * 5 - 0.5;
    expect(Math.abs(li + lj - 3.5)).toBeLessThan(0.07);
  });
});

describe('maps of another process', () => {
  it('draws any registered process\'s output with nulls (the test process: y_gap null where a < 0.25)', async () => {
    const href = pathToFileURL(fileURLToPath(new URL('../fixtures/fake-process.mjs', import.meta.url))).href;
    const mod = (await import(href)) as { default: ProcessDefinition<{ scale: number }> };
    registerProcess(mod.default);
    const a = [0.1, 0.2, 0.3, 0.6, 1];
    const b = [0, 0.5, 1];
    const spec = validateSweep({ name: 'fake map', axes: { a_frac: { values: a }, b_frac: { values: b } }, model: { process: 'fake' } });
    const rows: { a: number; b: number }[] = [];
    for (const av of a) for (const bv of b) rows.push({ a: av, b: bv });
    const table: ResultsColumns = {
      rows: rows.length,
      inputs: { a_frac: Float64Array.from(rows, (r) => r.a), b_frac: Float64Array.from(rows, (r) => r.b) },
      outputs: { y_gap: Float64Array.from(rows, (r) => (r.a < 0.25 ? NaN : r.a - 0.25)) },
      status: Uint8Array.from(rows, (r) => (r.a < 0.25 ? 1 : 0)),
      statusCounts: Object.fromEntries(COLUMN_STATUSES.map((s) => [s, 0])) as ResultsColumns['statusCounts'],
    };
    const map = gridSliceMap(table, spec, 'y_gap', 'a_frac', 'b_frac');
    expect(map.cells.filter((c) => c.value === null)).toHaveLength(6);
    const r = await renderSvg(sweepMapSpec(map, { contours: [0.2] }));
    expect(r.warnings).toEqual([]);
    expect(pointsOutsideFrame(r.svg, ALL_MARKS)).toEqual([]);
    expect(r.svg).toContain('no value in 6 of 15 cells');
    // labels from the process's own registry entries
    expect(axisLabels(r.svg, 'Input a')).toEqual(['0.1', '0.2', '0.3', '0.6', '1']);
    // y_gap = a - 0.25 does not depend on b: the 0.2 contour is the vertical line a = 0.45
    const [c] = mapContourLines(map, [0.2]);
    for (const [x] of c.lines[0]) expect(x).toBeCloseTo(0.45, 12);
  });
});
