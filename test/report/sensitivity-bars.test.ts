/** The sensitivity pictures of one output: Sobol index bars and main-effect curves. */
import { describe, expect, it } from 'vitest';
import type { SensitivityRecord } from '../../src/analyze/types.js';
import { labelsOfProcess } from '../../src/report/labels.js';
import { renderSvg } from '../../src/report/render.js';
import { mainEffectsSpec, sensitivityBarsSpec } from '../../src/report/sensitivity-bars.js';
import { axisTitles, markGroups, svgTexts, xmlProblem } from './helpers.js';

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
