/**
 * Sweep file (parsed YAML/JSON data) -> validated, normalized, frozen SweepSpec.
 * Every problem is collected (one message each, naming the path, the value found and what is
 * allowed) and all are thrown together as one InputError.
 */
import { InputError } from '../errors.js';
import { countPoints } from './count.js';
import { checkRangeValue, formatRange } from '../physics/ranges.js';
import { DEFAULT_PROCESS, allProcesses, processNames } from '../process/registry.js';
import type { AnyProcess } from '../process/types.js';
import { MAX_POINTS } from './limits.js';
import { normalizeSweep } from './normalize.js';
import { checkKeys, describeFound, isMapping, ProblemList, readChoice, readNumber } from './problems.js';
import type { AxisSpec, DesignSpec, ModelSpec, SweepSpec } from './types.js';
import { checkInputKeys, validateAxes, type ProcessInputs } from './validate-axes.js';
import { validateDesign } from './validate-design.js';

/** Top-level keys of a sweep file, in the order they are written. */
export const SWEEP_KEYS = ['name', 'axes', 'fixed', 'design', 'model'] as const;

/** Longest sweep name, characters. */
export const MAX_NAME_LENGTH = 200;

/** Options of validateSweep. */
export interface ValidateOptions {
  /** name used when the file has none (parseSweepText passes the file's base name); default "sweep" */
  readonly defaultName?: string;
  /** folder that file names in the model section start from (parseSweepText: the sweep file's folder); default: the working folder */
  readonly baseDir?: string;
}

/**
 * Check a sweep given as plain data (the parsed file, or an object built by a library user)
 * and return its normalized, deep-frozen spec.
 * @throws InputError listing every problem found.
 */
export function validateSweep(raw: unknown, options: ValidateOptions = {}): SweepSpec {
  const problems = new ProblemList();
  if (raw === undefined || raw === null) {
    throw new InputError(`(top level): the sweep is empty; expected a mapping with keys ${SWEEP_KEYS.join(', ')}`);
  }
  if (!isMapping(raw)) {
    throw new InputError(`(top level): ${describeFound(raw)} is not a sweep; expected a mapping with keys ${SWEEP_KEYS.join(', ')}`);
  }
  const suggestedTop = checkKeys(raw, SWEEP_KEYS, '', problems);

  const name = validateName(raw.name, options.defaultName ?? 'sweep', problems);
  // the design is read first (axes depend on its kind) but reported in file order, after fixed
  // the process decides which inputs exist: an unknown one stops here (every other message would mislead)
  const process = readProcess(raw.model);
  // the design and model are read first (axes depend on them) but reported in file order, after fixed
  const designProblems = new ProblemList();
  const { design, kind } = validateDesign(raw.design, designProblems);
  const modelProblems = new ProblemList();
  const model = validateModelSection(raw.model, process, modelProblems, options.baseDir);
  const modelOrDefaults = model ?? { ...process.model.defaults, params: {} };
  const pi: ProcessInputs = { process: process.name, inputs: process.inputsFor(modelOrDefaults), note: process.model.inputsNote?.(modelOrDefaults) ?? null };
  const axesResult = validateAxes(raw.axes, kind, pi, problems);
  const fixedResult = validateFixed(raw.fixed, axesResult.named, pi, problems);
  const fixed = fixedResult.fixed;
  // a misspelt key already reported with the input, axes or fixed suggested would only be repeated
  const sectionSuggested = suggestedTop.includes('axes') || suggestedTop.includes('fixed');
  for (const input of pi.inputs) {
    if (input.default !== null) continue;
    const given = axesResult.named.includes(input.name) || (isMapping(raw.fixed) && raw.fixed[input.name] !== undefined);
    const suggested = axesResult.suggested.includes(input.name) || fixedResult.suggested.includes(input.name) || sectionSuggested;
    if (given || suggested) continue;
    problems.add(
      `axes.${input.name}`,
      `missing; ${input.name} (${input.description}, ${formatRange(input)}) must be swept under axes or set under fixed`,
    );
  }
  problems.addAll(designProblems);
  problems.addAll(modelProblems);

  if (design !== undefined && axesResult.ok) checkDesignFit(axesResult.axes, design, problems);
  if (model !== undefined && fixed !== undefined && axesResult.ok && process.model.checkInputs !== undefined) {
    process.model.checkInputs(model, new Set([...axesResult.axes.map((a) => a.name), ...Object.keys(fixed)]), problems);
  }

  if (problems.count > 0 || design === undefined || model === undefined || fixed === undefined || name === undefined) {
    throw new InputError(problems.list());
  }
  return normalizeSweep({ name, axes: axesResult.axes, fixed, design, model });
}

