import { afterAll, describe, expect, it } from 'vitest';
import fs from 'node:fs';
import { resolveParams } from '../../src/physics/params.js';
import type { FluxRuntimeModel } from '../../src/process/flux.js';
import { renderFigure } from '../../src/report/figure.js';
import { FLUX_MARKS, fluxDiagramData, fluxDiagramLayout } from '../../src/report/flux-diagram.js';
import { tmpDir } from '../helpers.js';
import { pointsOutsideFrame, xmlProblem } from './helpers.js';

const dir = tmpDir('flux-diagram');
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));

const model = (heat: 'fixed' | 'balanced'): FluxRuntimeModel => ({ heat, params: resolveParams({}), table: null, tableFile: null, withProfile: false });
const sc = (tp_c: number, water_ppm: number, lid_km: number, slab_depth_km: number) => ({ inputs: { tp_c, water_ppm, lid_km, slab_depth_km } });

describe('flux diagram', () => {
  it('bands only where the geotherm is above the wet solidus; dots at the deepest and shallowest melting', () => {
    const data = fluxDiagramData([sc(1300, 500, 70, 110), sc(1300, 20, 70, 110), sc(1380, 3000, 40, 150)], model('balanced'));
    expect(data.results.map((r) => r.status)).toEqual(['ok', 'no_melt', 'ok']);
    expect(data.labels).toEqual(['Tp 1300\u00a0°C, water 500\u00a0ppm, plate 70\u00a0km, slab 110\u00a0km', 'Tp 1300\u00a0°C, water 20\u00a0ppm, plate 70\u00a0km, slab 110\u00a0km', 'Tp 1380\u00a0°C, water 3000\u00a0ppm, plate 40\u00a0km, slab 150\u00a0km']);
    for (const b of data.rows.band) expect((b.t_hi as number) - (b.t_lo as number)).toBeGreaterThanOrEqual(-1e-9);
    expect(data.rows.band.some((b) => b.scenario === data.labels[1])).toBe(false);
    const ends = data.rows.ends.filter((e) => e.scenario === data.labels[0]);
    expect(ends.map((e) => e.depth_km)).toEqual([data.results[0].values.onset_depth_km, data.results[0].values.top_depth_km]);
    // heat balanced: the rock temperature while melting lies below the geotherm
    expect(data.rows.rock.length).toBeGreaterThan(0);
    expect(fluxDiagramData([sc(1300, 500, 70, 110)], model('fixed')).rows.rock).toEqual([]);
  });

  it('keeps every mark inside its panel, natural and 85 mm wide', async () => {
    const data = fluxDiagramData([sc(1300, 500, 70, 110), sc(1300, 20, 70, 110), sc(1420, 20000, 30, 250), sc(1350, 2000, 90, 60)], model('balanced'));
    for (const target of [undefined, 321]) {
      const r = await renderFigure(fluxDiagramLayout(data), target);
      expect(xmlProblem(r.svg)).toBeNull();
      expect(r.warnings).toEqual([]);
      expect(pointsOutsideFrame(r.svg, [FLUX_MARKS.solidus, FLUX_MARKS.geotherm, FLUX_MARKS.wetSolidus, FLUX_MARKS.rock, FLUX_MARKS.melt, FLUX_MARKS.ends], 2)).toEqual([]);
    }
  });

});
