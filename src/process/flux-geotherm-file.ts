/**
 * The geotherm table of a flux sweep (`model.geotherm: { file: wedge.csv }`): read once at
 * validation, relative to the sweep file's folder, and carried in the normalized spec with the
 * file's SHA-256 (so the run metadata names the exact table and workers need no file access).
 *
 * Format: CSV with a header naming a depth column `depth_km` or a pressure column `p_gpa`, and a
 * temperature column `t_c`; other columns are ignored; blank lines and lines starting with `#`
 * are skipped. The first row is at the surface (0), depths or pressures rise strictly.
 */
import { createHash } from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';
import type { ProblemList } from '../spec/problems.js';

/** A geotherm table as stored in a normalized flux model section. */
export interface GeothermTableSpec {
  /** the file as written in the sweep file */
  readonly file: string;
  /** SHA-256 (hex) of the file's bytes */
  readonly sha256: string;
  /** which column gave the positions: depth (km) or pressure (GPa) */
  readonly axis: 'depth_km' | 'p_gpa';
  /** positions in the unit of `axis`, ascending from 0 */
  readonly at: readonly number[];
  /** temperatures, degC */
  readonly t_c: readonly number[];
}

/** Most rows a table may have. */
export const MAX_GEOTHERM_ROWS = 100000;
/** Plausible temperatures of a geotherm, degC (catches kelvin given as degC). */
const T_RANGE_C = { min: -100, max: 2500 };
/** Deepest position allowed by axis. */
const AXIS_MAX: Readonly<Record<GeothermTableSpec['axis'], number>> = { depth_km: 1000, p_gpa: 35 };

/** Parse the text of a geotherm table; problems are recorded under `where` (e.g. "model.geotherm.file"). */
export function parseGeothermCsv(text: string, label: string, where: string, problems: ProblemList): Omit<GeothermTableSpec, 'file' | 'sha256'> | undefined {
  const lines = text.replace(/^\uFEFF/, '').split(/\r?\n/);
  let header: string[] | null = null;
  let headerLine = 0;
  const at: number[] = [];
  const tC: number[] = [];
  let iAt = -1;
  let iT = -1;
  let axis: GeothermTableSpec['axis'] = 'depth_km';
  const before = problems.count;
  for (let n = 0; n < lines.length; n++) {
    const line = lines[n].trim();
    if (line === '' || line.startsWith('#')) continue;
    const cells = line.split(',').map((c) => c.trim());
    if (header === null) {
      header = cells;
      headerLine = n + 1;
      const hasDepth = cells.indexOf('depth_km');
      const hasP = cells.indexOf('p_gpa');
      iT = cells.indexOf('t_c');
      if (hasDepth >= 0 && hasP >= 0) {
        problems.add(where, `${label} line ${headerLine}: the header has both depth_km and p_gpa; give one of them`);
        return undefined;
      }
      if ((hasDepth < 0 && hasP < 0) || iT < 0) {
        problems.add(where, `${label} line ${headerLine}: the header ${JSON.stringify(line)} needs a column depth_km or p_gpa, and t_c`);
        return undefined;
      }
      iAt = hasDepth >= 0 ? hasDepth : hasP;
      axis = hasDepth >= 0 ? 'depth_km' : 'p_gpa';
      continue;
    }
    const a = Number(cells[iAt] ?? '');
    const t = Number(cells[iT] ?? '');
    if (cells[iAt] === undefined || cells[iAt] === '' || !Number.isFinite(a)) {
      problems.add(where, `${label} line ${n + 1}: ${axis} ${JSON.stringify(cells[iAt] ?? '')} is not a number`);
      continue;
    }
    if (cells[iT] === undefined || cells[iT] === '' || !Number.isFinite(t)) {
      problems.add(where, `${label} line ${n + 1}: t_c ${JSON.stringify(cells[iT] ?? '')} is not a number`);
      continue;
    }
    if (t < T_RANGE_C.min || t > T_RANGE_C.max) {
      problems.add(where, `${label} line ${n + 1}: t_c ${t} is outside the plausible range ${T_RANGE_C.min} to ${T_RANGE_C.max} degC`);
      continue;
    }
    if (a < 0 || a > AXIS_MAX[axis]) {
      problems.add(where, `${label} line ${n + 1}: ${axis} ${a} is outside the allowed range 0 to ${AXIS_MAX[axis]}`);
      continue;
    }
    if (at.length > 0 && !(a > at[at.length - 1])) {
      problems.add(where, `${label} line ${n + 1}: ${axis} ${a} does not rise above the row before (${at[at.length - 1]}); rows go from the surface down`);
      continue;
    }
    at.push(a);
    tC.push(t);
    if (at.length > MAX_GEOTHERM_ROWS) {
      problems.add(where, `${label}: more than ${MAX_GEOTHERM_ROWS} rows`);
      return undefined;
    }
  }
  if (problems.count !== before) return undefined;
  if (header === null || at.length < 2) {
    problems.add(where, `${label}: ${header === null ? 'no header' : `${at.length} data row${at.length === 1 ? '' : 's'}`}; a geotherm table needs a header (depth_km or p_gpa, and t_c) and at least 2 rows`);
    return undefined;
  }
  if (at[0] !== 0) {
    problems.add(where, `${label}: the first row is at ${axis} ${at[0]}; the table must start at the surface (${axis} 0)`);
    return undefined;
  }
  return { axis, at, t_c: tC };
}

/**
 * Read a geotherm table file (relative paths from baseDir) and return its stored form, or
 * undefined with the problems recorded under `where`.
 */
export function readGeothermFile(file: string, baseDir: string, where: string, problems: ProblemList): GeothermTableSpec | undefined {
  const full = path.resolve(baseDir, file);
  let bytes: Buffer;
  try {
    bytes = fs.readFileSync(full);
  } catch (err) {
    const code = (err as NodeJS.ErrnoException).code;
    const why = code === 'ENOENT' ? 'no such file' : code === 'EISDIR' ? 'it is a directory' : code === 'EACCES' ? 'permission denied' : String((err as Error).message);
    problems.add(where, `cannot read the geotherm table ${JSON.stringify(file)} (${why}; looked for ${full})`);
    return undefined;
  }
  const parsed = parseGeothermCsv(bytes.toString('utf8'), file, where, problems);
  if (parsed === undefined) return undefined;
  return { file, sha256: createHash('sha256').update(bytes).digest('hex'), ...parsed };
}
