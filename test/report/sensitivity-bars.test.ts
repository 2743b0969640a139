/** The sensitivity pictures of one output: Sobol index bars and main-effect curves. */
import { describe, expect, it } from 'vitest';
import type { SensitivityRecord } from '../../src/analyze/types.js';
import { labelsOfProcess } from '../../src/report/labels.js';
import { renderSvg } from '../../src/report/render.js';
import { layoutWidthFor, svgSize } from '../../src/report/export.js';
import { renderFigure } from '../../src/report/figure.js';
import { mainEffectsSpec, sensitivityBarsLayout, sensitivityBarsSpec } from '../../src/report/sensitivity-bars.js';
import { labelsFit, linearTicks, logAxisTicks, MAX_TICKS } from '../../src/report/ticks.js';
import { axisTitles, markGroups, markPoints, pointsOutsideFrame, svgTexts, textBoxes, touchingTexts, xmlProblem } from './helpers.js';

const decompression = labelsOfProcess('decompression');
const flux = labelsOfProcess('flux');

const rec = (input: string, measure: 'S1' | 'ST', value: number | null, ci: [number, number] | null = null, output = 'crust_km'): SensitivityRecord => ({
  output, input, measure, value, ci_low: ci?.[0] ?? null, ci_high: ci?.[1] ?? null, n: 32,
});

describe('Sobol index bars', () => {
  it('draws S1 and ST bars with intervals where the design gives them, each input named by its label', async () => {
    const records = [rec('tp_c', 'S1', 0.8, [0.7, 0.9]), rec('tp_c', 'ST', 0.85, [0.75, 0.95]), rec('water_ppm', 'S1', 0.1, [0, 0.2]), rec('water_ppm', 'ST', 0.15, [0.05, 0.25])];
    const r = await renderSvg(sensitivityBarsSpec(records, 'crust_km', ['tp_c', 'water_ppm'], { labels: decompression })!);
    expect(xmlProblem(r.svg)).toBeNull();
    expect(r.warnings).toEqual([]);
    expect(r.svg.split('aria-roledescription="bar"').length - 1).toBe(4);
    expect(markGroups(r.svg, 'index_intervals')).toBe(1);
    const texts = svgTexts(r.svg);
    expect(texts).toEqual(expect.arrayContaining(['first order (S1)', 'total (ST)', 'Potential temperature', 'Source water']));
    // the category axis once showed "NaN" for every input (a number format applied to names)
    expect(texts).not.toContain('NaN');
  });

  it('leaves out indices without a value and returns null when none has one', () => {
    expect(sensitivityBarsSpec([rec('tp_c', 'S1', null), rec('tp_c', 'ST', null)], 'crust_km', ['tp_c'], { labels: decompression })).toBeNull();
    expect(mainEffectsSpec([], 'crust_km', { labels: decompression })).toBeNull();
  });

  it("names a flux table's inputs and output with the flux process's own labels", async () => {
    const records = [rec('lid_km', 'S1', 0.4, null, 'melt_column_km'), rec('tp_c', 'S1', 0.3, null, 'melt_column_km'), rec('water_ppm', 'S1', 0.2, null, 'melt_column_km')];
    const r = await renderSvg(sensitivityBarsSpec(records, 'melt_column_km', ['water_ppm', 'tp_c', 'lid_km'], { labels: flux })!);
    const texts = svgTexts(r.svg);
    expect(texts).toEqual(expect.arrayContaining(['Plate thickness', 'Wedge potential temperature', 'Wedge water', 'Sobol indices of the melt column']));
    expect(texts).not.toContain('Lid thickness');
    expect(texts).not.toContain('Potential temperature');
  });
});

describe('main-effect curves', () => {
  it('draws one panel per input with its unit', async () => {
    const curves = [
      { output: 'crust_km', input: 'tp_c', binned: false, x: [1300, 1400], mean: [5, 10], count: [3, 3] },
      { output: 'crust_km', input: 'water_ppm', binned: false, x: [0, 100], mean: [7, 8], count: [3, 3] },
    ];
    const r = await renderSvg(mainEffectsSpec(curves, 'crust_km', { labels: decompression })!);
    expect(xmlProblem(r.svg)).toBeNull();
    expect(markGroups(r.svg, 'main_effect_line_0') + markGroups(r.svg, 'main_effect_line_1')).toBe(2);
    expect(axisTitles(r.svg)).toEqual(expect.arrayContaining(['Potential temperature (°C)', 'Source water (ppm)', 'Crust thickness (km)']));
  });

  it('uses the flux labels for a flux table', async () => {
    const curves = [
      { output: 'melt_column_km', input: 'lid_km', binned: true, x: [55, 75, 95], mean: [3, 2, 1], count: [9, 9, 9] },
      { output: 'melt_column_km', input: 'tp_c', binned: true, x: [1290, 1340, 1390], mean: [1, 2, 3], count: [9, 9, 9] },
    ];
    const r = await renderSvg(mainEffectsSpec(curves, 'melt_column_km', { labels: flux })!);
    expect(axisTitles(r.svg)).toEqual(expect.arrayContaining(['Plate thickness (km)', 'Wedge potential temperature (°C)', 'Melt column (km)']));
  });
});

