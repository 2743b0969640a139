/** The README's parameter table, generated from the parameter registry (a test keeps them in step). */
import { PARAM_INFO, PARAM_NAMES } from './params.js';

export function paramTableMarkdown(): string {
  const rows = PARAM_NAMES.map((n) => {
    const i = PARAM_INFO[n];
    return `| \`${n}\` | ${i.value} | ${i.unit} | ${i.min} to ${i.max} | ${i.description} |`;
  });
  return ['| name | default | unit | plausible range | meaning |', '|---|---|---|---|---|', ...rows].join('\n');
}
