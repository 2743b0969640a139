/**
 * `meltsweep plot column`: the column diagram of one or more scenarios as an SVG, PNG or PDF file.
 * Parse, call, write: the pictures are src/report, the ranges come from INPUT_RANGES.
 *
 * Lists combine as a cartesian product, in option order (--tp outermost, --upwelling fastest):
 * `--tp 1300,1400 --water 0,200` draws four scenarios. At most MAX_DIAGRAM_SCENARIOS (8).
 */
import type { Command } from 'commander';
import { InputError } from '../../errors.js';
import { writeFileAtomic } from '../../io/ipc-file.js';
import { defaultModel } from '../../physics/column.js';
import type { InputName } from '../../physics/fields.js';
import { checkRangeValue, formatRange, INPUT_RANGES, STEP_GPA_RANGE, TOLERANCE_RANGE, type InputRange } from '../../physics/ranges.js';
import { TOLERANCE_DEFAULT as TOLERANCE_RANGE_DEFAULT } from '../../spec/limits.js';
import type { ModelOptions, Scenario, ThermalModel, WaterMode } from '../../physics/types.js';
import { MAX_DIAGRAM_SCENARIOS } from '../../report/theme.js';
import { addFigureSizeOptions, checkOutputFile, figureOutput } from '../figure-output.js';
import { registerPlotMap } from './plot-map.js';

const WATER_MODES: readonly WaterMode[] = ['batch', 'fractional'];
const THERMAL_CHOICES: readonly (ThermalModel | 'auto')[] = ['auto', 'isentropic', 'conductive'];

interface PlotColumnOptions {
  tp: string;
  water: string;
  lid: string;
  upwelling?: string;
  thermal: string;
  mode: string;
  step?: string;
  tolerance?: string;
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
export function plotColumnInputs(o: PlotColumnOptions): { scenarios: Scenario[]; model: ModelOptions } {
  const problems: string[] = [];
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
  const tps = list('--tp', o.tp, 'tp_c');
  const waters = list('--water', o.water, 'water_ppm');
  const lids = list('--lid', o.lid, 'lid_km');
  const ups = list('--upwelling', o.upwelling, 'upwelling_mm_yr');
  const thermal = attempt(() => parseChoice('--thermal', o.thermal, THERMAL_CHOICES), 'auto' as ThermalModel | 'auto');
  const mode = attempt(() => parseChoice('--mode', o.mode, WATER_MODES), 'batch' as WaterMode);
  const ranged = (option: string, raw: string | undefined, range: InputRange): number | undefined =>
    raw === undefined
      ? undefined
      : attempt(() => {
          const v = Number(raw);
          const problem = raw.trim() === '' ? 'is not a number' : checkRangeValue(range, v);
          if (problem !== null) throw new InputError(`${option}: ${raw} ${problem}${problem === 'is not a number' ? `; allowed ${formatRange(range)}` : ''}`);
          return v;
        }, undefined);
  const step = ranged('--step', o.step, STEP_GPA_RANGE);
  const tolerance = ranged('--tolerance', o.tolerance, TOLERANCE_RANGE);
  if (o.step !== undefined && o.tolerance !== undefined) {
    problems.push(`--tolerance: ${o.tolerance} given together with --step ${o.step}; give one: --step for a fixed pressure step, or --tolerance for error-controlled steps`);
  }
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
  const accuracy = step !== undefined ? { stepGpa: step } : tolerance !== undefined ? { tolerance } : {};
  return { scenarios, model: defaultModel({ thermal, water: mode, ...accuracy }) };
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
    .requiredOption('--tp <list>', `mantle potential temperature(s) (${formatRange(INPUT_RANGES.tp_c)})`)
    .option('--water <list>', `bulk water of the source (${formatRange(INPUT_RANGES.water_ppm)})`, '0')
    .option('--lid <list>', `lid thickness(es) (${formatRange(INPUT_RANGES.lid_km)})`, '0')
    .option('--upwelling <list>', `solid upwelling rate(s) (${formatRange(INPUT_RANGES.upwelling_mm_yr)}); selects the conductive model under --thermal auto`)
    .option('--thermal <model>', `thermal model: ${THERMAL_CHOICES.join(', ')} (auto: conductive with --upwelling, else isentropic)`, 'auto')
    .option('--mode <mode>', `water mode: ${WATER_MODES.join(' or ')}`, 'batch')
    .option('--step <GPa>', `isentropic column: a fixed pressure step (${formatRange(STEP_GPA_RANGE)}) instead of error control`)
    .option('--tolerance <rel>', `isentropic column: relative tolerance of the error-controlled steps (${formatRange(TOLERANCE_RANGE)}, default ${TOLERANCE_RANGE_DEFAULT})`)
    .option('--title <text>', 'title above the diagram (default "Melting column")')
    .requiredOption('-o, --output <file>', 'the file to write: .svg, .png or .pdf (text as outlines of the bundled font)');
  addFigureSizeOptions(column).action(async (o: PlotColumnOptions) => {
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