function validateName(raw: unknown, fallback: string, problems: ProblemList): string | undefined {
  if (raw === undefined || raw === null) return fallback;
  if (typeof raw !== 'string') {
    problems.add('name', `${describeFound(raw)} is not text; write the name in quotes, e.g. name: "ridge-7"`);
    return undefined;
  }
  if (raw.trim() === '') {
    problems.add('name', 'empty text; give the sweep a name or leave the key out');
    return undefined;
  }
  if (raw.length > MAX_NAME_LENGTH) {
    problems.add('name', `text of ${raw.length} characters is too long; at most ${MAX_NAME_LENGTH}`);
    return undefined;
  }
  // eslint-disable-next-line no-control-regex
  const control = /[\u0000-\u001f\u007f-\u009f]/.exec(raw);
  if (control !== null) {
    const code = `U+${control[0].charCodeAt(0).toString(16).toUpperCase().padStart(4, '0')}`;
    problems.add('name', `holds a control character (${code}) at position ${control.index + 1}; the name is printed and written into files, use plain text on one line`);
    return undefined;
  }
  return raw;
}

/**
 * The process named by `model.process` (absent: the default).
 * @throws InputError naming the value and the known processes
 */
function readProcess(rawModel: unknown): AnyProcess {
  const raw = isMapping(rawModel) ? rawModel.process : undefined;
  const name = raw === undefined || raw === null ? DEFAULT_PROCESS : raw;
  const problems = new ProblemList();
  const chosen = readChoice(name, processNames(), 'model.process', problems, 'a known process');
  const process = allProcesses().find((p) => p.name === chosen);
  if (process === undefined) throw new InputError(problems.list());
  return process;
}

/** The model section, validated by its process (the `process` key itself is read by readProcess). */
function validateModelSection(raw: unknown, process: AnyProcess, problems: ProblemList, baseDir: string | undefined): ModelSpec | undefined {
  if (raw !== undefined && raw !== null && !isMapping(raw)) {
    problems.add('model', `${describeFound(raw)} is not a mapping; write { process: ..., params: { ... } } with the options of the process`);
    return undefined;
  }
  const body: Record<string, unknown> = isMapping(raw) ? { ...raw } : {};
  delete body.process;
  return process.model.validate(body, problems, baseDir === undefined ? {} : { baseDir });
}

interface FixedResult {
  readonly fixed: Record<string, number> | undefined;
  readonly suggested: readonly string[];
}

function validateFixed(raw: unknown, swept: readonly string[], pi: ProcessInputs, problems: ProblemList): FixedResult {
  if (raw === undefined || raw === null) return { fixed: {}, suggested: [] };
  if (!isMapping(raw)) {
    problems.add('fixed', `${describeFound(raw)} is not a mapping of inputs to values, e.g. { lid_km: 6 }`);
    return { fixed: undefined, suggested: [] };
  }
  const before = problems.count;
  const suggested = checkInputKeys(raw, pi, 'fixed', problems);
  const fixed: Record<string, number> = {};
  for (const [key, value] of Object.entries(raw)) {
    const path = `fixed.${key}`;
    const input = pi.inputs.find((i) => i.name === key);
    if (input === undefined) continue;
    const name = key;
    const v = readNumber(value, path, problems, `allowed ${formatRange(input)}`);
    if (v === undefined) continue;
    if (swept.includes(name)) {
      problems.add(path, `${v} conflicts with axes.${name}; an input is either swept or fixed, not both`);
      continue;
    }
    const why = checkRangeValue(input, v);
    if (why !== null) {
      problems.add(path, `${v} ${why}`);
      continue;
    }
    fixed[name] = v;
  }
  return { fixed: problems.count === before ? fixed : undefined, suggested };
}

/** Checks that need both the axes and the design: sizes and sampled ranges. */
function checkDesignFit(axes: readonly AxisSpec[], design: DesignSpec, problems: ProblemList): void {
  if (design.kind !== 'grid') {
    if (axes.length === 0) {
      problems.add('axes', `a ${design.kind} design needs at least one swept input`);
      return;
    }
    for (const a of axes) {
      if (a.min === a.max) {
        problems.add(
          `axes.${a.name}`,
          `a ${design.kind} design samples a range, but this axis has the single value ${a.min}; give a wider range or put it under fixed`,
        );
      }
    }
  }
  const count = countPoints(axes, design);
  if (count > MAX_POINTS) {
    const where = design.kind === 'grid' ? 'axes' : design.kind === 'saltelli' ? 'design.base' : 'design.samples';
    const how =
      design.kind === 'grid'
        ? `the grid has ${axes.map((a) => a.values.length).join(' x ')} = ${count} points`
        : `${design.kind === 'saltelli' ? `${design.base} x (${axes.length} + 2)` : 'this'} makes ${count} points`;
    problems.add(where, `${how}, above the limit of ${MAX_POINTS} (2^40)`);
  }
}
