/**
 * `meltsweep column`: compute one column of a process and print its result (readable table or
 * JSON), optionally writing the profile along the column as CSV. Parse, call, print: the process,
 * its inputs (flags, ranges, defaults) and result fields come from the process registry
 * (src/process/registry.ts).
 */
import type { Command } from 'commander';
import fs from 'node:fs';
import { InputError, RunError, EXIT_RUN_FAILED } from '../../errors.js';
import { REASON_FIELD, STATUS_FIELD, type FieldInfo } from '../../physics/fields.js';
import { formatRange } from '../../physics/ranges.js';
import { flagOfModelProblem, MODEL_FLAG_HELP, modelFromFlags, optionKey, parseRanged } from '../model-flags.js';
import { allProcesses, DEFAULT_PROCESS, everyResultOf, processNamed } from '../../process/registry.js';
import type { AnyProcess, InputDef, ProcessResult } from '../../process/types.js';
import { ProblemList } from '../../spec/problems.js';
import type { ModelSpec } from '../../spec/types.js';

/** What commander hands the action: input flags and model flags as text, plus the fixed options. */
type ColumnOptions = Record<string, string | boolean | undefined> & { process?: string; json?: boolean; profile?: string };

/** Every input flag of every process, once (processes share flags such as --tp). */
export function allInputFlags(): InputDef[] {
  const seen = new Map<string, InputDef>();
  for (const p of allProcesses()) for (const i of p.inputsFor({ ...p.model.defaults, params: {} })) if (!seen.has(i.cliFlag)) seen.set(i.cliFlag, i);
  return [...seen.values()];
}

/** The process, its inputs by name and its model section that a set of column options describes. @throws InputError */
export function columnInputs(o: ColumnOptions): { process: AnyProcess; inputs: Record<string, number>; model: ModelSpec } {
  const process = processNamed(o.process ?? DEFAULT_PROCESS, '--process');
  // the model section from the model flags, validated by the process (its messages name the flags)
  const { model, problems } = modelFromFlags(process, o);
  const inputs: Record<string, number> = {};
  const modelOrDefaults = model ?? { ...process.model.defaults, params: {} };
  const own = process.inputsFor(modelOrDefaults);
  const note = process.model.inputsNote?.(modelOrDefaults) ?? null;
  for (const other of allInputFlags()) {
    if (o[optionKey(other.cliFlag)] !== undefined && !own.some((i) => i.cliFlag === other.cliFlag)) {
      problems.push(
        `--${other.cliFlag}: ${other.name} is not an input of process ${process.name}; its inputs: ${own.map((i) => `${i.name} (--${i.cliFlag})`).join(', ')}${note === null ? '' : ` (${note})`}`,
      );
    }
  }
  for (const input of own) {
    const raw = o[optionKey(input.cliFlag)];
    if (typeof raw === 'string') {
      try {
        inputs[input.name] = parseRanged(`--${input.cliFlag}`, raw, input);
      } catch (err) {
        if (!(err instanceof InputError)) throw err;
        problems.push(...err.problems);
      }
    } else if (input.default === null) {
      problems.push(`--${input.cliFlag}: missing; process ${process.name} needs ${input.name} (${input.description}, ${formatRange(input)})`);
    } else {
      inputs[input.name] = input.default;
    }
  }
  if (model !== undefined && process.model.checkInputs !== undefined) {
    const given = new Set(own.filter((i) => Number.isFinite(inputs[i.name])).map((i) => i.name));
    const checks = new ProblemList();
    process.model.checkInputs(model, given, checks);
    problems.push(...checks.list().map(flagOfModelProblem));
  }
  if (problems.length > 0 || model === undefined) throw new InputError(problems);
  return { process, inputs, model };
}

/** The result fields of a row: the process's results, then the optional ones the row carries. */
function rowFields(process: AnyProcess, r: ProcessResult): readonly FieldInfo[] {
  return everyResultOf(process).filter((f, i) => i < process.results.length || r.values[f.name] !== undefined);
}

/** The result as one flat object: status, reason, then every numeric result field of the row. */
function resultRecord(process: AnyProcess, r: ProcessResult): Record<string, string | number | null> {
  const out: Record<string, string | number | null> = { [STATUS_FIELD.name]: r.status, [REASON_FIELD.name]: r.reason };
  for (const f of rowFields(process, r)) out[f.name] = r.values[f.name] ?? null;
  return out;
}

/**
 * What `column --json` prints: the result record, then what it ran with: `inputs` (every input of
 * the process by name, null for "not given") and `model` (the process, its validated model options
 * and, where the process describes it, the line naming what was resolved, e.g. the thermal model
 * chosen by `auto`).
 */
