/**
 * `meltsweep plot column`: the column diagram of one or more scenarios as an SVG, PNG or PDF file.
 * Parse, call, write: the pictures are src/report, the ranges come from INPUT_RANGES.
 *
 * Lists combine as a cartesian product, in option order (--tp outermost, --upwelling fastest):
 * `--tp 1300,1400 --water 0,200` draws four scenarios. At most MAX_DIAGRAM_SCENARIOS (8).
 * `--process NAME` draws another process's own diagram (ProcessDefinition.diagram) from the same
 * kind of lists, one per input of that process, in the process's input order.
 */
import type { Command } from 'commander';
import { InputError } from '../../errors.js';
import { writeFileAtomic } from '../../io/ipc-file.js';
import { defaultModel } from '../../physics/column.js';
import type { InputName } from '../../physics/fields.js';
import { checkRangeValue, formatRange, INPUT_RANGES, STEP_GPA_RANGE, type InputRange } from '../../physics/ranges.js';
import type { ModelOptions, Scenario, ThermalModel, WaterMode } from '../../physics/types.js';
import { allProcesses, DEFAULT_PROCESS, processNamed } from '../../process/registry.js';
import type { AnyProcess, DiagramItem } from '../../process/types.js';
import { MAX_DIAGRAM_SCENARIOS } from '../../report/theme.js';
import { ProblemList } from '../../spec/problems.js';
import type { ModelSpec } from '../../spec/types.js';
import { addFigureSizeOptions, checkOutputFile, figureOutput } from '../figure-output.js';
import { registerPlotMap } from './plot-map.js';

const WATER_MODES: readonly WaterMode[] = ['batch', 'fractional'];
const THERMAL_CHOICES: readonly (ThermalModel | 'auto')[] = ['auto', 'isentropic', 'conductive'];

interface PlotColumnOptions {
  process?: string;
  tp?: string;
  water?: string;
  lid?: string;
  upwelling?: string;
  thermal?: string;
  mode?: string;
  step?: string;
  [flag: string]: string | boolean | undefined;
  title?: string;
  output: string;
  width?: string;
  dpi?: string;
  force?: boolean;
}

/** Parse a comma-separated list of numbers, each inside `range`. @throws InputError naming option and value */
export function parseNumberList(option: string, raw: string, range: InputRange): number[] {
  const parts = raw.split(',').map((s) => s.trim());
  if (parts.length === 0 || parts.every((p) => p === '')) throw new InputError(`${option}: the list is empty; give one or more numbers separated by commas, allowed ${formatRange(range)}`);
  const problems: string[] = [];
  const values: number[] = [];
  for (const part of parts) {
    const v = part === '' ? Number.NaN : Number(part);
    if (Number.isNaN(v)) {
      problems.push(`${option}: ${JSON.stringify(part)} is not a number; allowed ${formatRange(range)}`);
      continue;
    }
    const problem = checkRangeValue(range, v);
    if (problem !== null) problems.push(`${option}: ${part} ${problem}`);
    else values.push(v);
  }
  if (problems.length > 0) throw new InputError(problems);
  return [...new Set(values)];
}

function parseChoice<T extends string>(option: string, raw: string, choices: readonly T[]): T {
  if ((choices as readonly string[]).includes(raw)) return raw as T;
  throw new InputError(`${option}: ${JSON.stringify(raw)} is not allowed; choose one of ${choices.join(', ')}`);
}

