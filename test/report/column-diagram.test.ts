import { describe, expect, it } from 'vitest';
import { adiabatTempC } from '../../src/physics/adiabat.js';
import { defaultModel, meltColumn } from '../../src/physics/column.js';
import { drySolidusC, lherzLiquidusC, wetSolidusC } from '../../src/physics/melting.js';
import { DEFAULT_PARAMS } from '../../src/physics/params.js';
import type { Scenario } from '../../src/physics/types.js';
import { pGpaFromDepthKm } from '../../src/physics/units.js';
import { COLUMN_MARKS, renderColumnDiagram } from '../../src/report/column-diagram.js';
import { columnDiagramData, DRY_SOLIDUS, LHERZ_LIQUIDUS, wetSolidusName } from '../../src/report/column-diagram-data.js';
import { axisTitles, ids, markGroups, xmlProblem } from './helpers.js';

const p = DEFAULT_PARAMS;
const sc = (tp_c: number, water_ppm = 0, lid_km = 0, upwelling_mm_yr = Number.NaN): { scenario: Scenario } => ({ scenario: { tp_c, water_ppm, lid_km, upwelling_mm_yr } });

describe('column diagram data', () => {
  const model = defaultModel();
  const data = columnDiagramData([sc(1300, 0, 10), sc(1400, 200, 10)], model);

  it('draws the curves of the melting functions, the wet solidus for each water content', () => {
    expect(data.curveNames).toEqual([DRY_SOLIDUS, wetSolidusName(200), LHERZ_LIQUIDUS]);
    expect(wetSolidusName(200)).toBe('wet solidus, 200\u00a0ppm');
    for (const c of data.curves.filter((_, i) => i % 17 === 0)) {
      const pg = pGpaFromDepthKm(c.depth_km, p.rho_s, p.g);
      const expected = c.curve === DRY_SOLIDUS ? drySolidusC(pg, p) : c.curve === LHERZ_LIQUIDUS ? lherzLiquidusC(pg, p) : wetSolidusC(pg, 0.02, p);
      expect(c.t_c).toBeCloseTo(expected, 9);
    }
  });

  it('joins the solid adiabat below the onset to the melting path of meltColumn', () => {
    for (const s of data.scenarios) {
      const r = meltColumn(s.scenario, { ...model, withProfile: true });
      expect(r.status).toBe('ok');
      const prof = r.profile!;
      const path = data.melting.filter((q) => q.scenario === s.label);
      expect(path.map((q) => q.t_c)).toEqual(Array.from(prof.t_c));
      const adiabat = data.adiabat.filter((q) => q.scenario === s.label);
      // from the bottom of the diagram up to the onset, on the solid adiabat of the scenario's Tp
      expect(adiabat[0].depth_km).toBe(data.depthMaxKm);
      expect(adiabat[adiabat.length - 1].depth_km).toBeCloseTo(prof.depth_km[0], 9);
      for (const q of adiabat) expect(q.t_c).toBeCloseTo(adiabatTempC(s.scenario.tp_c, pGpaFromDepthKm(q.depth_km, p.rho_s, p.g), p), 9);
      // the two parts meet at the onset
      expect(adiabat[adiabat.length - 1].t_c).toBeCloseTo(prof.t_c[0], 6);
      expect(data.depthMaxKm).toBeGreaterThan(prof.depth_km[0]);
    }
    // bands: one lid per scenario, one melting interval per melting scenario
    expect(data.bands.filter((b) => b.kind === 'lid')).toHaveLength(2);
    expect(data.bands.filter((b) => b.kind === 'melting')).toHaveLength(2);
  });

  it('labels scenarios by the inputs that differ, with units from the registry', () => {
    expect(data.scenarios.map((s) => s.label)).toEqual(['Tp 1300\u00a0°C, water 0\u00a0ppm', 'Tp 1400\u00a0°C, water 200\u00a0ppm']);
  });

  it('draws the conductive profile, lid included, for a conductive column', () => {
    const d = columnDiagramData([sc(1350, 100, 20, 5)], model);
    expect(d.scenarios[0].thermal).toBe('conductive');
    const cond = d.conductive;
    expect(cond.length).toBeGreaterThan(10);
    expect(cond[0]).toMatchObject({ depth_km: 0, t_c: p.T_surface });
    expect(Math.max(...cond.map((q) => q.depth_km))).toBeGreaterThan(20);
  });
});

