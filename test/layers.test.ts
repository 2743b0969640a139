/**
 * Imports flow one way between the stages (DEVELOPERS.md, Layout): the rules below are read from
 * the import statements of every source file, so a new import against them fails here.
 */
import { describe, expect, it } from 'vitest';
import fs from 'node:fs';
import path from 'node:path';
import { ROOT } from './helpers.js';

const SRC = path.join(ROOT, 'src');

/** The stage folders each stage must not import from. */
const FORBIDDEN: Readonly<Record<string, readonly string[]>> = {
  physics: ['process', 'spec', 'plan', 'run', 'io', 'analyze', 'fit', 'report', 'cluster', 'cli'],
  // analyze and fit work on tables: no physics, no files
  analyze: ['physics', 'process', 'plan', 'run', 'io', 'fit', 'report', 'cluster', 'cli'],
  fit: ['physics', 'process', 'plan', 'run', 'io', 'analyze', 'report', 'cluster', 'cli'],
  io: ['run', 'report', 'cluster', 'cli'],
  run: ['report', 'cluster', 'cli'],
  report: ['run', 'cluster', 'cli'],
};

/** The stage folders a source file imports from (relative imports only). */
function importedStages(file: string): string[] {
  const text = fs.readFileSync(file, 'utf8');
  const stages = new Set<string>();
  for (const m of text.matchAll(/(?:import|export)[^'"]*?from\s+'(\.{1,2}\/[^']+)'|import\(\s*'(\.{1,2}\/[^']+)'\s*\)/g)) {
    const target = path.relative(SRC, path.resolve(path.dirname(file), m[1] ?? m[2]));
    const stage = target.split(path.sep)[0];
    if (!target.startsWith('..') && target.includes(path.sep)) stages.add(stage);
  }
  return [...stages];
}

describe('imports flow one way', () => {
  for (const [stage, forbidden] of Object.entries(FORBIDDEN)) {
    it(`${stage} imports none of ${forbidden.join(', ')}`, () => {
      const files = fs.readdirSync(path.join(SRC, stage), { recursive: true }).map(String).filter((f) => f.endsWith('.ts'));
      expect(files.length).toBeGreaterThan(0);
      const bad = files.flatMap((f) => importedStages(path.join(SRC, stage, f)).filter((s) => forbidden.includes(s)).map((s) => `src/${stage}/${f} imports src/${s}`));
      expect(bad).toEqual([]);
    });
  }
});