/** The scenarios (cartesian product of the lists) and the model of a `plot column` call. @throws InputError */
export function plotColumnInputs(given: PlotColumnOptions): { scenarios: Scenario[]; model: ModelOptions } {
  const problems: string[] = [];
  if (given.tp === undefined) problems.push("--tp: missing; give one or more mantle potential temperatures (process decompression), e.g. --tp 1300,1400");
  for (const f of processOnlyFlags(DEFAULT_PROCESS)) {
    if (given[optionKey(f.flag)] !== undefined) problems.push(`--${f.flag}: ${f.what} of process ${f.process}, not of process ${DEFAULT_PROCESS}; give --process ${f.process}`);
  }
  const o = { ...given, tp: given.tp ?? '', water: given.water ?? '0', lid: given.lid ?? '0', thermal: given.thermal ?? 'auto', mode: given.mode ?? 'batch', step: given.step ?? '0.05' };
  const attempt = <T>(fn: () => T, fallback: T): T => {
    try {
      return fn();
    } catch (err) {
      if (!(err instanceof InputError)) throw err;
      problems.push(...err.problems);
      return fallback;
    }
  };
  const list = (option: string, raw: string | undefined, name: InputName): number[] =>
    raw === undefined ? [Number.NaN] : attempt(() => parseNumberList(option, raw, INPUT_RANGES[name]), []);
  const tps = given.tp === undefined ? [] : list('--tp', o.tp, 'tp_c');
  const waters = list('--water', o.water, 'water_ppm');
  const lids = list('--lid', o.lid, 'lid_km');
  const ups = list('--upwelling', o.upwelling, 'upwelling_mm_yr');
  const thermal = attempt(() => parseChoice('--thermal', o.thermal, THERMAL_CHOICES), 'auto' as ThermalModel | 'auto');
  const mode = attempt(() => parseChoice('--mode', o.mode, WATER_MODES), 'batch' as WaterMode);
  const step = attempt(() => {
    const v = Number(o.step);
    const problem = o.step.trim() === '' ? 'is not a number' : checkRangeValue(STEP_GPA_RANGE, v);
    if (problem !== null) throw new InputError(`--step: ${o.step} ${problem}${problem === 'is not a number' ? `; allowed ${formatRange(STEP_GPA_RANGE)}` : ''}`);
    return v;
  }, 0.05);
  if (thermal === 'conductive' && o.upwelling === undefined) problems.push('--thermal conductive needs an upwelling rate: give --upwelling <mm/yr>');
  const conductive = thermal === 'conductive' || (thermal === 'auto' && o.upwelling !== undefined);
  if (mode === 'fractional' && conductive) {
    problems.push('--mode fractional: the conductive model computes batch water only; use --mode batch, or --thermal isentropic');
  }
  const count = tps.length * waters.length * lids.length * ups.length;
  if (problems.length === 0 && count > MAX_DIAGRAM_SCENARIOS) {
    problems.push(
      `--tp, --water, --lid, --upwelling: the lists combine into ${tps.length} x ${waters.length} x ${lids.length} x ${ups.length} = ${count} scenarios; one diagram draws at most ${MAX_DIAGRAM_SCENARIOS}`,
    );
  }
  attempt(() => figureOutput(o), null);
  if (problems.length > 0) throw new InputError(problems);
  const scenarios: Scenario[] = [];
  for (const tp_c of tps) for (const water_ppm of waters) for (const lid_km of lids) for (const upwelling_mm_yr of ups) scenarios.push({ tp_c, water_ppm, lid_km, upwelling_mm_yr });
  return { scenarios, model: defaultModel({ thermal, water: mode, stepGpa: step }) };
}

/** commander's key of a --flag ("slab-depth" -> "slabDepth"). */
function optionKey(flag: string): string {
  return flag.replace(/-([a-z])/g, (_, c: string) => c.toUpperCase());
}

/** Decompression's own options of plot column (the built-in ones). */
const DECOMPRESSION_FLAGS: readonly string[] = ['tp', 'water', 'lid', 'upwelling', 'thermal', 'mode', 'step'];

/** Input and model flags of the other processes that `process` does not have. */
function processOnlyFlags(process: string): { flag: string; what: string; process: string }[] {
  const own = process === DEFAULT_PROCESS ? new Set(DECOMPRESSION_FLAGS) : new Set<string>();
  if (process !== DEFAULT_PROCESS) {
    const p = processNamed(process, '--process');
    for (const i of p.inputsFor({ ...p.model.defaults, params: {} })) own.add(i.cliFlag);
    for (const f of p.model.cliFlags ?? []) own.add(f.flag);
  }
  const out: { flag: string; what: string; process: string }[] = [];
  for (const p of allProcesses()) {
    if (p.name === process) continue;
    for (const i of p.inputsFor({ ...p.model.defaults, params: {} })) if (!own.has(i.cliFlag) && !out.some((x) => x.flag === i.cliFlag)) out.push({ flag: i.cliFlag, what: `${i.name} is an input`, process: p.name });
    for (const f of p.model.cliFlags ?? []) if (!own.has(f.flag) && !out.some((x) => x.flag === f.flag)) out.push({ flag: f.flag, what: `${f.key} is an option`, process: p.name });
  }
  if (process !== DEFAULT_PROCESS) {
    for (const flag of DECOMPRESSION_FLAGS) if (!own.has(flag) && !out.some((x) => x.flag === flag)) out.push({ flag, what: `--${flag} is an option`, process: DEFAULT_PROCESS });
  }
  return out;
}