describe('column diagram SVG', () => {
  it('is well formed, with one path per scenario, the reference curves and units on the axes', async () => {
    const scenarios = [sc(1300), sc(1350, 100), sc(1400, 100, 15)];
    const r = await renderColumnDiagram(scenarios, defaultModel(), { idPrefix: 'cd-' });
    expect(xmlProblem(r.svg)).toBeNull();
    expect(r.warnings).toEqual([]);
    expect(markGroups(r.svg, COLUMN_MARKS.melting)).toBe(3);
    expect(markGroups(r.svg, COLUMN_MARKS.adiabat)).toBe(3);
    expect(markGroups(r.svg, COLUMN_MARKS.meltFraction)).toBe(3);
    expect(markGroups(r.svg, COLUMN_MARKS.conductive)).toBe(0);
    // dry solidus, one wet solidus (100 ppm), lherzolite liquidus
    expect(markGroups(r.svg, COLUMN_MARKS.curves)).toBe(3);
    for (const name of ['dry solidus', 'wet solidus, 100\u00a0ppm', 'lherzolite liquidus', 'Tp 1400\u00a0°C, water 100\u00a0ppm, lid 15\u00a0km']) expect(r.svg).toContain(`>${name}</text>`);
    const titles = axisTitles(r.svg);
    expect(titles).toContain('Temperature (°C)');
    expect(titles).toContain('Depth (km)');
    expect(titles).toContain('Pressure (GPa)');
    expect(titles).toContain('Melt fraction');
    // ids are prefixed and unique
    expect(ids(r.svg).every((id) => id.startsWith('cd-'))).toBe(true);
    expect(new Set(ids(r.svg)).size).toBe(ids(r.svg).length);
  });

  it('draws depth increasing downward', async () => {
    const r = await renderColumnDiagram([sc(1350)], defaultModel());
    const axis = r.svg.slice(r.svg.indexOf("aria-label=\"Y-axis titled 'Depth (km)'"));
    const labelY = (v: string): number => Number(new RegExp(`translate\\(-?[0-9.]+,(-?[0-9.]+)\\)"[^>]*>${v}</text>`).exec(axis)![1]);
    expect(labelY('100')).toBeGreaterThan(labelY('0'));
  });

  it('draws a conductive profile, and a column that does not melt as an adiabat up to its lid', async () => {
    const r = await renderColumnDiagram([sc(1350, 100, 20, 5), sc(1250, 0, 120)], defaultModel());
    expect(r.data.scenarios.map((s) => s.result.status)).toEqual(['ok', 'no_melt']);
    expect(markGroups(r.svg, COLUMN_MARKS.conductive)).toBe(1);
    expect(markGroups(r.svg, COLUMN_MARKS.melting)).toBe(1);
    expect(markGroups(r.svg, COLUMN_MARKS.adiabat)).toBe(2);
    const dry = r.data.adiabat.filter((q) => q.scenario === r.data.scenarios[1].label);
    expect(dry[dry.length - 1].depth_km).toBe(120);
    expect(xmlProblem(r.svg)).toBeNull();
    expect(r.warnings).toEqual([]);
  });
});

describe('column diagram without melting', () => {
  it('renders cleanly when no scenario melts', async () => {
    const r = await renderColumnDiagram([sc(1150, 0, 60), sc(1200, 0, 80)], defaultModel());
    expect(r.data.scenarios.map((s) => s.result.status)).toEqual(['no_melt', 'no_melt']);
    expect(markGroups(r.svg, COLUMN_MARKS.melting)).toBe(0);
    expect(markGroups(r.svg, COLUMN_MARKS.adiabat)).toBe(2);
    expect(xmlProblem(r.svg)).toBeNull();
    expect(r.warnings).toEqual([]);
  });
});
