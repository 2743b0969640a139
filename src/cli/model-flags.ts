/**
 * The model options of the decompression process as command-line flags, shared by `column` and
 * `plot column`: the flags are read into a `model` section and validated by the process's own
 * validator (the same words as in a sweep file, with the flag in place of the model key).
 */
import { InputError } from '../errors.js';
import { checkRangeValue, formatRange, STEP_GPA_RANGE, type InputRange } from '../physics/ranges.js';
import { allProcesses } from '../process/registry.js';
import type { AnyProcess } from '../process/types.js';
import { CONDUCTIVE_TOLERANCE_DEFAULT, CONDUCTIVE_TOLERANCE_MIN, TOLERANCE_DEFAULT, TOLERANCE_MAX, TOLERANCE_MIN } from '../spec/limits.js';
import { ProblemList } from '../spec/problems.js';
import type { ModelSpec } from '../spec/types.js';

/** Flags that set model keys of decompression (the names they always had). */
const MODEL_FLAGS = [
  { flag: 'mode', key: 'water' },
  { flag: 'thermal', key: 'thermal' },
  { flag: 'step', key: 'step_gpa', numeric: true },
  { flag: 'tolerance', key: 'tolerance', numeric: true },
  { flag: 'deep-onset', key: 'deep_onset' },
] as const;

/** A model option as a flag: decompression's built-in ones, then those processes declare (ProcessModelOptions.cliFlags). */
interface ModelFlag {
  readonly flag: string;
  readonly key: string;
  readonly numeric?: boolean;
  /** the flag names a file: the section gets { file: value } */
  readonly file?: boolean;
}

/** Every model option, once (the first declaration of a flag wins). */
function modelFlags(): ModelFlag[] {
  const out: ModelFlag[] = [...MODEL_FLAGS];
  for (const p of allProcesses()) {
    for (const f of p.model.cliFlags ?? []) if (!out.some((x) => x.flag === f.flag)) out.push({ flag: f.flag, key: f.key, file: f.kind === 'file' });
  }
  return out;
}

/** Help texts of the model flags. */
export const MODEL_FLAG_HELP = {
  mode: 'water mode: batch or fractional (default batch)',
  thermal: 'thermal model: isentropic, conductive, auto (default auto: conductive with --upwelling, else isentropic)',
  step: `isentropic column: a fixed pressure step (${formatRange(STEP_GPA_RANGE)}) instead of error control`,
  tolerance: `relative tolerance of every output (${TOLERANCE_MIN}-${TOLERANCE_MAX}; conductive ${CONDUCTIVE_TOLERANCE_MIN}-${TOLERANCE_MAX}); default ${TOLERANCE_DEFAULT} isentropic, ${CONDUCTIVE_TOLERANCE_DEFAULT} conductive`,
  deepOnset: 'onset deeper than 8 GPa: drop (status onset_beyond_range, default) or cap (computed from 8 GPa up, marked onset_capped)',
} as const;

/** commander's key of a --flag ("deep-onset" -> "deepOnset"). */
export function optionKey(flag: string): string {
  return flag.replace(/-([a-z])/g, (_, c: string) => c.toUpperCase());
}

/** Parse a numeric option and check it against its range; InputError names option, value and range. */
export function parseRanged(option: string, raw: string, range: InputRange): number {
  const value = raw.trim() === '' ? Number.NaN : Number(raw);
  if (Number.isNaN(value)) throw new InputError(`${option}: ${JSON.stringify(raw)} is not a number; allowed ${formatRange(range)}`);
  const problem = checkRangeValue(range, value);
  if (problem !== null) throw new InputError(`${option}: ${raw} ${problem}`);
  return value;
}

/** The model section with step_gpa set and tolerance removed. */
function withFixedStep(model: ModelSpec, stepGpa: number): ModelSpec {
  const out: Record<string, unknown> = {};
  for (const [k, v] of Object.entries(model)) if (k !== 'tolerance') out[k] = v;
  out.step_gpa = stepGpa;
  return out as ModelSpec;
}

/** "model.thermal: ..." -> "--thermal: ..." for model keys that have a flag. */
export function flagOfModelProblem(message: string): string {
  for (const m of modelFlags()) {
    for (const prefix of m.file === true ? [`model.${m.key}.file`, `model.${m.key}`] : [`model.${m.key}`]) {
      if (message.startsWith(`${prefix}:`)) return `--${m.flag}${message.slice(prefix.length)}`;
    }
  }
  return message;
}

/**
 * The model section a set of flags describes, validated by the process. `--step` allows finer
 * steps than a sweep file (STEP_GPA_RANGE): checked here and set after validation.
 * @returns the section (undefined on a problem) and the problems, worded with the flags
 */
export function modelFromFlags(process: AnyProcess, o: Readonly<Record<string, unknown>>): { model: ModelSpec | undefined; problems: string[] } {
  const problems: string[] = [];
  const section: Record<string, unknown> = {};
  for (const m of modelFlags()) {
    const raw = o[optionKey(m.flag)];
    if (typeof raw !== 'string') continue;
    if (!process.model.keys.includes(m.key)) {
      problems.push(`--${m.flag}: process ${process.name} has no option ${m.key}; its options: ${process.model.keys.join(', ')}`);
      continue;
    }
    section[m.key] = m.numeric === true ? Number(raw) : m.file === true ? { file: raw } : raw;
  }
  let step: number | undefined;
  if ('step_gpa' in section) {
    delete section.step_gpa;
    if ('tolerance' in section) {
      problems.push(`--tolerance: ${String(o.tolerance)} given together with --step ${String(o.step)}; give one: --step for a fixed pressure step, or --tolerance for error-controlled steps`);
      delete section.tolerance;
    }
    try {
      step = parseRanged('--step', o.step as string, STEP_GPA_RANGE);
    } catch (err) {
      if (!(err instanceof InputError)) throw err;
      problems.push(...err.problems);
    }
  }
  const modelProblems = new ProblemList();
  const validated = process.model.validate(section, modelProblems);
  problems.push(...modelProblems.list().map(flagOfModelProblem));
  // a fixed step replaces the (default) tolerance
  const model = validated !== undefined && step !== undefined ? withFixedStep(validated, step) : validated;
  return { model, problems };
}
