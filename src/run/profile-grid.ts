/**
 * The fixed pressure grid of the profile table (`run --profiles FROM:TO:STEP`, GPa).
 */
import { InputError } from '../errors.js';
import { MODEL_MAX_P_GPA } from '../physics/types.js';

/** A pressure grid from fromGpa to toGpa (inclusive when a whole number of steps away), GPa. */
export interface ProfileGrid {
  readonly fromGpa: number;
  readonly toGpa: number;
  readonly stepGpa: number;
}

/** Largest number of grid points (the profile table has points x scenarios rows). */
export const MAX_PROFILE_POINTS = 100_001;

/** Number of points of a grid: from, from + step, ... up to to (a remainder below 1e-9 step counts as reached). */
function profileGridCount(grid: ProfileGrid): number {
  return Math.floor((grid.toGpa - grid.fromGpa) / grid.stepGpa + 1e-9) + 1;
}

/** The grid pressures, ascending, rounded to 1e-12 GPa so decimal steps give decimal values. */
export function profileGridPressures(grid: ProfileGrid): Float64Array {
  const n = profileGridCount(grid);
  const out = new Float64Array(n);
  for (let i = 0; i < n; i++) out[i] = Math.round((grid.fromGpa + i * grid.stepGpa) * 1e12) / 1e12;
  return out;
}

/** The grid as written in metadata and manifests: "from:to:step" (GPa). */
export function formatProfileGrid(grid: ProfileGrid): string {
  return `${grid.fromGpa}:${grid.toGpa}:${grid.stepGpa}`;
}

/**
 * Parse `FROM:TO:STEP` in GPa, e.g. `0:8:0.05`.
 * @throws InputError naming the option, the value and what is allowed
 */
export function parseProfileGrid(text: string): ProfileGrid {
  const parts = text.split(':').map((s) => s.trim());
  const nums = parts.map((s) => (s === '' ? Number.NaN : Number(s)));
  const bad = (why: string): InputError => new InputError(`--profiles: ${JSON.stringify(text)} ${why}; give FROM:TO:STEP in GPa, e.g. 0:8:0.05`);
  if (parts.length !== 3 || nums.some((n) => !Number.isFinite(n))) throw bad('is not three numbers');
  const [fromGpa, toGpa, stepGpa] = nums;
  if (fromGpa < 0 || toGpa > MODEL_MAX_P_GPA) throw bad(`leaves the model range 0 to ${MODEL_MAX_P_GPA} GPa`);
  if (!(toGpa > fromGpa)) throw bad('must go from a lower to a higher pressure');
  if (!(stepGpa > 0)) throw bad('needs a positive step');
  const grid = { fromGpa, toGpa, stepGpa };
  if (profileGridCount(grid) > MAX_PROFILE_POINTS) throw bad(`has ${profileGridCount(grid)} points; at most ${MAX_PROFILE_POINTS} are allowed`);
  return grid;
}
