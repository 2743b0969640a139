/** Helpers of the picture tests: XML well-formedness, counting marks in vega SVG, small sweeps. */
import path from 'node:path';
import { XMLValidator } from 'fast-xml-parser';
import { runSweep } from '../../src/run/run-sweep.js';
import { validateSweep } from '../../src/spec/index.js';

/** null when `text` is well-formed XML, else the parser's message with line and column. */
export function xmlProblem(text: string): string | null {
  const r = XMLValidator.validate(text);
  return r === true ? null : `${r.err.code}: ${r.err.msg} (line ${r.err.line}, col ${r.err.col})`;
}

/** Number of mark groups of a named Vega-Lite layer in an SVG (one group per line series). */
export function markGroups(svg: string, name: string): number {
  return svg.split(`role-mark ${name}_marks"`).length - 1;
}

/** Values of every id attribute in a document. */
export function ids(text: string): string[] {
  return [...text.matchAll(/\sid="([^"]+)"/g)].map((m) => m[1]);
}

/** Axis titles (aria labels of vega axes) in an SVG. */
export function axisTitles(svg: string): string[] {
  return [...svg.matchAll(/aria-label="[XY]-axis titled '([^']*)'/g)].map((m) => m[1]);
}

/** A 45-point isentropic grid (Tp x water x lid) written to dir/name. */
export async function gridSweepFile(dir: string, name = 'grid.arrow'): Promise<string> {
  const spec = validateSweep({
    name: 'ridge segment R-7 test grid',
    axes: { tp_c: { from: 1250, to: 1450, count: 5 }, water_ppm: { values: [0, 100, 300] }, lid_km: { values: [0, 10, 20] } },
    fixed: { upwelling_mm_yr: 30 },
    design: { kind: 'grid' },
    model: { thermal: 'isentropic' },
  });
  const out = path.join(dir, name);
  await runSweep({ spec, outPath: out, workers: 2 });
  return out;
}

/** A 32-row saltelli sweep (base 8, two inputs) written to dir/name. */
export async function saltelliSweepFile(dir: string, name = 'saltelli.arrow'): Promise<string> {
  const spec = validateSweep({
    name: 'plume flank P-3 test saltelli',
    axes: { tp_c: { from: 1300, to: 1500 }, water_ppm: { from: 0, to: 400 } },
    fixed: { lid_km: 10 },
    design: { kind: 'saltelli', base: 8 },
    model: { thermal: 'isentropic' },
  });
  const out = path.join(dir, name);
  await runSweep({ spec, outPath: out, workers: 2 });
  return out;
}
