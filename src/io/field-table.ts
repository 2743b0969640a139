/**
 * The output-columns table of the README, generated from the field registry so the
 * documentation cannot drift from what is written (a test checks the README holds it).
 */
import { resultFieldInfos } from './arrow-schema.js';

export function outputColumnsMarkdown(): string {
  const rows = resultFieldInfos(true).map((f) => {
    const type = f.kind === 'status' ? 'dictionary<utf8>' : f.kind;
    return `| \`${f.name}\` | ${f.unit === '' ? '-' : f.unit} | ${type}${f.nullable ? ', nullable' : ''} | ${f.description} |`;
  });
  return ['| column | unit | type | meaning |', '|---|---|---|---|', ...rows].join('\n');
}
