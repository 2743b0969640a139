/** The fit page: well-formed, self-contained, every panel present with real marks. */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import fs from 'node:fs';
import { buildFitPage } from '../../src/report/fit-page.js';
import { fitResultsFile, type FitFileResult } from '../../src/io/fit-file.js';
import { tmpDir } from '../helpers.js';
import { axisTitles, gridSweepFile, ids, markGroups, saltelliSweepFile, xmlProblem } from './helpers.js';

const dir = tmpDir('fit-page');
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));

let gridFit: FitFileResult;
let saltelliFit: FitFileResult;
beforeAll(async () => {
  gridFit = await fitResultsFile(await gridSweepFile(dir), {
    observations: [
      { output: 'crust_km', value: 7.1, sd: 0.8 },
      { output: 'h2o_melt_wt_pct', value: 0.1, sd: 0.05 },
    ],
    discrepancies: [{ output: 'crust_km', sd: 0.5 }],
    predict: ['f_max'],
  });
  saltelliFit = await fitResultsFile(await saltelliSweepFile(dir), { observations: [{ output: 'crust_km', value: 8, sd: 1 }] });
}, 60_000);

function figures(html: string): { kind: string; name: string | null; svg: string }[] {
  return [...html.matchAll(/<figure class="plot" data-plot="([a-z-]+)"(?: data-name="([^"]*)")?>\s*(<svg[\s\S]*?<\/svg>)/g)].map((m) => ({ kind: m[1], name: m[2] ?? null, svg: m[3] }));
}

describe('fit page of a grid sweep with two observations', () => {
  it('has every panel: prior vs posterior per input, the pair matrix, observed vs predictive per output, the summary table', async () => {
    const page = await buildFitPage(gridFit);
    const html = page.html;
    expect(xmlProblem(html)).toBeNull();
    expect(page.warnings).toEqual([]);
    expect(html).not.toMatch(/<script|<link|<img|<iframe|@import|url\(http|(src|href)="(https?:)?\/\//i);
    expect(new Set(ids(html)).size).toBe(ids(html).length);
    const figs = figures(html);
    expect(figs).toHaveLength(page.plots.length);
    expect(figs.filter((f) => f.kind === 'marginal').map((f) => f.name)).toEqual(['tp_c', 'water_ppm', 'lid_km']);
    expect(figs.filter((f) => f.kind === 'predictive').map((f) => f.name)).toEqual(['crust_km', 'h2o_melt_wt_pct', 'f_max']);
    const pairs = figs.filter((f) => f.kind === 'pairs');
    expect(pairs).toHaveLength(1);
    // three inputs: a lower triangle of 3 panels, (water, tp), (lid, tp), (lid, water)
    for (const name of ['pair_tp_c_water_ppm', 'pair_tp_c_lid_km', 'pair_water_ppm_lid_km']) expect(markGroups(pairs[0].svg, name)).toBe(1);
    for (const f of figs) expect(xmlProblem(f.svg), `${f.kind} ${f.name}`).toBeNull();
    // prior and posterior drawn in every marginal; units on the axes from the file's metadata
    const tp = figs.find((f) => f.name === 'tp_c')!.svg;
    expect(markGroups(tp, 'marginal_posterior')).toBe(1);
    expect(markGroups(tp, 'marginal_prior')).toBe(1);
    expect(axisTitles(tp)[0]).toBe('tp_c (degC)');
    // the observation is drawn on the predictive panels of observed outputs only
    expect(markGroups(figs.find((f) => f.name === 'crust_km')!.svg, 'observed_value')).toBe(1);
    expect(markGroups(figs.find((f) => f.name === 'f_max')!.svg, 'observed_value')).toBe(0);
    // summary table: posterior and prior of each input, then the predictive outputs
    for (const row of ['tp_c posterior', 'lid_km prior', 'crust_km posterior predictive', 'f_max posterior predictive']) expect(html).toContain(`<td>${row}</td>`);
    // what was assumed, the discrepancy and the prior are stated
    expect(html).toContain('data-section="assumptions"');
    expect(html).toContain('<td>0.9434</td>'); // total sd sqrt(0.8^2 + 0.5^2) = 0.9434 km
    expect(html).toContain('each equally likely');
  });
});

describe('fit page of a saltelli sweep with one observation', () => {
  it('states the sampled prior and draws two marginals and one pair panel', async () => {
    const page = await buildFitPage(saltelliFit);
    expect(xmlProblem(page.html)).toBeNull();
    expect(page.plots.map((p) => p.kind)).toEqual(['marginal', 'marginal', 'pairs', 'predictive']);
    expect(saltelliFit.fit.priorText).toMatch(/^the sweep's own design: saltelli samples, every row of the A, B and AB blocks equally likely .*uniform on tp_c 1300-1500 degC; uniform on water_ppm 0-400 ppm/);
  });
});