/**
 * The scenarios (cartesian product of one list per input, in the process's input order) and the
 * model section of `plot column --process NAME` for a process other than decompression.
 * @throws InputError naming each bad option
 */
export function plotProcessInputs(process: AnyProcess, o: PlotColumnOptions): { items: DiagramItem[]; model: ModelSpec } {
  const problems: string[] = [];
  for (const f of processOnlyFlags(process.name)) {
    if (o[optionKey(f.flag)] !== undefined) problems.push(`--${f.flag}: ${f.what} of process ${f.process}, not of process ${process.name}`);
  }
  const section: Record<string, unknown> = {};
  for (const f of process.model.cliFlags ?? []) {
    const raw = o[optionKey(f.flag)];
    if (typeof raw === 'string') section[f.key] = f.kind === 'file' ? { file: raw } : raw;
  }
  const modelProblems = new ProblemList();
  const model = process.model.validate(section, modelProblems);
  for (const m of modelProblems.list()) {
    const flag = (process.model.cliFlags ?? []).find((f) => m.startsWith(`model.${f.key}`));
    problems.push(flag === undefined ? m : `--${flag.flag}${m.slice(m.indexOf(':'))}`);
  }
  const inputs = process.inputsFor(model ?? { ...process.model.defaults, params: {} });
  const lists: number[][] = [];
  for (const input of inputs) {
    const raw = o[optionKey(input.cliFlag)];
    if (typeof raw === 'string') {
      try {
        lists.push(parseNumberList(`--${input.cliFlag}`, raw, input));
      } catch (err) {
        if (!(err instanceof InputError)) throw err;
        problems.push(...err.problems);
        lists.push([]);
      }
    } else if (input.default === null || !Number.isFinite(input.default)) {
      problems.push(`--${input.cliFlag}: missing; process ${process.name} needs ${input.name} (${input.description}, ${formatRange(input)})`);
      lists.push([]);
    } else {
      lists.push([input.default]);
    }
  }
  const count = lists.reduce((a, l) => a * l.length, 1);
  if (problems.length === 0 && count > MAX_DIAGRAM_SCENARIOS) {
    problems.push(`${inputs.map((i) => `--${i.cliFlag}`).join(', ')}: the lists combine into ${lists.map((l) => l.length).join(' x ')} = ${count} scenarios; one diagram draws at most ${MAX_DIAGRAM_SCENARIOS}`);
  }
  try {
    figureOutput(o as Parameters<typeof figureOutput>[0]);
  } catch (err) {
    if (!(err instanceof InputError)) throw err;
    problems.push(...err.problems);
  }
  if (problems.length > 0 || model === undefined) throw new InputError(problems);
  let items: Record<string, number>[] = [{}];
  inputs.forEach((input, k) => {
    items = items.flatMap((partial) => lists[k].map((v) => ({ ...partial, [input.name]: v })));
  });
  return { items: items.map((inputsOfOne) => ({ inputs: inputsOfOne })), model };
}

