import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import fs from 'node:fs';
import path from 'node:path';
import { InputError } from '../../src/errors.js';
import { buildHtmlReport, writeHtmlReport } from '../../src/report/html-report.js';
import { parseAtOption } from '../../src/report/report-options.js';
import { tmpDir } from '../helpers.js';
import { runSweep } from '../../src/run/run-sweep.js';
import { validateSweep } from '../../src/spec/index.js';
import { axisTitles, gridSweepFile, ids, markGroups, saltelliSweepFile, svgTexts, xmlProblem } from './helpers.js';

const dir = tmpDir('report');
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));

let grid = '';
let saltelli = '';
beforeAll(async () => {
  grid = await gridSweepFile(dir);
  saltelli = await saltelliSweepFile(dir);
});

/** The SVG documents inlined in a page, by the figure's data-plot kind. */
function figures(html: string): { kind: string; output: string | null; svg: string }[] {
  return [...html.matchAll(/<figure class="plot" data-plot="([a-z-]+)"(?: data-output="([^"]*)")?>\s*(<svg[\s\S]*?<\/svg>)/g)].map((m) => ({ kind: m[1], output: m[2] ?? null, svg: m[3] }));
}

describe('HTML report of a flux table', () => {
  it("uses the flux process's own labels in every axis, key, table, heading and title", async () => {
    const spec = validateSweep({
      name: 'arc segment A-9 test grid',
      axes: { water_ppm: { values: [300, 3000, 12000] }, lid_km: { values: [50, 70, 90] } },
      fixed: { tp_c: 1380, slab_depth_km: 130 },
      model: { process: 'flux' },
    });
    const file = path.join(dir, 'flux.arrow');
    await runSweep({ spec, outPath: file, workers: 2 });
    const report = await buildHtmlReport(file, { outputs: ['melt_column_km', 'f_max'] });
    expect(report.warnings).toEqual([]);
    const html = report.html;
    const figs = figures(html);
    const map = figs.find((f) => f.kind === 'map' && f.output === 'melt_column_km')!.svg;
    expect(axisTitles(map)).toEqual(['Wedge water (ppm)', 'Plate thickness (km)']);
    expect(svgTexts(map)).toContain('Melt column (km)');
    const effects = figs.find((f) => f.kind === 'main-effects' && f.output === 'melt_column_km')!.svg;
    expect(axisTitles(effects)).toEqual(expect.arrayContaining(['Wedge water (ppm)', 'Plate thickness (km)', 'Melt column (km)']));
    const bars = figs.find((f) => f.kind === 'indices' && f.output === 'melt_column_km')!.svg;
    expect(svgTexts(bars)).toEqual(expect.arrayContaining(['Wedge water', 'Plate thickness']));
    const column = figs.find((f) => f.kind === 'column')!.svg;
    expect(svgTexts(column).join(' ')).toContain('Representative columns by melt column: smallest, median, largest');
    for (const text of ['<td>Plate thickness (lid_km)</td><td>km</td>', '<td>Wedge potential temperature (tp_c)</td>', '<td>Slab depth (slab_depth_km)</td>', '<h2>Maps over the wedge water and the plate thickness</h2>']) expect(html).toContain(text);
    // the decompression words for the same column names appear nowhere
    for (const f of figs) {
      const words = svgTexts(f.svg).join(' ');
      for (const wrong of ['Lid thickness', 'lid thickness', 'Source water', 'source water', 'Potential temperature (']) expect(words, `${f.kind} ${f.output}`).not.toContain(wrong);
    }
    for (const wrong of ['Lid thickness', 'Source water', 'Potential temperature']) expect(html).not.toContain(wrong);
  });
});

describe('HTML report of a grid sweep', () => {
  it('is one well-formed, self-contained page with every picture and the run metadata', async () => {
    const report = await buildHtmlReport(grid);
    const html = report.html;
    expect(xmlProblem(html)).toBeNull();
    expect(report.warnings).toEqual([]);
    // nothing to fetch: no external scripts, styles, images or fonts
    expect(html).not.toMatch(/<script|<link|<img|<iframe|@import|url\(http|(src|href)="(https?:)?\/\//i);
    // default outputs: the five of the issue (melt flux: the sweep fixes an upwelling rate)
    const outputs = ['crust_km', 'f_max', 'onset_depth_km', 'h2o_melt_wt_pct', 'melt_flux_kg_m2_yr'];
    const figs = figures(html);
    expect(figs.filter((f) => f.kind === 'map').map((f) => f.output)).toEqual(outputs);
    expect(figs.filter((f) => f.kind === 'indices').map((f) => f.output)).toEqual(outputs);
    expect(figs.filter((f) => f.kind === 'main-effects').map((f) => f.output)).toEqual(outputs);
    expect(figs.filter((f) => f.kind === 'column')).toHaveLength(1);
    expect(figs).toHaveLength(report.plots.length);
    for (const f of figs) expect(xmlProblem(f.svg), f.kind).toBeNull();
    // every id on the page is unique (several inline SVGs)
    expect(new Set(ids(html)).size).toBe(ids(html).length);
    // maps: the first two swept inputs, lid at its middle value; units from the registry
    const crustMap = figs.find((f) => f.kind === 'map' && f.output === 'crust_km')!.svg;
    expect(axisTitles(crustMap)).toEqual(['Potential temperature (°C)', 'Source water (ppm)']);
    expect(crustMap).toContain('lid thickness 10\u00a0km');
    expect(markGroups(crustMap, 'map_cells')).toBe(1);
    expect(crustMap.split('aria-roledescription="rect mark"').length - 1).toBeGreaterThanOrEqual(15);
    // representative columns: min, median and max crust among ok rows, three paths
    const column = figs.find((f) => f.kind === 'column')!.svg;
    expect(markGroups(column, 'melting_path')).toBe(3);
    expect(column).toMatch(/>smallest: crust thickness [0-9.]+\u00a0km; /);
    expect(column).toMatch(/>largest: crust thickness [0-9.]+\u00a0km; /);
    // run metadata
    for (const text of ['ridge segment R-7 test grid', 'grid, 5 × 3 × 3', '<td>45</td>', '<td>ok</td>', '<td>M_cpx</td>', '<td>Upwelling rate (upwelling_mm_yr)</td>', '<td>Potential temperature (tp_c)</td><td>°C</td>']) expect(html).toContain(text);
    // no unit as the sweep file spells it, no column name as a heading
    expect(html).not.toContain('degC');
    expect(html).toContain('<h2>Maps over the potential temperature and the source water</h2>');
  });

  it('follows --x, --y, --at and --outputs', async () => {
    const report = await buildHtmlReport(grid, { outputs: ['f_max'], x: 'lid_km', y: 'tp_c', at: { water_ppm: 90 } });
    const figs = figures(report.html);
    expect(figs.filter((f) => f.kind === 'map')).toHaveLength(1);
    const map = figs.find((f) => f.kind === 'map')!.svg;
    expect(axisTitles(map)).toEqual(['Lid thickness (km)', 'Potential temperature (°C)']);
    expect(map).toContain('source water 100\u00a0ppm');
    expect(figs.find((f) => f.kind === 'column')!.svg).toContain('largest melt fraction');
  });

  it('refuses bad options with the option, the value and what is allowed', async () => {
    const problems = async (o: Parameters<typeof buildHtmlReport>[1]): Promise<string> => {
      try {
        await buildHtmlReport(grid, o);
      } catch (err) {
        expect(err).toBeInstanceOf(InputError);
        return (err as InputError).message;
      }
      throw new Error('no error');
    };
    expect(await problems({ x: 'upwelling_mm_yr' })).toBe('--x: upwelling_mm_yr is not swept in this sweep (held at 30 mm/yr); swept inputs: tp_c, water_ppm, lid_km');
    expect(await problems({ y: 'depth' })).toBe('--y: "depth" is not an input; swept inputs: tp_c, water_ppm, lid_km');
    expect(await problems({ x: 'tp_c', y: 'tp_c' })).toMatch(/^--x and --y: both are tp_c/);
    expect(await problems({ at: { lid_km: 50 } })).toBe('--at: lid_km=50 km is outside the swept range 0-20 km');
    expect(await problems({ at: { tp_c: 1300 } })).toMatch(/^--at: tp_c is on the --x axis/);
    expect(await problems({ outputs: ['crust'] })).toMatch(/^--outputs: "crust" is not an output column; did you mean crust_km\? allowed: onset_p_gpa, /);
    expect(await problems({ at: { water: 100 } })).toBe('--at: "water" is not an input; did you mean water_ppm? swept inputs: tp_c, water_ppm, lid_km');
    expect(await problems({ outputs: ['surface_heat_flow_mw_m2'] })).toMatch(/^--outputs: surface_heat_flow_mw_m2 holds no values in /);
    expect(() => parseAtOption('lid_km:10')).toThrow('--at: "lid_km:10" is not allowed; give name=value pairs');
    expect(parseAtOption('lid_km=10, water_ppm=5')).toEqual({ lid_km: 10, water_ppm: 5 });
    await expect(buildHtmlReport(path.join(dir, 'missing.arrow'))).rejects.toThrow(/RESULTS: .*missing.arrow does not exist/);
  });
});

describe('HTML report of a saltelli sweep', () => {
  it('bins the samples for the maps and draws index intervals', async () => {
    const out = path.join(dir, 'saltelli.html');
    const report = await writeHtmlReport(saltelli, out, { outputs: ['crust_km', 'f_max'], resamples: 50 });
    const html = fs.readFileSync(out, 'utf8');
    expect(html).toBe(report.html);
    expect(xmlProblem(html)).toBeNull();
    expect(report.warnings).toEqual([]);
    const figs = figures(html);
    expect(figs.map((f) => f.kind)).toEqual(['map', 'map', 'indices', 'main-effects', 'indices', 'main-effects', 'column']);
    const map = figs[0].svg;
    expect(map).toContain('mean of the samples in each cell');
    expect(markGroups(figs[2].svg, 'index_intervals')).toBe(1);
    expect(figs[2].svg).toContain('total (ST)');
  });
});
