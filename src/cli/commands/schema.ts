import type { Command } from 'commander';
import { sweepJsonSchemaText } from '../../spec/sweep-schema.js';

export function registerSchema(program: Command): void {
  program
    .command('schema')
    .description(
      'print the JSON Schema (draft 2020-12) of a sweep file, generated from the validator\'s own tables, for editors: save it beside your sweeps and start each file with "# yaml-language-server: $schema=./sweep.schema.json"',
    )
    .action(() => {
      process.stdout.write(sweepJsonSchemaText());
    });
}