/** Register `meltsweep plot` and its `column` subcommand. */
export function registerPlot(program: Command): void {
  const plot = program.command('plot').description('draw pictures as SVG, PNG or PDF files (see also: meltsweep report)');
  const column = plot
    .command('column')
    .description(
      'temperature and melt fraction against depth for one or more scenarios, with the solidus and liquidus curves; ' +
        `comma-separated lists combine as a cartesian product (at most ${MAX_DIAGRAM_SCENARIOS} scenarios)`,
    )
    .option('--process <name>', `melting process: ${allProcesses().map((p) => p.name).join(', ')} (default ${DEFAULT_PROCESS}); each draws its own diagram`)
    .option('--tp <list>', `mantle potential temperature(s) (${formatRange(INPUT_RANGES.tp_c)}; required)`)
    .option('--water <list>', `bulk water of the source (${formatRange(INPUT_RANGES.water_ppm)}; default 0 for decompression)`)
    .option('--lid <list>', `lid thickness(es) (${formatRange(INPUT_RANGES.lid_km)}; default 0 for decompression)`)
    .option('--upwelling <list>', `solid upwelling rate(s) (${formatRange(INPUT_RANGES.upwelling_mm_yr)}); selects the conductive model under --thermal auto [process decompression]`)
    .option('--thermal <model>', `thermal model: ${THERMAL_CHOICES.join(', ')} (default auto: conductive with --upwelling, else isentropic) [process decompression]`)
    .option('--mode <mode>', `water mode: ${WATER_MODES.join(' or ')} (default batch) [process decompression]`)
    .option('--step <GPa>', `isentropic pressure step (${formatRange(STEP_GPA_RANGE)}, default 0.05) [process decompression]`)
    .option('--title <text>', 'title above the diagram (default "Melting column")')
    .requiredOption('-o, --output <file>', 'the file to write: .svg, .png or .pdf (text as outlines of the bundled font)');
  // inputs and model options of the other processes (e.g. --slab-depth, --heat of flux), each once
  const taken = new Set(column.options.map((x) => x.long));
  for (const p of allProcesses()) {
    for (const i of p.inputsFor({ ...p.model.defaults, params: {} })) {
      if (taken.has(`--${i.cliFlag}`)) continue;
      taken.add(`--${i.cliFlag}`);
      column.option(`--${i.cliFlag} <list>`, `${i.description} (${formatRange(i)}${i.default !== null && Number.isFinite(i.default) ? `, default ${i.default}` : ''}) [process ${p.name}]`);
    }
    for (const f of p.model.cliFlags ?? []) {
      if (taken.has(`--${f.flag}`)) continue;
      taken.add(`--${f.flag}`);
      column.option(`--${f.flag} <${f.placeholder}>`, f.description);
    }
  }
  addFigureSizeOptions(column).action(async (o: PlotColumnOptions) => {
    const chosen = processNamed(o.process ?? DEFAULT_PROCESS, '--process');
    if (chosen.name !== DEFAULT_PROCESS) {
      await plotProcessDiagram(chosen, o);
      return;
    }
    const { scenarios, model } = plotColumnInputs(o);
    const { format, size } = figureOutput(o);
    checkOutputFile('-o', o.output, o.force);
    // the plotting libraries load only when a picture is drawn (they add ~0.3 s to start-up)
    const [{ renderColumnDiagram }, { exportFigure, layoutWidthFor }] = await Promise.all([import('../../report/column-diagram.js'), import('../../report/export.js')]);
    const r = await renderColumnDiagram(scenarios.map((scenario) => ({ scenario })), model, { title: o.title, targetWidth: layoutWidthFor(size) });
    writeFileAtomic(o.output, await exportFigure(r.svg, format, size, o.title ?? 'column diagram'));
    process.stdout.write(`column diagram: ${o.output} (${scenarios.length} scenario${scenarios.length === 1 ? '' : 's'})\n`);
    for (const note of r.data.notes) process.stderr.write(`note: ${note}\n`);
  });
  registerPlotMap(plot);
}

/** `plot column --process NAME` for a process with its own diagram. */
async function plotProcessDiagram(proc: AnyProcess, o: PlotColumnOptions): Promise<void> {
  const { items, model } = plotProcessInputs(proc, o);
  if (proc.diagram === undefined) throw new InputError(`--process: process ${proc.name} has no diagram`);
  const { format, size } = figureOutput(o as Parameters<typeof figureOutput>[0]);
  const output = o.output as string;
  checkOutputFile('-o', output, o.force === true);
  const [diagram, { exportFigure, layoutWidthFor }, { renderFigure }] = await Promise.all([proc.diagram(), import('../../report/export.js'), import('../../report/figure.js')]);
  const runtime = proc.resolveModel(model, { withProfile: true });
  const title = typeof o.title === 'string' ? o.title : undefined;
  const fig = diagram.figure(items, runtime, { title });
  const r = await renderFigure(fig.layout, layoutWidthFor(size));
  writeFileAtomic(output, await exportFigure(r.svg, format, size, title ?? `${proc.name} diagram`));
  process.stdout.write(`${proc.name} diagram: ${output} (${items.length} scenario${items.length === 1 ? '' : 's'})\n`);
  for (const note of fig.notes) process.stderr.write(`note: ${note}\n`);
}
