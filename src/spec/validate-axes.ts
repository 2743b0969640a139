/**
 * Validation of the `axes` section: each swept input is `values`, or `from`/`to` with `step`
 * or `count` (optional `scale: log`). Ranges are expanded to their values here, once.
 */
import { checkRangeValue, formatRange } from '../physics/ranges.js';
import type { InputDef } from '../process/types.js';
import { MAX_AXIS_VALUES } from './limits.js';
import {
  checkKeys,
  describeFound,
  isMapping,
  readChoice,
  readNumber,
  readWholeNumber,
  type ProblemList,
} from './problems.js';
import { suggestName } from './suggest.js';
import type { AxisScale, AxisSpec, DesignKind } from './types.js';

/** Keys an axis may have. */
export const AXIS_KEYS = ['values', 'from', 'to', 'step', 'count', 'scale'] as const;
const AXIS_SCALES: readonly AxisScale[] = ['linear', 'log'];
const AXIS_SHAPE = '{ values: [...] } or { from: ..., to: ..., step: ... } (or count: ...)';

/** Result of validating `axes`: the valid axes and every input named there (valid or not). */
export interface AxesResult {
  readonly axes: readonly AxisSpec[];
  /** input names that appear under axes, whether or not their axis is valid */
  readonly named: readonly string[];
  /** true when no problem was found in the section */
  readonly ok: boolean;
  /** inputs suggested for unknown names ("tp" -> tp_c): not reported again as missing */
  readonly suggested: readonly string[];
}

/** The inputs of the sweep's process, as the axes and fixed sections see them. */
export interface ProcessInputs {
  /** the process name, for messages */
  readonly process: string;
  readonly inputs: readonly InputDef[];
  /** why some inputs are absent under the model options (ProcessModelOptions.inputsNote), or null */
  readonly note?: string | null;
}

/**
 * Report every key of a section (axes, fixed) that is not an input of the process: a near miss
 * gets "unknown input; did you mean tp_c?", anything else names the process and lists its inputs.
 * Returns the suggested names.
 */
export function checkInputKeys(obj: Record<string, unknown>, pi: ProcessInputs, path: string, problems: ProblemList): string[] {
  const names = pi.inputs.map((i) => i.name);
  const suggested: string[] = [];
  for (const key of Object.keys(obj)) {
    if (names.includes(key)) continue;
    const near = suggestName(key, names);
    if (near !== null) {
      problems.add(`${path}.${key}`, `unknown input; did you mean ${near}?`);
      suggested.push(near);
    } else {
      problems.add(`${path}.${key}`, `${key} is not an input of process ${pi.process}; its inputs: ${names.join(', ')}${pi.note ? ` (${pi.note})` : ''}`);
    }
  }
  return suggested;
}

/**
 * Validate the `axes` mapping against the inputs of the sweep's process. `design` is the design
 * kind when it is known (a grid needs step or count on every range axis; random designs can
 * sample a bare from/to interval).
 */
export function validateAxes(raw: unknown, design: DesignKind | undefined, pi: ProcessInputs, problems: ProblemList): AxesResult {
  const before = problems.count;
  if (raw === undefined || raw === null) return { axes: [], named: [], ok: true, suggested: [] };
  if (!isMapping(raw)) {
    problems.add('axes', `${describeFound(raw)} is not a mapping of inputs to axes; allowed inputs: ${pi.inputs.map((i) => i.name).join(', ')}`);
    return { axes: [], named: [], ok: false, suggested: [] };
  }
  const suggested = checkInputKeys(raw, pi, 'axes', problems);
  const axes: AxisSpec[] = [];
  const named: string[] = [];
  for (const [key, body] of Object.entries(raw)) {
    const input = pi.inputs.find((i) => i.name === key);
    if (input === undefined) continue;
    named.push(key);
    const axis = validateAxis(input, body, design, problems);
    if (axis !== undefined) axes.push(axis);
  }
  return { axes, named, ok: problems.count === before, suggested };
}

