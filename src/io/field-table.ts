/**
 * The output-columns table of the README, generated from the field registry so the
 * documentation cannot drift from what is written (a test checks the README holds it).
 */
import { PROFILE_TABLE_FIELDS, type FieldInfo } from '../physics/fields.js';
import { resultFieldInfos, SCENARIO_ID_FIELD } from './arrow-schema.js';

export function outputColumnsMarkdown(): string {
  const rows = resultFieldInfos(true).map((f) => {
    const type = f.kind === 'status' ? 'dictionary<utf8>' : f.kind;
    return `| \`${f.name}\` | ${f.unit === '' ? '-' : f.unit} | ${type}${f.nullable ? ', nullable' : ''} | ${f.description} |`;
  });
  return ['| column | unit | type | meaning |', '|---|---|---|---|', ...rows].join('\n');
}

/** The profile-table columns of the README (`run --profiles`), from the same registry. */
export function profileColumnsMarkdown(): string {
  const fields: readonly FieldInfo[] = [SCENARIO_ID_FIELD, ...PROFILE_TABLE_FIELDS];
  const rows = fields.map((f) => `| \`${f.name}\` | ${f.unit === '' ? '-' : f.unit} | ${f.kind}${f.nullable ? ', nullable' : ''} | ${f.description} |`);
  return ['| column | unit | type | meaning |', '|---|---|---|---|', ...rows].join('\n');
}
