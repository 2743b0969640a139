import { describe, expect, it } from 'vitest';
import { validateSweep } from '../../src/spec/index.js';
import { binnedMap, cellEdges, gridSliceMap, MAX_MAP_CELLS, middleValue } from '../../src/report/sweep-map.js';
import { sweepMapSpec } from '../../src/report/map-figure.js';
import { renderSvg } from '../../src/report/render.js';
import { axisTitles, gridTable, markGroups, xmlProblem } from './helpers.js';


describe('sweep maps', () => {
  it('puts cell edges half-way between grid values (geometrically on log axes)', () => {
    expect(cellEdges([0, 100, 300], false)).toEqual([-50, 50, 200, 400]);
    const log = cellEdges([1, 4, 16], true);
    expect(log[1]).toBeCloseTo(2, 12);
    expect(log[2]).toBeCloseTo(8, 12);
    expect(log[0]).toBeCloseTo(0.5, 12);
    expect(middleValue([40, 0, 20, 10])).toBe(10);
  });

  it('slices a grid at the chosen values of the other inputs (snapped to the grid)', () => {
    const axes = { tp_c: [1300, 1350, 1400], water_ppm: [0, 100], lid_km: [0, 10, 20] };
    const spec = validateSweep({ name: 's', axes: { tp_c: { values: axes.tp_c }, water_ppm: { values: axes.water_ppm }, lid_km: { values: axes.lid_km } }, design: { kind: 'grid' } });
    const table = gridTable(axes, (r) => r.tp_c / 100 + r.water_ppm / 1000 - r.lid_km / 10);
    const middle = gridSliceMap(table, spec, 'crust_km', 'tp_c', 'water_ppm');
    expect(middle.at).toEqual([{ name: 'lid_km', value: 10 }]);
    expect(middle.cells).toHaveLength(6);
    const cell = middle.cells.find((c) => c.x === 1400 && c.y === 100)!;
    expect(cell.value).toBeCloseTo(14 + 0.1 - 1, 12);
    const snapped = gridSliceMap(table, spec, 'crust_km', 'tp_c', 'water_ppm', { lid_km: 17 });
    expect(snapped.at).toEqual([{ name: 'lid_km', value: 20 }]);
    expect(snapped.cells.find((c) => c.x === 1300 && c.y === 0)!.value).toBeCloseTo(13 - 2, 12);
  });

  it('bins a grid slice with more cells than a map draws one by one', () => {
    const tp = Array.from({ length: 150 }, (_, i) => 1300 + i);
    const water = Array.from({ length: 100 }, (_, i) => i * 10);
    const spec = validateSweep({ name: 's', axes: { tp_c: { values: tp }, water_ppm: { values: water }, lid_km: { values: [0, 10] } }, design: { kind: 'grid' } });
    const table = gridTable({ tp_c: tp, water_ppm: water, lid_km: [0, 10] }, (r) => r.lid_km);
    const map = gridSliceMap(table, spec, 'crust_km', 'tp_c', 'water_ppm', { lid_km: 10 });
    expect(map.mode).toBe('binned');
    expect(map.cells.length).toBeLessThanOrEqual(MAX_MAP_CELLS);
    expect(map.at).toEqual([{ name: 'lid_km', value: 10 }]);
    // only the slice's rows: every cell mean is the slice value
    expect(map.cells.every((c) => c.value === 10)).toBe(true);
  });

  it('bins samples of other designs into cell means', () => {
    const spec = validateSweep({ name: 's', axes: { tp_c: { from: 1300, to: 1400 }, water_ppm: { from: 0, to: 100 } }, design: { kind: 'latin-hypercube', samples: 4 } });
    const table = gridTable({ tp_c: [1310, 1320, 1390], water_ppm: [10, 90] }, (r) => r.tp_c);
    const map = binnedMap(table, spec, 'crust_km', 'tp_c', 'water_ppm', 2);
    expect(map.mode).toBe('binned');
    expect(map.cells).toHaveLength(4);
    const lowLow = map.cells.find((c) => c.x0 === 1300 && c.y0 === 0)!;
    expect(lowLow.value).toBeCloseTo(1315, 12);
    expect(lowLow.n).toBe(2);
  });

  it('renders a heat map with one rect per cell, units on the axes and grey cells without a value', async () => {
    const axes = { tp_c: [1300, 1350, 1400], water_ppm: [0, 100], lid_km: [0] };
    const spec = validateSweep({ name: 's', axes: { tp_c: { values: axes.tp_c }, water_ppm: { values: axes.water_ppm } }, design: { kind: 'grid' } });
    const table = gridTable(axes, (r) => (r.tp_c === 1300 ? NaN : r.tp_c / 100));
    const r = await renderSvg(sweepMapSpec(gridSliceMap(table, spec, 'crust_km', 'tp_c', 'water_ppm')));
    expect(xmlProblem(r.svg)).toBeNull();
    expect(r.warnings).toEqual([]);
    expect(markGroups(r.svg, 'map_cells')).toBe(1);
    expect(markGroups(r.svg, 'no_value_cells')).toBe(1);
    expect(r.svg.split('aria-roledescription="rect mark"').length - 1).toBeGreaterThanOrEqual(6);
    expect(axisTitles(r.svg)).toEqual(['Potential temperature (°C)', 'Source water (ppm)']);
    expect(r.svg).toContain('crust_km');
  });

  it('renders a constant output and a slice without any value', async () => {
    const axes = { tp_c: [1300, 1350], water_ppm: [0, 100], lid_km: [0] };
    const spec = validateSweep({ name: 's', axes: { tp_c: { values: axes.tp_c }, water_ppm: { values: axes.water_ppm } }, design: { kind: 'grid' } });
    for (const f of [() => 0, () => NaN]) {
      const r = await renderSvg(sweepMapSpec(gridSliceMap(gridTable(axes, f), spec, 'crust_km', 'tp_c', 'water_ppm')));
      expect(xmlProblem(r.svg)).toBeNull();
      expect(r.warnings).toEqual([]);
    }
  });
});