function validateAxis(input: InputDef, body: unknown, design: DesignKind | undefined, problems: ProblemList): AxisSpec | undefined {
  const path = `axes.${input.name}`;
  if (!isMapping(body)) {
    if (typeof body === 'number') {
      problems.add(path, `${body} is not an axis; write ${AXIS_SHAPE}, or put a constant under fixed`);
    } else {
      problems.add(path, `${describeFound(body)} is not an axis; write ${AXIS_SHAPE}`);
    }
    return undefined;
  }
  const before = problems.count;
  // after an unknown key (often a misspelt one) further messages about the axis would only repeat it
  if (checkKeys(body, AXIS_KEYS, path, problems).length > 0 || problems.count > before) return undefined;
  let scale: AxisScale = 'linear';
  if (body.scale !== undefined) scale = readChoice(body.scale, AXIS_SCALES, `${path}.scale`, problems, 'a scale') ?? 'linear';

  const isRange = ['from', 'to', 'step', 'count'].some((k) => body[k] !== undefined);
  let axis: AxisSpec | undefined;
  if (body.values !== undefined) {
    if (isRange) {
      problems.add(path, 'give either values or from/to, not both');
      return undefined;
    }
    axis = validateValuesAxis(input, body.values, scale, path, problems);
  } else {
    axis = validateRangeAxis(input, body, scale, design, path, problems);
  }
  return problems.count === before ? axis : undefined;
}

/** Check one value against the input's range and the axis scale; true when it is allowed. */
function checkAxisValue(input: InputDef, value: number, scale: AxisScale, path: string, problems: ProblemList): boolean {
  const why = checkRangeValue(input, value);
  if (why !== null) {
    problems.add(path, `${value} ${why}`);
    return false;
  }
  if (scale === 'log' && !(value > 0)) {
    problems.add(path, `${value} is not allowed with scale: log; a log axis needs values above 0`);
    return false;
  }
  return true;
}

function validateValuesAxis(
  input: InputDef,
  raw: unknown,
  scale: AxisScale,
  path: string,
  problems: ProblemList,
): AxisSpec | undefined {
  const vpath = `${path}.values`;
  if (!Array.isArray(raw)) {
    problems.add(vpath, `${describeFound(raw)} is not a list of numbers; write values: [a, b, c]`);
    return undefined;
  }
  if (raw.length === 0) {
    problems.add(vpath, 'an empty list has no values; give at least one');
    return undefined;
  }
  if (raw.length > MAX_AXIS_VALUES) {
    problems.add(vpath, `a list of ${raw.length} values is too long; at most ${MAX_AXIS_VALUES} per axis`);
    return undefined;
  }
  const values: number[] = [];
  const seen = new Map<number, number>();
  let ok = true;
  raw.forEach((item: unknown, i) => {
    const ipath = `${vpath}[${i}]`;
    const v = readNumber(item, ipath, problems, `allowed ${formatRange(input)}`);
    if (v === undefined || !checkAxisValue(input, v, scale, ipath, problems)) {
      ok = false;
      return;
    }
    const first = seen.get(v);
    if (first !== undefined) {
      problems.add(ipath, `${v} repeats values[${first}]; give each value once`);
      ok = false;
      return;
    }
    seen.set(v, i);
    values.push(v);
  });
  if (!ok) return undefined;
  return { name: input.name, values, min: Math.min(...values), max: Math.max(...values), scale };
}

function validateRangeAxis(
  input: InputDef,
  body: Record<string, unknown>,
  scale: AxisScale,
  design: DesignKind | undefined,
  path: string,
  problems: ProblemList,
): AxisSpec | undefined {
  const before = problems.count;
  const ends: (number | undefined)[] = (['from', 'to'] as const).map((k) => {
    if (body[k] === undefined) {
      problems.add(`${path}.${k}`, 'missing; a range axis needs from and to (or give values)');
      return undefined;
    }
    const v = readNumber(body[k], `${path}.${k}`, problems, `allowed ${formatRange(input)}`);
    return v !== undefined && checkAxisValue(input, v, scale, `${path}.${k}`, problems) ? v : undefined;
  });
  const hasStep = body.step !== undefined;
  const hasCount = body.count !== undefined;
  if (hasStep && hasCount) {
    problems.add(path, 'give step or count, not both');
    return undefined;
  }
  const [from, to] = ends;
  if (from === undefined || to === undefined || problems.count > before) return undefined;

  let values: number[] | undefined;
  if (hasStep) {
    values = expandStep(body.step, { from, to, scale, path: `${path}.step`, problems });
  } else if (hasCount) {
    values = expandCount(body.count, { from, to, scale, path: `${path}.count`, problems });
  } else if (design === 'grid') {
    problems.add(path, 'a grid axis needs step or count (or values)');
    return undefined;
  } else {
    values = from === to ? [from] : [from, to];
  }
  if (values === undefined) return undefined;
  for (let i = 1; i < values.length; i++) {
    if (values[i] === values[i - 1]) {
      problems.add(path, `the range from ${from} to ${to} is too narrow for ${values.length} distinct values`);
      return undefined;
    }
  }
  return { name: input.name, values, min: Math.min(from, to), max: Math.max(from, to), scale };
}

