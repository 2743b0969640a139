/**
 * Sweep file (parsed YAML/JSON data) -> validated, normalized, frozen SweepSpec.
 * Every problem is collected (one message each, naming the path, the value found and what is
 * allowed) and all are thrown together as one InputError.
 */
import { InputError } from '../errors.js';
import { INPUT_NAMES, type InputName } from '../physics/fields.js';
import { countPoints } from './count.js';
import { checkInputValue, formatInputRange, INPUT_RANGES } from '../physics/ranges.js';
import { MAX_POINTS } from './limits.js';
import { normalizeSweep } from './normalize.js';
import { checkKeys, describeFound, isMapping, ProblemList, readNumber } from './problems.js';
import type { AxisSpec, DesignSpec, ModelSpec, SweepSpec } from './types.js';
import { validateAxes } from './validate-axes.js';
import { validateDesign } from './validate-design.js';
import { validateModel } from './validate-model.js';

/** Top-level keys of a sweep file, in the order they are written. */
export const SWEEP_KEYS = ['name', 'axes', 'fixed', 'design', 'model'] as const;

/** Longest sweep name, characters. */
export const MAX_NAME_LENGTH = 200;

/** Options of validateSweep. */
export interface ValidateOptions {
  /** name used when the file has none (parseSweepText passes the file's base name); default "sweep" */
  readonly defaultName?: string;
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
  const designProblems = new ProblemList();
  const { design, kind } = validateDesign(raw.design, designProblems);
  const axesResult = validateAxes(raw.axes, kind, problems);
  const fixedResult = validateFixed(raw.fixed, axesResult.named, problems);
  const fixed = fixedResult.fixed;
  const tpGiven = axesResult.named.includes('tp_c') || (isMapping(raw.fixed) && raw.fixed.tp_c !== undefined);
  // a misspelt key already reported with tp_c, axes or fixed suggested would only be repeated
  const tpSuggested =
    axesResult.suggested.includes('tp_c') || fixedResult.suggested.includes('tp_c') || suggestedTop.includes('axes') || suggestedTop.includes('fixed');
  if (!tpGiven && !tpSuggested) {
    problems.add(
      'axes.tp_c',
      `missing; tp_c (${INPUT_RANGES.tp_c.description}, ${formatInputRange('tp_c')}) must be swept under axes or set under fixed`,
    );
  }
  problems.addAll(designProblems);
  const model = validateModel(raw.model, problems);

  if (design !== undefined && axesResult.ok) checkDesignFit(axesResult.axes, design, problems);
  if (model !== undefined && fixed !== undefined && axesResult.ok) checkThermal(model, axesResult.axes, fixed, problems);

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
  return raw;
}

interface FixedResult {
  readonly fixed: Partial<Record<InputName, number>> | undefined;
  readonly suggested: readonly string[];
}

function validateFixed(raw: unknown, swept: readonly InputName[], problems: ProblemList): FixedResult {
  if (raw === undefined || raw === null) return { fixed: {}, suggested: [] };
  if (!isMapping(raw)) {
    problems.add('fixed', `${describeFound(raw)} is not a mapping of inputs to values, e.g. { lid_km: 6 }`);
    return { fixed: undefined, suggested: [] };
  }
  const before = problems.count;
  const suggested = checkKeys(raw, INPUT_NAMES, 'fixed', problems, 'input');
  const fixed: Partial<Record<InputName, number>> = {};
  for (const [key, value] of Object.entries(raw)) {
    const path = `fixed.${key}`;
    if (!(INPUT_NAMES as readonly string[]).includes(key)) continue;
    const name = key as InputName;
    const v = readNumber(value, path, problems);
    if (v === undefined) continue;
    if (swept.includes(name)) {
      problems.add(path, `${v} conflicts with axes.${name}; an input is either swept or fixed, not both`);
      continue;
    }
    const why = checkInputValue(name, v);
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

/** A conductive column needs an upwelling rate for every point. */
function checkThermal(model: ModelSpec, axes: readonly AxisSpec[], fixed: Partial<Record<InputName, number>>, problems: ProblemList): void {
  if (model.thermal !== 'conductive') return;
  if (axes.some((a) => a.name === 'upwelling_mm_yr') || fixed.upwelling_mm_yr !== undefined) return;
  problems.add('model.thermal', '"conductive" needs an upwelling rate; sweep upwelling_mm_yr under axes or set it under fixed');
}
