/**
 * Validation of the schema metadata a results table carries (written by resultsSchema), before any
 * reader (inspect, report, fit, sensitivity, merge) relies on it: every key present and well formed,
 * the stored sweep of the right shape with a model section its process accepts, the parameters
 * complete and finite, the row range inside the sweep. Problems are collected and thrown as one
 * InputError that names the file and each key.
 */
import { z } from 'zod';
import { InputError } from '../errors.js';
import { PARAM_NAMES } from '../physics/params.js';
import { allProcesses } from '../process/registry.js';
import { ProblemList } from '../spec/problems.js';

const finite = z.number().refine((v) => Number.isFinite(v), 'not a finite number');

/** The shape of a stored, normalized sweep (src/spec/types.ts SweepSpec); extra keys are tolerated. */
const STORED_SWEEP = z.looseObject({
  name: z.string(),
  axes: z.array(
    z.looseObject({
      name: z.string(),
      values: z.array(finite),
      min: finite,
      max: finite,
      scale: z.enum(['linear', 'log']),
    }),
  ),
  fixed: z.record(z.string(), finite),
  design: z.looseObject({ kind: z.enum(['grid', 'latin-hypercube', 'sobol', 'saltelli']) }),
  model: z.looseObject({ process: z.string().optional(), params: z.record(z.string(), finite) }),
});

const PARAMS = z.record(z.string(), z.looseObject({ value: finite }));

/** "axes.0.min: not a finite number" from zod's issues, prefixed by the metadata key. */
function zodProblems(key: string, error: z.ZodError, problems: ProblemList): void {
  for (const issue of error.issues.slice(0, 5)) {
    const where = issue.path.length > 0 ? `${key} ${issue.path.join('.')}` : key;
    problems.add(where, issue.message);
  }
  if (error.issues.length > 5) problems.add(key, `... and ${error.issues.length - 5} more problems`);
}

function parseJson(key: string, text: string, problems: ProblemList): unknown {
  try {
    return JSON.parse(text) as unknown;
  } catch (err) {
    problems.add(key, `is not valid JSON (${err instanceof Error ? err.message : String(err)})`);
    return undefined;
  }
}

/** Metadata keys as resultsSchema writes them (a copy of META's names, to keep this file free of a cycle). */
export interface MetaKeys {
  readonly sweep: string;
  readonly sweepHash: string;
  readonly version: string;
  readonly params: string;
  readonly pointCount: string;
  readonly rowRange: string;
  readonly shard: string;
  readonly blockLabels: string;
  readonly process: string;
}

/**
 * Check a results table's schema metadata.
 * @param where how to name the table in messages (its file path, or "the table")
 * @throws InputError "FILE is not a meltsweep results table: ..." when keys are missing, else one
 *   "FILE: invalid results metadata: KEY: PROBLEM" per problem
 */
export function checkResultsMetadata(md: ReadonlyMap<string, string>, keys: MetaKeys, where: string): void {
  const problems = new ProblemList();
  const required = [keys.sweep, keys.sweepHash, keys.version, keys.params, keys.pointCount, keys.rowRange, keys.shard];
  const missing = required.filter((k) => md.get(k) === undefined);
  if (missing.length > 0) {
    throw new InputError(`${where} is not a meltsweep results table: schema metadata ${missing.join(', ')} ${missing.length === 1 ? 'is' : 'are'} missing`);
  }
  const get = (k: string): string => md.get(k) as string;

  const sweep = parseJson(keys.sweep, get(keys.sweep), problems);
  if (sweep !== undefined) {
    const shape = STORED_SWEEP.safeParse(sweep);
    if (!shape.success) {
      zodProblems(keys.sweep, shape.error, problems);
    } else {
      // the model section must be one its process accepts (options and parameter overrides)
      const { process: name, ...section } = shape.data.model;
      const processName = md.get(keys.process) ?? name ?? 'decompression';
      const process = allProcesses().find((p) => p.name === processName);
      if (process === undefined) {
        problems.add(keys.process, `names the unknown process ${JSON.stringify(processName)}; known processes: ${allProcesses().map((p) => p.name).join(', ')}`);
      } else {
        const modelProblems = new ProblemList();
        process.model.validate(section, modelProblems);
        for (const m of modelProblems.list()) problems.add(keys.sweep, m);
      }
    }
  }
  if (!/^[0-9a-f]{64}$/.test(get(keys.sweepHash))) problems.add(keys.sweepHash, `${JSON.stringify(get(keys.sweepHash))} is not a SHA-256 hash (64 hex digits)`);

  const params = parseJson(keys.params, get(keys.params), problems);
  if (params !== undefined) {
    const parsed = PARAMS.safeParse(params);
    if (!parsed.success) zodProblems(keys.params, parsed.error, problems);
    else {
      const absent = PARAM_NAMES.filter((n) => parsed.data[n] === undefined);
      if (absent.length > 0) problems.add(keys.params, `lacks ${absent.join(', ')}`);
    }
  }

  const count = Number(get(keys.pointCount));
  const countOk = /^\d+$/.test(get(keys.pointCount)) && Number.isSafeInteger(count);
  if (!countOk) problems.add(keys.pointCount, `${JSON.stringify(get(keys.pointCount))} is not a whole number`);
  const range = /^(\d+)-(\d+)$/.exec(get(keys.rowRange));
  if (range === null) problems.add(keys.rowRange, `${JSON.stringify(get(keys.rowRange))} is not START-END`);
  else if (!(Number(range[1]) <= Number(range[2]) && (!countOk || Number(range[2]) <= count))) {
    problems.add(keys.rowRange, `${range[1]}-${range[2]} is not a range of rows inside the sweep's ${countOk ? count : '?'} points`);
  }
  if (!/^\d+\/\d+$/.test(get(keys.shard))) problems.add(keys.shard, `${JSON.stringify(get(keys.shard))} is not K/N`);
  const labels = md.get(keys.blockLabels);
  if (labels !== undefined) {
    const parsed = parseJson(keys.blockLabels, labels, problems);
    if (parsed !== undefined && !z.array(z.string()).safeParse(parsed).success) problems.add(keys.blockLabels, 'is not a JSON list of labels');
  }
  if (problems.count > 0) {
    throw new InputError(problems.list().map((p) => `${where}: invalid results metadata: ${p}`));
  }
}
