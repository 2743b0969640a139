import { describe, expect, it } from 'vitest';
import fs from 'node:fs';
import { outputColumnsMarkdown, processesMarkdown } from '../src/io/field-table.js';
import { PROCESSES } from '../src/process/registry.js';
import { paramTableMarkdown } from '../src/physics/param-table.js';

const readme = fs.readFileSync(new URL('../README.md', import.meta.url), 'utf8');

describe('README tables come from the registries', () => {
  it('holds the output-column table generated from the field registry', () => {
    expect(readme).toContain(outputColumnsMarkdown());
  });
  it('holds the output-column table of every built-in process', () => {
    for (const p of PROCESSES) expect(readme, p.name).toContain(outputColumnsMarkdown(p.name));
  });
  it('holds the table of processes generated from the process registry', () => {
    expect(readme).toContain(processesMarkdown());
  });
  it('holds the parameter table generated from the parameter registry', () => {
    expect(readme).toContain(paramTableMarkdown());
  });
  it('quick start has exactly the two contract commands', () => {
    expect(readme).toContain('npm ci && npm start');
    expect(readme).toContain('npm ci && npm test');
    expect(readme).toMatch(/not a tool for volcanic hazard assessment/);
  });
});
