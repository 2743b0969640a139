/**
 * `meltsweep column`: compute one melting column and print its result (readable table or JSON),
 * optionally writing the profile along the column as CSV. Parse, call, print: the physics is
 * meltColumn, the ranges come from INPUT_RANGES, the units from the field registry.
 */
import type { Command } from 'commander';
import fs from 'node:fs';
import { InputError, RunError, EXIT_RUN_FAILED } from '../../errors.js';
import { defaultModel, meltColumn, resolveThermalModel } from '../../physics/column.js';
import { PROFILE_FIELDS, REASON_FIELD, RESULT_NUMERIC_FIELDS, STATUS_FIELD } from '../../physics/fields.js';
import { checkRangeValue, formatRange, INPUT_RANGES, STEP_GPA_RANGE, type InputRange } from '../../physics/ranges.js';
import type { ColumnResult, ModelOptions, Scenario, ThermalModel, WaterMode } from '../../physics/types.js';

const WATER_MODES: readonly WaterMode[] = ['batch', 'fractional'];
const THERMAL_CHOICES: readonly (ThermalModel | 'auto')[] = ['isentropic', 'conductive', 'auto'];

interface ColumnOptions {
  tp: string;
  water: string;
  lid: string;
  upwelling?: string;
  mode: string;
  thermal: string;
  step: string;
  json?: boolean;
  profile?: string;
}

/** Parse a numeric option and check it against its range; InputError names option, value and range. */
function parseRanged(option: string, raw: string, range: InputRange): number {
  const value = raw.trim() === '' ? Number.NaN : Number(raw);
  if (Number.isNaN(value)) throw new InputError(`${option}: ${JSON.stringify(raw)} is not a number; allowed ${formatRange(range)}`);
  const problem = checkRangeValue(range, value);
  if (problem !== null) throw new InputError(`${option}: ${raw} ${problem}`);
  return value;
}

function parseChoice<T extends string>(option: string, raw: string, choices: readonly T[]): T {
  if ((choices as readonly string[]).includes(raw)) return raw as T;
  throw new InputError(`${option}: ${JSON.stringify(raw)} is not allowed; choose one of ${choices.join(', ')}`);
}

/** The scenario and model a set of column options describes. @throws InputError */
export function columnInputs(o: ColumnOptions): { scenario: Scenario; model: ModelOptions } {
  const problems: string[] = [];
  const attempt = <T>(fn: () => T, fallback: T): T => {
    try {
      return fn();
    } catch (err) {
      if (err instanceof InputError) problems.push(...err.problems);
      else throw err;
      return fallback;
    }
  };
  const tp = attempt(() => parseRanged('--tp', o.tp, INPUT_RANGES.tp_c), Number.NaN);
  const water = attempt(() => parseRanged('--water', o.water, INPUT_RANGES.water_ppm), 0);
  const lid = attempt(() => parseRanged('--lid', o.lid, INPUT_RANGES.lid_km), 0);
  const upwelling =
    o.upwelling === undefined ? Number.NaN : attempt(() => parseRanged('--upwelling', o.upwelling as string, INPUT_RANGES.upwelling_mm_yr), Number.NaN);
  const mode = attempt(() => parseChoice('--mode', o.mode, WATER_MODES), 'batch' as WaterMode);
  const thermal = attempt(() => parseChoice('--thermal', o.thermal, THERMAL_CHOICES), 'auto' as ThermalModel | 'auto');
  const step = attempt(() => parseRanged('--step', o.step, STEP_GPA_RANGE), 0.05);
  if (thermal === 'conductive' && o.upwelling === undefined) problems.push('--thermal conductive needs an upwelling rate: give --upwelling <mm/yr>');
  if (problems.length > 0) throw new InputError(problems);
  return {
    scenario: { tp_c: tp, water_ppm: water, lid_km: lid, upwelling_mm_yr: upwelling },
    model: defaultModel({ thermal, water: mode, stepGpa: step, withProfile: o.profile !== undefined }),
  };
}

