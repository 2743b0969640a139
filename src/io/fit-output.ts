/**
 * What a fit writes: `RESULTS.fit.arrow` (scenario_id, log_likelihood, weight; units, observations
 * and the fit's counts in the metadata) and the refined sweep file for `--refine`.
 */
import * as arrow from 'apache-arrow';
import fs from 'node:fs';
import path from 'node:path';
import { stringify } from 'yaml';
import { InputError } from '../errors.js';
import { refineAxes, refinedSweepData, weightsOf, type InputLimits, type RefinedAxis } from '../fit/index.js';
import { floatData, int64Data } from './arrow-batch.js';
import { IpcFileSink } from './ipc-file.js';
import { writeFileAtomic } from './ipc-file.js';
import { INPUT_RANGES } from '../physics/ranges.js';
import { validateSweep } from '../spec/validate.js';
import type { SweepSpec } from '../spec/types.js';
import { TOOL_VERSION } from '../version.js';
import type { FitFileResult } from './fit-file.js';

/** Rows per record batch of the fit table. */
const FIT_BATCH_ROWS = 65_536;

/**
 * Refuse, before any work, to replace an existing file without force, or to write into a folder
 * that does not exist.
 * @param option the option that names the file, for the message
 */
export function checkFitOutput(option: string, file: string, force: boolean): void {
  const dir = path.dirname(path.resolve(file));
  if (!fs.existsSync(dir)) throw new InputError(`${option}: folder ${dir} does not exist`);
  if (fs.existsSync(file) && !force) throw new InputError(`${option}: ${file} already exists; use --force to replace it`);
}

function field(name: string, type: arrow.DataType, nullable: boolean, unit: string, description: string): arrow.Field {
  return new arrow.Field(name, type, nullable, new Map([['unit', unit], ['description', description]]));
}

/** The fit table's schema, with the observations and the fit's counts in its metadata. */
function fitTableSchema(r: FitFileResult): arrow.Schema {
  const f = r.fit;
  const units = f.observations.map((o) => r.units[o.output] ?? '');
  const md = new Map<string, string>([
    ['meltsweep.table', 'fit'],
    ['meltsweep.version', TOOL_VERSION],
    ['meltsweep.source', path.basename(r.file)],
    ['meltsweep.sweep_hash', r.meta.sweepHash],
    [
      'meltsweep.observations',
      JSON.stringify(f.observations.map((o, k) => ({ output: o.output, unit: units[k], value: o.value, sd: o.sd, discrepancy_sd: o.discrepancySd ?? 0, total_sd: o.totalSd }))),
    ],
    ['meltsweep.prior', f.priorText],
    ['meltsweep.likelihood', 'independent Gaussian errors: ln L = sum over observations of -ln(sd) - ln(2 pi)/2 - ((model - value)/sd)^2/2, sd = sqrt(sd_obs^2 + discrepancy^2)'],
    ['meltsweep.rows_used', String(f.rowsUsed)],
    ['meltsweep.rows_left_out', JSON.stringify(f.rowsLeftOut)],
    ['meltsweep.ess', String(f.ess)],
  ]);
  return new arrow.Schema(
    [
      field('scenario_id', new arrow.Int64(), false, '', 'index of the scenario in the sweep (as in the results table)'),
      field('log_likelihood', new arrow.Float64(), true, '', 'natural log of the Gaussian likelihood of the observations given the row (constants included; null for rows left out)'),
      field('weight', new arrow.Float64(), true, 'fraction', 'posterior weight of the row (sums to 1 over the rows used; null for rows left out)'),
    ],
    md,
  );
}

/** Write the fit table (Arrow IPC file, batch by batch, published atomically). */
export async function writeFitTable(r: FitFileResult, outPath: string): Promise<void> {
  const schema = fitTableSchema(r);
  const sink = new IpcFileSink(outPath, `${outPath}.tmp-${process.pid}`, schema);
  try {
    const { ids, firstId, logLikelihood, logNormaliser } = r.fit;
    const rows = logLikelihood.length;
    const run = new Float64Array(Math.min(rows, FIT_BATCH_ROWS));
    const weights = new Float64Array(Math.min(rows, FIT_BATCH_ROWS));
    for (let s = 0; s < rows; s += FIT_BATCH_ROWS) {
      const e = Math.min(rows, s + FIT_BATCH_ROWS);
      if (ids === null) for (let i = s; i < e; i++) run[i - s] = firstId + i;
      const idData = int64Data(ids === null ? run.subarray(0, e - s) : ids.subarray(s, e));
      const ll = logLikelihood.subarray(s, e);
      const children = [idData, floatData(ll), floatData(weightsOf(ll, logNormaliser, weights.subarray(0, e - s)))];
      await sink.write(new arrow.RecordBatch(schema, arrow.makeData({ type: new arrow.Struct(schema.fields), length: e - s, nullCount: 0, children })));
    }
    await sink.publish();
  } catch (err) {
    await sink.abort();
    throw err;
  }
}

/** Allowed range of every input the sweep format knows (the refined sweep stays inside). */
function inputLimits(): Record<string, InputLimits> {
  return Object.fromEntries(Object.entries(INPUT_RANGES).map(([name, r]) => [name, { min: r.min, max: r.max }]));
}

/** The refined sweep of a fit: validated by the sweep validator, as YAML text with a header. */
export function refinedSweep(r: FitFileResult): { readonly spec: SweepSpec; readonly yaml: string; readonly axes: readonly RefinedAxis[] } {
  const axes = refineAxes(r.prior, r.fit, inputLimits());
  const data = refinedSweepData(r.spec as unknown as Record<string, unknown>, axes);
  const spec = validateSweep(data);
  const obs = r.fit.observations.map((o) => `${o.output} = ${o.value} +- ${o.sd}${o.discrepancySd ? ` (discrepancy ${o.discrepancySd})` : ''}`).join(', ');
  const header = [
    `# Refined sweep written by meltsweep fit from ${path.basename(r.file)} (sweep "${r.spec.name}").`,
    `# Observed: ${obs}. Effective sample size of that fit: ${r.fit.ess.toFixed(1)} of ${r.fit.rowsUsed} rows.`,
    '# Each swept input covers the posterior 0.5-99.5 % range with a margin, same design.',
    ...axes.filter((a) => a.note !== null).map((a) => `# ${a.name}: ${a.note}.`),
    `# Next: meltsweep run THIS_FILE -o NEXT.arrow, then meltsweep fit NEXT.arrow with the same observations.`,
  ];
  return { spec, yaml: `${header.join('\n')}\n${stringify(data, { lineWidth: 0 })}`, axes };
}

/** Write the refined sweep file (atomically). */
export function writeRefinedSweep(r: FitFileResult, outPath: string): { readonly spec: SweepSpec; readonly axes: readonly RefinedAxis[] } {
  const refined = refinedSweep(r);
  writeFileAtomic(outPath, refined.yaml);
  return refined;
}
