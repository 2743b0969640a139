import { describe, expect, it } from 'vitest';
import { DEFAULT_PARAMS, lowestGap, ParamError, resolveParams } from '../../src/physics/params.js';
import { MODEL_MAX_P_GPA } from '../../src/physics/types.js';

function problems(overrides: Parameters<typeof resolveParams>[0]): string[] {
  try {
    resolveParams(overrides);
  } catch (err) {
    if (err instanceof ParamError) return [...err.problems];
    throw err;
  }
  return [];
}

describe('parameter relations over the whole pressure range (0 to 8 GPa)', () => {
  it('the published set passes: the curves stay apart at every pressure', () => {
    expect(problems({})).toEqual([]);
    // the published quadratics (Katz et al. 2003, Table 2, from memory, docs/physics.md): lherzolite
    // liquidus minus solidus narrows with depth to 389.3 - 52.9 P + 1.9 P^2 -> 104.5 degC at 8 GPa
    expect(lowestGap(DEFAULT_PARAMS, 'B', 'A', MODEL_MAX_P_GPA).gapC).toBeCloseTo(389.3 - 52.9 * 8 + 1.9 * 64, 9);
  });

  it('an override that lets the lherzolite liquidus fall below the solidus at depth is refused, naming the parameters and the pressure', () => {
    // equal at P = 0 would already fail; here they cross only at depth (B2 much smaller than A2)
    const msgs = problems({ B2: 20 });
    expect(msgs).toHaveLength(1);
    expect(msgs[0]).toMatch(/^params\.B1, B2, B3 with params\.A1, A2, A3: the lherzolite liquidus .* is not above the solidus .* at P = 8\.00 GPa \(\d+\.\d vs \d+\.\d degC\); it must stay above it at every pressure the model covers, 0 to 8 GPa$/);
  });

  it('a crossing inside the range is found at the vertex of the difference', () => {
    const msgs = problems({ B1: 1300, B2: 44.9, B3: 0 });
    // gap = 214.3 - 88 P + 5.1 P^2: vertex at 88 / 10.2 = 8.63 GPa (outside), so the end at 8 GPa decides
    expect(msgs.some((m) => m.includes('at P = 8.00 GPa'))).toBe(true);
    const inside = lowestGap({ ...DEFAULT_PARAMS, B1: 1200, B2: 80, B3: 6.9 }, 'B', 'A', 8);
    // gap = 114.3 - 52.9 P + 12 P^2: vertex 52.9 / 24 = 2.204 GPa, gap there 114.3 - 52.9^2 / 48 = 56.0
    expect(inside.pGpa).toBeCloseTo(52.9 / 24, 9);
    expect(inside.gapC).toBeCloseTo(114.3 - (52.9 * 52.9) / 48, 9);
  });

  it('liquidus below the lherzolite liquidus at depth, and a cpx coefficient that turns negative, are refused', () => {
    expect(problems({ C2: 10 }).some((m) => m.startsWith('params.C1, C2, C3 with params.B1, B2, B3: the liquidus'))).toBe(true);
    const r = problems({ r2: -0.1 });
    expect(r).toEqual(['params.r1, r2: the cpx reaction coefficient r1 + r2 P is -0.300 at 8 GPa; it must be positive at every pressure the model covers, 0 to 8 GPa']);
  });
});
