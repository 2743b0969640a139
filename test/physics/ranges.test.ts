import { describe, expect, it } from 'vitest';
import { INPUT_FIELDS, INPUT_NAMES } from '../../src/physics/fields.js';
import { checkInputValue, formatInputRange, INPUT_RANGES } from '../../src/physics/ranges.js';

describe('input ranges', () => {
  it('cover every scenario input with the unit of the field registry', () => {
    expect(Object.keys(INPUT_RANGES).sort()).toEqual([...INPUT_NAMES].sort());
    for (const f of INPUT_FIELDS) expect(INPUT_RANGES[f.name].unit).toBe(f.unit);
  });

  it('are the ranges of the issue: Tp 1100-1800 degC, water 0-50000 ppm, lid 0-200 km, upwelling (0, 10000] mm/yr', () => {
    expect(INPUT_RANGES.tp_c).toMatchObject({ min: 1100, max: 1800, minExclusive: false });
    expect(INPUT_RANGES.water_ppm).toMatchObject({ min: 0, max: 50000, minExclusive: false });
    expect(INPUT_RANGES.lid_km).toMatchObject({ min: 0, max: 200, minExclusive: false });
    expect(INPUT_RANGES.upwelling_mm_yr).toMatchObject({ min: 0, max: 10000, minExclusive: true });
  });

  it('word a problem the same way everywhere', () => {
    expect(checkInputValue('tp_c', 1350)).toBeNull();
    expect(checkInputValue('tp_c', 1800)).toBeNull();
    expect(checkInputValue('tp_c', 1900)).toBe("is above the model's range 1100-1800 degC");
    expect(checkInputValue('water_ppm', -1)).toBe("is below the model's range 0-50000 ppm");
    expect(checkInputValue('upwelling_mm_yr', 0)).toBe("is outside the model's range 0-10000 mm/yr (0 excluded)");
    expect(checkInputValue('lid_km', Number.NaN)).toMatch(/not a number/);
    expect(formatInputRange('lid_km')).toBe('0-200 km');
  });
});
