/**
 * The output-columns tables of the README, generated from the process registry so the
 * documentation cannot drift from what is written (a test checks the README holds them).
 */
import { PROFILE_TABLE_FIELDS, type FieldInfo } from '../physics/fields.js';
import { allProcesses, DEFAULT_PROCESS, everyResultOf, processNamed } from '../process/registry.js';
import { resultFieldInfos, SCENARIO_ID_FIELD } from './arrow-schema.js';

/** The results-table columns of a process (default: decompression), with the saltelli block column. */
export function outputColumnsMarkdown(processName = DEFAULT_PROCESS): string {
  const process = processNamed(processName);
  const fields = { process: process.name, inputs: process.inputsFor({ ...process.model.defaults, params: {} }), results: everyResultOf(process) };
  const rows = resultFieldInfos(fields, true).map((f) => {
    const type = f.kind === 'status' ? 'dictionary<utf8>' : f.kind;
    return `| \`${f.name}\` | ${f.unit === '' ? '-' : f.unit} | ${type}${f.nullable ? ', nullable' : ''} | ${f.description} |`;
  });
  return ['| column | unit | type | meaning |', '|---|---|---|---|', ...rows].join('\n');
}

/** The processes of the registry: name, inputs (with their --flags) and what they compute. */
export function processesMarkdown(): string {
  const rows = allProcesses().map((p) => {
    const inputs = p.inputsFor({ ...p.model.defaults, params: {} }).map((i) => `\`${i.name}\` (--${i.cliFlag})`).join(', ');
    return `| \`${p.name}\`${p.name === DEFAULT_PROCESS ? ' (default)' : ''} | ${inputs} | ${p.title} |`;
  });
  return ['| process | inputs | what it computes |', '|---|---|---|', ...rows].join('\n');
}

/** The profile-table columns of the README (`run --profiles`), from the same registry. */
export function profileColumnsMarkdown(): string {
  const fields: readonly FieldInfo[] = [SCENARIO_ID_FIELD, ...PROFILE_TABLE_FIELDS];
  const rows = fields.map((f) => `| \`${f.name}\` | ${f.unit === '' ? '-' : f.unit} | ${f.kind}${f.nullable ? ', nullable' : ''} | ${f.description} |`);
  return ['| column | unit | type | meaning |', '|---|---|---|---|', ...rows].join('\n');
}
