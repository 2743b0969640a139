/**
 * `meltsweep plot column`: the column diagram of one or more scenarios as an SVG, PNG or PDF file.
 * Parse, call, write: the pictures are src/report, the ranges come from INPUT_RANGES.
 *
 * Lists combine as a cartesian product, in option order (--tp outermost, --upwelling fastest):
 * `--tp 1300,1400 --water 0,200` draws four scenarios. At most MAX_DIAGRAM_SCENARIOS (8).
 */
import type { Command } from 'commander';
import { collectInputErrors, InputError } from '../../errors.js';
import { writeFileAtomic } from '../../io/ipc-file.js';
import { defaultModel } from '../../physics/column.js';
import type { InputName } from '../../physics/fields.js';
import { checkRangeValue, formatRange, INPUT_RANGES, type InputRange } from '../../physics/ranges.js';
import type { ModelOptions, Scenario } from '../../physics/types.js';
import { allProcesses, DEFAULT_PROCESS, processNamed } from '../../process/registry.js';
import type { AnyProcess, DiagramItem } from '../../process/types.js';
import type { ModelSpec } from '../../spec/types.js';
import { allInputFlags, columnInputs } from './column.js';
import type { DecompressionModelSpec } from '../../spec/validate-model.js';
import { MODEL_FLAG_HELP, modelFromFlags, optionKey } from '../model-flags.js';
import { MAX_DIAGRAM_SCENARIOS } from '../../report/theme.js';
import { addFigureSizeOptions, checkOutputFile, figureOutput } from '../figure-output.js';
import { registerPlotMap } from './plot-map.js';