/** The result as one flat object: status, reason, then every numeric field of the registry. */
export function resultRecord(r: ColumnResult): Record<string, string | number | null> {
  const out: Record<string, string | number | null> = { [STATUS_FIELD.name]: r.status, [REASON_FIELD.name]: r.reason };
  for (const f of RESULT_NUMERIC_FIELDS) out[f.name] = r[f.name];
  return out;
}

function formatNumber(v: number | null): string {
  if (v === null) return '-';
  if (v === 0) return '0';
  const a = Math.abs(v);
  return a >= 1e-3 && a < 1e6 ? String(Number(v.toPrecision(6))) : v.toExponential(4);
}

/** A short readable table: name, value, unit (units from the field registry). */
export function resultTable(r: ColumnResult): string {
  const rows: [string, string, string][] = [[STATUS_FIELD.name, r.status, '']];
  if (r.reason !== null) rows.push([REASON_FIELD.name, r.reason, '']);
  for (const f of RESULT_NUMERIC_FIELDS) rows.push([f.name, formatNumber(r[f.name]), r[f.name] === null ? '' : f.unit]);
  const w0 = Math.max(...rows.map((x) => x[0].length));
  const w1 = Math.max(...rows.filter((x) => x[0] !== REASON_FIELD.name).map((x) => x[1].length));
  return rows.map(([a, b, c]) => `${a.padEnd(w0)}  ${a === REASON_FIELD.name ? b : b.padStart(w1)}${c ? `  ${c}` : ''}`.trimEnd()).join('\n');
}

/** The profile as CSV: header of PROFILE_FIELDS names (units in the names), one row per point. */
export function profileCsv(r: ColumnResult): string {
  const lines = [PROFILE_FIELDS.map((f) => f.name).join(',')];
  const prof = r.profile;
  if (prof !== undefined) {
    const n = prof.p_gpa.length;
    for (let i = 0; i < n; i++) lines.push(PROFILE_FIELDS.map((f) => String(prof[f.name][i])).join(','));
  }
  return `${lines.join('\n')}\n`;
}

export function registerColumn(program: Command): void {
  program
    .command('column')
    .description('compute one melting column and print its result (exit 1 when the column failed)')
    .requiredOption('--tp <degC>', `mantle potential temperature (${formatRange(INPUT_RANGES.tp_c)})`)
    .option('--water <ppm>', `bulk water of the source (${formatRange(INPUT_RANGES.water_ppm)})`, '0')
    .option('--lid <km>', `lid thickness; melting stops at its base (${formatRange(INPUT_RANGES.lid_km)})`, '0')
    .option('--upwelling <mm/yr>', `solid upwelling rate (${formatRange(INPUT_RANGES.upwelling_mm_yr)}); gives the melt flux, and selects the conductive model under --thermal auto`)
    .option('--mode <mode>', `water mode: ${WATER_MODES.join(' or ')}`, 'batch')
    .option('--thermal <model>', `thermal model: ${THERMAL_CHOICES.join(', ')} (auto: conductive with --upwelling, else isentropic)`, 'auto')
    .option('--step <GPa>', `isentropic pressure step (${formatRange(STEP_GPA_RANGE)})`, '0.05')
    .option('--json', 'print one JSON object: status, reason and every numeric result field (null where not applicable)')
    .option('--profile <file.csv>', 'write the profile along the melting column to a CSV file')
    .action((o: ColumnOptions) => {
      const { scenario, model } = columnInputs(o);
      const result = meltColumn(scenario, model);
      if (o.profile !== undefined) {
        try {
          fs.writeFileSync(o.profile, profileCsv(result));
        } catch (err) {
          throw new RunError(`cannot write the profile to ${o.profile}: ${err instanceof Error ? err.message : String(err)}`);
        }
      }
      if (o.json) {
        process.stdout.write(`${JSON.stringify(resultRecord(result))}\n`);
      } else {
        const thermal = resolveThermalModel(scenario, model);
        const how = model.thermal === 'auto' ? ` (auto: ${Number.isFinite(scenario.upwelling_mm_yr) ? 'an upwelling rate is given' : 'no upwelling rate'})` : '';
        process.stdout.write(`model: ${thermal}${how}, water ${model.water}\n${resultTable(result)}\n`);
      }
      if (result.status === 'failed') process.exitCode = EXIT_RUN_FAILED;
    });
}