describe('main-effect axes', () => {
  it('chooses round ticks inside the data whose labels do not touch (measured with the font)', () => {
    // 1300..1400 on 60 px: 1300 and 1350 would be 30 px apart, less than a label (about 25 px) plus the gap
    expect(linearTicks(1300, 1400, 60)).toEqual([1300, 1400]);
    expect(linearTicks(1300, 1400, 200)).toEqual([1300, 1320, 1340, 1360, 1380, 1400]);
    expect(linearTicks(50, 500, 120)).toEqual([200, 400]);
    expect(linearTicks(50, 500, 160)).toEqual([100, 200, 300, 400, 500]);
    // log axes: 1-2-5 values inside the data, never the decade below or above it
    expect(logAxisTicks(20, 200, 150)).toEqual([20, 50, 100, 200]);
    expect(logAxisTicks(20, 200, 60)).toEqual([30, 100]);
    expect(logAxisTicks(10, 20000, 90)).toEqual([10, 1000]);
    for (const [lo, hi, w] of [[1280, 1400, 50], [50, 100, 40], [0, 0.3, 70], [80, 160, 90]]) {
      const ticks = linearTicks(lo, hi, w);
      expect(ticks.every((t) => t >= lo && t <= hi)).toBe(true);
      expect(labelsFit(ticks.map((t) => ((t - lo) / (hi - lo)) * w), ticks.map(String))).toBe(true);
    }
  });

  it('keeps every point off the frame and no two tick labels touching, four narrow panels with a log axis', async () => {
    const x = (lo: number, hi: number, log = false): number[] => Array.from({ length: 12 }, (_, k) => (log ? lo * (hi / lo) ** (k / 11) : lo + ((hi - lo) * k) / 11));
    const curve = (input: string, xs: number[]) => ({ output: 'crust_km', input, binned: true, x: xs, mean: xs.map((_, k) => 5 + k), count: xs.map(() => 20) });
    const curves = [curve('tp_c', x(1400, 1600)), curve('water_ppm', x(50, 500)), curve('upwelling_mm_yr', x(20, 200, true)), curve('lid_km', x(50, 100))];
    const r = await renderSvg(mainEffectsSpec(curves, 'crust_km', { labels: decompression, logInputs: new Set(['upwelling_mm_yr']), panelWidth: 120 })!);
    expect(r.warnings).toEqual([]);
    expect(touchingTexts(r.svg)).toEqual([]);
    const marks = curves.map((_, k) => `main_effect_line_${k}`);
    // the curve's ends sit inside the frame, off its edges
    expect(pointsOutsideFrame(r.svg, marks, -2)).toEqual([]);
    const upwelling = textBoxes(r.svg).map((t) => t.text).filter((t) => /^[0-9]+$/.test(t)).map(Number);
    expect(upwelling).not.toContain(1000);
  });
});

describe('index bars laid out for a journal column', () => {
  // four flux inputs with long names, intervals reaching below 0 and above 1
  const records = ['water_ppm', 'tp_c', 'lid_km', 'slab_depth_km'].flatMap((input, k) => [
    rec(input, 'S1', 0.6 - 0.2 * k, [0.5 - 0.25 * k, 0.75 - 0.15 * k], 'h2o_melt_wt_pct'),
    rec(input, 'ST', 0.7 - 0.2 * k, [0.55 - 0.2 * k, 1.05 - 0.2 * k], 'h2o_melt_wt_pct'),
  ]);
  const inputs = ['water_ppm', 'tp_c', 'lid_km', 'slab_depth_km'];

  for (const mm of [85, 60, 175]) {
    it(`re-lays the bars out at ${mm} mm: fonts stay the same size, names wrap, nothing is cut or touches`, async () => {
      const target = layoutWidthFor({ width: { mm } })!;
      const r = await renderFigure(sensitivityBarsLayout(records, 'h2o_melt_wt_pct', inputs, flux)!, target);
      expect(r.warnings).toEqual([]);
      // laid out at the width, not scaled to it: layout px print at 0.75 pt, so 11 px names are 8.25 pt
      expect(svgSize(r.svg).width).toBeCloseTo(target, 0);
      const boxes = textBoxes(r.svg);
      expect(Math.min(...boxes.map((b) => b.size))).toBeGreaterThanOrEqual(10.5);
      for (const b of boxes) {
        expect(b.left, b.text).toBeGreaterThanOrEqual(-0.5);
        expect(b.right, b.text).toBeLessThanOrEqual(b.pictureWidth + 0.5);
      }
      expect(touchingTexts(r.svg)).toEqual([]);
      // every name in full (its lines joined), left of the bars' frame
      const frameLeft = markPoints(r.svg, ['index_bars'])[0].frame[0];
      const names = boxes.filter((b) => b.size === 11 && !b.bold);
      for (const n of names) expect(n.right, n.text).toBeLessThanOrEqual(frameLeft + 0.5);
      const joined = svgTexts(r.svg).join(' | ');
      for (const name of ['Wedge water', 'Wedge potential temperature', 'Plate thickness', 'Slab depth']) expect(joined).toContain(name);
      // bars and whiskers inside the frame
      expect(pointsOutsideFrame(r.svg, ['index_bars', 'index_intervals'])).toEqual([]);
      if (mm === 60) expect(names.length).toBeGreaterThan(inputs.length);
    });
  }
});

describe('index bar axis', () => {
  it('shows at most seven round ticks from 0 to 1, however wide the bars', () => {
    expect(linearTicks(0, 1, 300)).toEqual([0, 0.2, 0.4, 0.6, 0.8, 1]);
    expect(linearTicks(0, 1, 1000).length).toBeLessThanOrEqual(MAX_TICKS);
  });
});