/** A range axis's ends and scale, with where its step or count is written (for messages). */
interface RangeEnds {
  readonly from: number;
  readonly to: number;
  readonly scale: AxisScale;
  readonly path: string;
  readonly problems: ProblemList;
}

/** Round away the binary drift of from + i * step (0.30000000000000004 -> 0.3). */
function tidy(x: number): number {
  return Number(x.toPrecision(15));
}

/**
 * Values from `from` towards `to` by `step`, `to` included when the step lands on it (up to a
 * relative drift of 1e-9: from 1280 to 1420 step 20 gives exactly 8 values ending at 1420).
 */
function expandStep(raw: unknown, range: RangeEnds): number[] | undefined {
  const { from, to, scale, path, problems } = range;
  const step = readNumber(raw, path, problems);
  if (step === undefined) return undefined;
  if (scale === 'log') {
    problems.add(path, `${step} is not allowed with scale: log; use count for geometric spacing`);
    return undefined;
  }
  if (step === 0) {
    problems.add(path, '0 is not allowed; the step must not be 0');
    return undefined;
  }
  if (from === to) return [from];
  if ((to - from) / step < 0) {
    problems.add(path, `${step} does not lead from ${from} to ${to}; the step must be ${to > from ? 'positive' : 'negative'}`);
    return undefined;
  }
  const ratio = (to - from) / step;
  const nearest = Math.round(ratio);
  const lands = Math.abs(ratio - nearest) <= 1e-9 * Math.max(1, nearest);
  const n = (lands ? nearest : Math.floor(ratio)) + 1;
  if (!lands) {
    const last = tidy(from + (n - 1) * step);
    problems.add(
      path,
      `${step} does not divide the range ${from} to ${to}: the values would stop at ${last} and leave ${to} out; ` +
        `give a step that lands on ${to}, use count, or write to: ${last} if that is what you want`,
    );
    return undefined;
  }
  if (n > MAX_AXIS_VALUES) {
    problems.add(path, `${step} gives ${n} values from ${from} to ${to}; at most ${MAX_AXIS_VALUES} per axis`);
    return undefined;
  }
  const values = new Array<number>(n);
  for (let i = 0; i < n; i++) values[i] = tidy(from + i * step);
  values[0] = from;
  if (lands) values[n - 1] = to;
  return values;
}

/** `count` values from `from` to `to`, both included; evenly spaced, or geometric with scale log. */
function expandCount(raw: unknown, range: RangeEnds): number[] | undefined {
  const { from, to, scale, path, problems } = range;
  const count = readWholeNumber(raw, path, problems, 'count', 1, MAX_AXIS_VALUES);
  if (count === undefined) return undefined;
  if (count === 1 && from !== to) {
    problems.add(path, `1 cannot span from ${from} to ${to}; use count 2 or more, or put a constant under fixed`);
    return undefined;
  }
  if (count > 1 && from === to) {
    problems.add(path, `${count} values from ${from} to ${to} would all be equal; use count: 1`);
    return undefined;
  }
  if (count === 1) return [from];
  const values = new Array<number>(count);
  const last = count - 1;
  for (let i = 0; i <= last; i++) {
    const t = i / last;
    values[i] = tidy(scale === 'log' ? from * (to / from) ** t : from + (to - from) * t);
  }
  values[0] = from;
  values[last] = to;
  return values;
}