interface PlotColumnOptions {
  process?: string;
  tp?: string;
  water: string;
  lid: string;
  upwelling?: string;
  thermal?: string;
  mode?: string;
  step?: string;
  tolerance?: string;
  deepOnset?: string;
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

/** The scenarios (cartesian product of the lists) and the model of a `plot column` call. @throws InputError */
export function plotColumnInputs(o: PlotColumnOptions): { scenarios: Scenario[]; model: ModelOptions } {
  const problems: string[] = [];
  const attempt = <T>(fn: () => T, fallback: T): T => collectInputErrors(problems, fn, fallback);
  const list = (option: string, raw: string | undefined, name: InputName): number[] =>
    raw === undefined ? [Number.NaN] : attempt(() => parseNumberList(option, raw, INPUT_RANGES[name]), []);
  if (o.tp === undefined) problems.push(`--tp: missing; give one or more mantle potential temperatures, ${formatRange(INPUT_RANGES.tp_c)}`);
  const tps = o.tp === undefined ? [] : list('--tp', o.tp, 'tp_c');
  const waters = list('--water', o.water, 'water_ppm');
  const lids = list('--lid', o.lid, 'lid_km');
  const ups = list('--upwelling', o.upwelling, 'upwelling_mm_yr');
  // the model flags, read and checked as `column` reads them (src/cli/model-flags.ts)
  const flags = modelFromFlags(processNamed(DEFAULT_PROCESS), o as unknown as Record<string, unknown>);
  problems.push(...flags.problems);
  const spec = flags.model as DecompressionModelSpec | undefined;
  const thermal = spec?.thermal ?? 'auto';
  const mode = spec?.water ?? 'batch';
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
  return { scenarios, model: defaultModel({ thermal, water: mode, ...(spec?.step_gpa !== undefined ? { stepGpa: spec.step_gpa } : spec?.tolerance !== undefined ? { tolerance: spec.tolerance } : {}), deepOnset: spec?.deep_onset ?? 'drop' }) };
}

/**
 * The scenarios of `plot column --process NAME` for a process that brings its own diagram: every
 * combination of the comma lists is read and checked exactly as `meltsweep column` reads one scenario.
 * @throws InputError naming the option, the value and what is allowed
 */
export function plotProcessInputs(o: Readonly<Record<string, unknown>>): { process: AnyProcess; items: DiagramItem[]; model: ModelSpec } {
  const process = processNamed(typeof o.process === 'string' ? o.process : DEFAULT_PROCESS, '--process');
  if (process.diagram === undefined) throw new InputError(`--process ${process.name}: this process has no column diagram`);
  // the comma lists, in option order (the first list outermost)
  const lists: { key: string; values: string[] }[] = [];
  for (const input of allInputFlags()) {
    const key = optionKey(input.cliFlag);
    const raw = o[key];
    if (typeof raw !== 'string') continue;
    const values = [...new Set(raw.split(',').map((v) => v.trim()))];
    if (values.length > 1) lists.push({ key, values });
  }
  const count = lists.reduce((n, l) => n * l.values.length, 1);
  if (count > MAX_DIAGRAM_SCENARIOS) {
    throw new InputError(`${lists.map((l) => `--${l.key}`).join(', ')}: the lists combine into ${lists.map((l) => l.values.length).join(' x ')} = ${count} scenarios; one diagram draws at most ${MAX_DIAGRAM_SCENARIOS}`);
  }
  figureOutput(o as unknown as PlotColumnOptions);
  const combos: Record<string, string>[] = [{}];
  for (const l of lists) {
    const next: Record<string, string>[] = [];
    for (const c of combos) for (const v of l.values) next.push({ ...c, [l.key]: v });
    combos.splice(0, combos.length, ...next);
  }
  const items: DiagramItem[] = [];
  let model: ModelSpec | undefined;
  const problems = new Set<string>();
  for (const c of combos) {
    try {
      const one = columnInputs({ ...(o as Record<string, string | boolean | undefined>), ...c, process: process.name });
      items.push({ inputs: one.inputs });
      model = one.model;
    } catch (err) {
      if (!(err instanceof InputError)) throw err;
      for (const p of err.problems) problems.add(p);
    }
  }
  if (problems.size > 0 || model === undefined) throw new InputError([...problems]);
  return { process, items, model };
}

/** Draw `plot column --process NAME` (a process with its own diagram) into o.output. */
async function plotProcessColumn(o: PlotColumnOptions): Promise<void> {
  const { process: proc, items, model } = plotProcessInputs(o as unknown as Record<string, unknown>);
  const { format, size } = figureOutput(o);
  checkOutputFile('-o', o.output, o.force);
  const [diagram, { renderFigure }, { exportFigure, layoutWidthFor }] = await Promise.all([proc.diagram!(), import('../../report/figure.js'), import('../../report/export.js')]);
  const fig = diagram.figure(items, proc.resolveModel(model, { withProfile: true }), { title: o.title });
  const rendered = await renderFigure(fig.layout, layoutWidthFor(size));
  writeFileAtomic(o.output, await exportFigure(rendered.svg, format, size, o.title ?? `${proc.name} column diagram`));
  process.stdout.write(`column diagram (process ${proc.name}): ${o.output} (${items.length} scenario${items.length === 1 ? '' : 's'})\n`);
  for (const note of fig.notes) process.stderr.write(`note: ${note}\n`);
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
    .option('--process <name>', `melting process: ${allProcesses().map((p) => p.name).join(', ')}`, DEFAULT_PROCESS)
    .option('--tp <list>', `mantle potential temperature(s) (${formatRange(INPUT_RANGES.tp_c)}); required`)
    .option('--water <list>', `bulk water of the source (${formatRange(INPUT_RANGES.water_ppm)})`, '0')
    .option('--lid <list>', `lid thickness(es) (${formatRange(INPUT_RANGES.lid_km)})`, '0')
    .option('--upwelling <list>', `solid upwelling rate(s) (${formatRange(INPUT_RANGES.upwelling_mm_yr)}); selects the conductive model under --thermal auto`)
    .option('--thermal <model>', MODEL_FLAG_HELP.thermal)
    .option('--mode <mode>', MODEL_FLAG_HELP.mode)
    .option('--step <GPa>', MODEL_FLAG_HELP.step)
    .option('--tolerance <rel>', MODEL_FLAG_HELP.tolerance)
    .option('--deep-onset <mode>', MODEL_FLAG_HELP.deepOnset)
    .option('--title <text>', 'title above the diagram (default "Melting column")')
    .requiredOption('-o, --output <file>', 'the file to write: .svg, .png or .pdf (text as outlines of the bundled font)');
  // the inputs and model options of the other processes (e.g. --slab-depth, --heat for flux)
  for (const input of allInputFlags()) if (!column.options.some((x) => x.long === `--${input.cliFlag}`)) column.option(`--${input.cliFlag} <list>`, `${input.description} (${formatRange(input)}) [other processes]`);
  for (const p of allProcesses()) for (const f of p.model.cliFlags ?? []) if (!column.options.some((x) => x.long === `--${f.flag}`)) column.option(`--${f.flag} <${f.placeholder}>`, f.description);
  addFigureSizeOptions(column).action(async (o: PlotColumnOptions) => {
    if ((o.process ?? DEFAULT_PROCESS) !== DEFAULT_PROCESS) return plotProcessColumn(o);
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
