import { afterAll, describe, expect, it } from 'vitest';
import fs from 'node:fs';
import path from 'node:path';
import { resolveParams } from '../../src/physics/params.js';
import type { FluxRuntimeModel } from '../../src/process/flux.js';
import { renderFigure } from '../../src/report/figure.js';
import { FLUX_MARKS, fluxDiagramData, fluxDiagramLayout } from '../../src/report/flux-diagram.js';
import { runCliSync, tmpDir } from '../helpers.js';
import { pointsOutsideFrame, xmlProblem } from './helpers.js';

const dir = tmpDir('flux-diagram');
afterAll(() => fs.rmSync(dir, { recursive: true, force: true }));

const model = (heat: 'fixed' | 'balanced'): FluxRuntimeModel => ({ heat, params: resolveParams({}), table: null, tableFile: null, withProfile: false });
const sc = (tp_c: number, water_ppm: number, lid_km: number, slab_depth_km: number) => ({ inputs: { tp_c, water_ppm, lid_km, slab_depth_km } });

describe('flux diagram', () => {
  it('bands only where the geotherm is above the wet solidus; dots at the deepest and shallowest melting', () => {
    const data = fluxDiagramData([sc(1300, 500, 70, 110), sc(1300, 20, 70, 110), sc(1380, 3000, 40, 150)], model('balanced'));
    expect(data.results.map((r) => r.status)).toEqual(['ok', 'no_melt', 'ok']);
    expect(data.labels).toEqual(['Tp 1300 °C, water 500 ppm, plate 70 km, slab 110 km', 'Tp 1300 °C, water 20 ppm, plate 70 km, slab 110 km', 'Tp 1380 °C, water 3000 ppm, plate 40 km, slab 150 km']);
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

  it('plot column --process flux writes the diagram; options of another process are errors naming it', () => {
    const out = path.join(dir, 'wedge.svg');
    const r = runCliSync(['plot', 'column', '--process', 'flux', '--tp', '1300', '--water', '200,2000', '--lid', '70', '--slab-depth', '110', '-o', out]);
    expect(r.stderr).toBe('');
    expect(r.status).toBe(0);
    expect(r.stdout).toContain(`flux diagram: ${out} (2 scenarios)`);
    const svg = fs.readFileSync(out, 'utf8');
    expect(xmlProblem(svg)).toBeNull();
    expect(svg).not.toContain('<text');
    const bad = runCliSync(['plot', 'column', '--process', 'flux', '--tp', '1300', '--water', '200', '--upwelling', '3', '--heat', 'warm', '-o', path.join(dir, 'b.svg')]);
    expect(bad.status).toBe(2);
    expect(bad.stderr).toContain('--upwelling: upwelling_mm_yr is an input of process decompression, not of process flux');
    expect(bad.stderr).toContain('--heat: "warm" is not a heat mode; allowed: balanced, fixed');
    expect(bad.stderr).toContain('--lid: missing; process flux needs lid_km');
    const other = runCliSync(['plot', 'column', '--tp', '1300', '--slab-depth', '100', '-o', path.join(dir, 'c.svg')]);
    expect(other.status).toBe(2);
    expect(other.stderr).toContain('--slab-depth: slab_depth_km is an input of process flux, not of process decompression; give --process flux');
  });
});
