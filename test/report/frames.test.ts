/**
 * Every drawn mark of a column diagram stays inside its panel, for the hard cases of issue 17:
 * slow conductive columns (the profile from 0 degC at the surface down), lids of 0 and 100 km,
 * eight scenarios, wet and dry sources. Titles and key entries are never cut: each line of text
 * is measured with the house font against the width it has.
 */
import { describe, expect, it } from 'vitest';
import { defaultModel } from '../../src/physics/column.js';
import { DEFAULT_PARAMS } from '../../src/physics/params.js';
import type { Scenario } from '../../src/physics/types.js';
import { COLUMN_DATA_MARKS, COLUMN_MARKS, MELTING_PATH_HALF_WIDTH, renderColumnDiagram } from '../../src/report/column-diagram.js';
import { clipCurve } from '../../src/report/column-diagram-data.js';
import { pointsOutsideFrame, textBoxes, xmlProblem } from './helpers.js';

const sc = (tp_c: number, water_ppm = 0, lid_km = 0, upwelling_mm_yr = Number.NaN): { scenario: Scenario } => ({ scenario: { tp_c, water_ppm, lid_km, upwelling_mm_yr } });

const CASES: { name: string; items: { scenario: Scenario }[]; widths?: (number | undefined)[] }[] = [
  { name: 'slow conductive column with a lid (issue 17)', items: [sc(1350, 100, 20, 5)] },
  { name: 'conductive columns at 2 to 100 mm/yr under a 5 km lid', items: [sc(1350, 100, 5, 2), sc(1350, 100, 5, 5), sc(1350, 100, 5, 20), sc(1350, 100, 5, 100)] },
  { name: 'lids of 0 and 100 km', items: [sc(1350, 0, 0), sc(1450, 0, 100), sc(1500, 300, 100)] },
  { name: 'eight scenarios, wet and dry, isentropic, natural and 85 mm wide', items: [1250, 1300, 1350, 1400].flatMap((tp) => [sc(tp, 0, 10), sc(tp, 400, 30)]), widths: [undefined, 321] },
  { name: 'eight conductive scenarios with long labels', items: [2, 10].flatMap((w) => [1300, 1400].flatMap((tp) => [sc(tp, 0, 0, w), sc(tp, 250, 29.89, w)])) },
];

describe('column diagram frames', () => {
  for (const c of CASES) {
    it(`keeps every mark inside its panel and every text uncut: ${c.name}`, async () => {
      for (const targetWidth of c.widths ?? [undefined]) {
        const r = await renderColumnDiagram(c.items, defaultModel(), { targetWidth });
        expect(xmlProblem(r.svg)).toBeNull();
        expect(r.warnings).toEqual([]);
        const lines = COLUMN_DATA_MARKS.filter((m) => m !== COLUMN_MARKS.melting);
        expect(pointsOutsideFrame(r.svg, lines)).toEqual([]);
        if (r.data.melting.length > 0) expect(pointsOutsideFrame(r.svg, [COLUMN_MARKS.melting], MELTING_PATH_HALF_WIDTH + 0.5)).toEqual([]);
        // nothing is cut: every line of text ends inside the picture, and no text was shortened
        for (const t of textBoxes(r.svg)) {
          expect(t.text.endsWith('…'), t.text).toBe(false);
          expect(t.right, t.text).toBeLessThanOrEqual(t.pictureWidth + 0.5);
        }
        // the key names every scenario in full (its lines joined)
        const all = textBoxes(r.svg).map((t) => t.text).join(' ');
        for (const s of r.data.scenarios) expect(all).toContain(s.label);
      }
    });
  }

  it('draws a conductive profile from the surface temperature at 0 km, and the axis covers it', async () => {
    const r = await renderColumnDiagram([sc(1350, 100, 20, 5)], defaultModel());
    const prof = r.data.conductive;
    expect(prof[0]).toMatchObject({ depth_km: 0, t_c: DEFAULT_PARAMS.T_surface });
    expect(r.data.temperatureRangeC[0]).toBeLessThanOrEqual(DEFAULT_PARAMS.T_surface);
    expect(Math.max(...prof.map((q) => q.depth_km))).toBeGreaterThan(r.data.onsets[0].depth_km);
    // the default title names the held inputs, the key explains the wet solidus near the surface
    expect(r.svg).toContain('Melting column at potential temperature 1350\u00a0°C');
    expect(r.svg).toMatch(/wet solidus rejoins the dry one/);
    expect(r.svg).not.toMatch(/degC|,\d{3}</);
  });

  it('cuts a curve exactly where it leaves the frame', () => {
    // the line t = 1000 + 10 z leaves t <= 1200 at z = 20 (analytic)
    const pts = [0, 10, 30, 40].map((z) => ({ depth_km: z, t_c: 1000 + 10 * z }));
    const parts = clipCurve(pts, 900, 1200, 100);
    expect(parts).toHaveLength(1);
    expect(parts[0][parts[0].length - 1].depth_km).toBeCloseTo(20, 12);
    expect(parts[0][parts[0].length - 1].t_c).toBeCloseTo(1200, 12);
    expect(clipCurve(pts, 1500, 1600, 100)).toEqual([]);
  });
});