export function columnJson(
  process: AnyProcess,
  r: ProcessResult,
  inputs: Readonly<Record<string, number>>,
  model: ModelSpec,
  runtime: unknown,
): Record<string, unknown> {
  const given: Record<string, number | null> = {};
  for (const i of process.inputsFor(model)) given[i.name] = Number.isFinite(inputs[i.name]) ? inputs[i.name] : null;
  const resolved = process.describeColumn?.(inputs, runtime);
  return {
    ...resultRecord(process, r),
    inputs: given,
    model: { process: process.name, ...model, ...(resolved === undefined ? {} : { resolved }) },
  };
}

function formatNumber(v: number | null): string {
  if (v === null) return '-';
  if (v === 0) return '0';
  const a = Math.abs(v);
  return a >= 1e-3 && a < 1e6 ? String(Number(v.toPrecision(6))) : v.toExponential(4);
}

/** A short readable table: name, value, unit (units from the process's result fields). */
function resultTable(process: AnyProcess, r: ProcessResult): string {
  const rows: [string, string, string][] = [[STATUS_FIELD.name, r.status, '']];
  if (r.reason !== null) rows.push([REASON_FIELD.name, r.reason, '']);
  for (const f of rowFields(process, r)) {
    const v = r.values[f.name] ?? null;
    rows.push([f.name, formatNumber(v), v === null ? '' : f.unit]);
  }
  const w0 = Math.max(...rows.map((x) => x[0].length));
  const w1 = Math.max(...rows.filter((x) => x[0] !== REASON_FIELD.name).map((x) => x[1].length));
  return rows.map(([a, b, c]) => `${a.padEnd(w0)}  ${a === REASON_FIELD.name ? b : b.padStart(w1)}${c ? `  ${c}` : ''}`.trimEnd()).join('\n');
}

/** The profile as CSV: header of the profile field names (units in the names), one row per point. */
function profileCsv(fields: readonly FieldInfo[], r: ProcessResult): string {
  const lines = [fields.map((f) => f.name).join(',')];
  const prof = r.profile;
  if (prof !== undefined && fields.length > 0) {
    const n = prof[fields[0].name].length;
    for (let i = 0; i < n; i++) lines.push(fields.map((f) => String(prof[f.name][i])).join(','));
  }
  return `${lines.join('\n')}\n`;
}

/** Help text of an input flag: description and range, with the processes that use it when not all do. */
function inputHelp(input: InputDef): string {
  const users = allProcesses().filter((p) => p.inputsFor({ ...p.model.defaults, params: {} }).some((i) => i.cliFlag === input.cliFlag));
  const which = users.length === allProcesses().length ? '' : ` [process ${users.map((p) => p.name).join(', ')}]`;
  const def = input.default === null ? ' (required)' : Number.isFinite(input.default) && input.default !== 0 ? ` (default ${input.default})` : '';
  return `${input.description} (${formatRange(input)})${def}${which}`;
}

export function registerColumn(program: Command): void {
  const cmd = program
    .command('column')
    .description('compute one melting column and print its result (exit 1 when the column failed)')
    .option('--process <name>', `melting process: ${allProcesses().map((p) => p.name).join(', ')}`, DEFAULT_PROCESS);
  for (const input of allInputFlags()) cmd.option(`--${input.cliFlag} <${input.unit}>`, inputHelp(input));
  cmd
    .option('--mode <mode>', `${MODEL_FLAG_HELP.mode} [process decompression]`)
    .option('--thermal <model>', `${MODEL_FLAG_HELP.thermal} [process decompression]`)
    .option('--step <GPa>', `${MODEL_FLAG_HELP.step} [process decompression]`)
    .option('--tolerance <rel>', `${MODEL_FLAG_HELP.tolerance} [process decompression]`)
    .option('--deep-onset <mode>', `${MODEL_FLAG_HELP.deepOnset} [process decompression]`);
  for (const p of allProcesses()) for (const f of p.model.cliFlags ?? []) if (!cmd.options.some((x) => x.long === `--${f.flag}`)) cmd.option(`--${f.flag} <${f.placeholder}>`, f.description);
  cmd
    .option('--json', 'print one JSON object: status, reason, every numeric result field (null where not applicable), then the inputs and model options it ran with')
    .option('--profile <file.csv>', 'write the profile along the melting column to a CSV file')
    .action((o: ColumnOptions) => {
      const { process: proc, inputs, model } = columnInputs(o);
      const runtime = proc.resolveModel(model, { withProfile: o.profile !== undefined });
      const result = proc.compute(inputs, runtime);
      if (o.profile !== undefined) {
        try {
          fs.writeFileSync(o.profile, profileCsv(proc.profile ?? [], result));
        } catch (err) {
          throw new RunError(`cannot write the profile to ${o.profile}: ${err instanceof Error ? err.message : String(err)}`);
        }
      }
      if (o.json) {
        process.stdout.write(`${JSON.stringify(columnJson(proc, result, inputs, model, runtime))}\n`);
      } else {
        const line = proc.describeColumn?.(inputs, runtime) ?? `process: ${proc.name}`;
        process.stdout.write(`${line}\n${resultTable(proc, result)}\n`);
      }
      if (result.status === 'failed') process.exitCode = EXIT_RUN_FAILED;
    });
}
