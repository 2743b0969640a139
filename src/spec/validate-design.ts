/**
 * Validation of the `design` section: grid, latin-hypercube, sobol or saltelli, with their
 * sizes and seeds. `design: sobol` is accepted as a short form of `design: { kind: sobol }`.
 */
import { MAX_POINTS, MAX_SEED, MAX_SOBOL_INDEX } from './limits.js';
import { describeFound, isMapping, readChoice, readWholeNumber, unknownKeyText, type ProblemList } from './problems.js';
import { suggestName } from './suggest.js';
import type { DesignKind, DesignSpec } from './types.js';

/** The design kinds, in the order they are listed in messages. */
export const DESIGN_KINDS: readonly DesignKind[] = ['grid', 'latin-hypercube', 'sobol', 'saltelli'];

/** Keys each design kind takes. */
export const DESIGN_KEYS: Readonly<Record<DesignKind, readonly string[]>> = {
  grid: ['kind'],
  'latin-hypercube': ['kind', 'samples', 'seed'],
  sobol: ['kind', 'samples', 'skip', 'seed'],
  saltelli: ['kind', 'base', 'skip', 'seed'],
};

const ALL_DESIGN_KEYS = ['kind', 'samples', 'base', 'skip', 'seed'];

/** Why a key known to other designs is not used by this one. */
function keyHint(key: string, kind: DesignKind): string {
  if (key === 'samples' && kind === 'grid') return ' (a grid takes its size from its axes)';
  if (key === 'samples' && kind === 'saltelli') return ' (it takes base N and makes N (k + 2) points)';
  if (key === 'base') return ' (base is the N of a saltelli design)';
  if (key === 'skip') return ' (skip applies to the Sobol sequence of sobol and saltelli designs)';
  if (key === 'seed' && kind === 'grid') return ' (a grid has no randomness)';
  return '';
}

/** Result of validating `design`; `kind` is known whenever the kind itself was valid. */
export interface DesignResult {
  readonly design: DesignSpec | undefined;
  readonly kind: DesignKind | undefined;
}

/** Validate `design`; absent means `{ kind: grid }`. */
export function validateDesign(raw: unknown, problems: ProblemList): DesignResult {
  if (raw === undefined || raw === null) return { design: { kind: 'grid' }, kind: 'grid' };
  const body: Record<string, unknown> | undefined = typeof raw === 'string' ? { kind: raw } : isMapping(raw) ? raw : undefined;
  if (body === undefined) {
    problems.add('design', `${describeFound(raw)} is not a design; write { kind: grid } or { kind: latin-hypercube, samples: ..., seed: ... }`);
    return { design: undefined, kind: undefined };
  }
  if (body.kind === undefined) {
    problems.add('design.kind', `missing; allowed: ${DESIGN_KINDS.join(', ')}`);
    return { design: undefined, kind: undefined };
  }
  const kind = readChoice(body.kind, DESIGN_KINDS, 'design.kind', problems, 'a design kind');
  if (kind === undefined) {
    for (const key of Object.keys(body)) {
      if (!ALL_DESIGN_KEYS.includes(key)) problems.add(`design.${key}`, unknownKeyText(key, ALL_DESIGN_KEYS));
    }
    return { design: undefined, kind: undefined };
  }
  const before = problems.count;
  const allowed = DESIGN_KEYS[kind];
  const suggested: string[] = [];
  for (const key of Object.keys(body)) {
    if (allowed.includes(key)) continue;
    if (ALL_DESIGN_KEYS.includes(key)) {
      problems.add(`design.${key}`, `not used by a ${kind} design${keyHint(key, kind)}; allowed keys: ${allowed.join(', ')}`);
    } else {
      problems.add(`design.${key}`, unknownKeyText(key, allowed));
      const near = suggestName(key, allowed);
      if (near !== null) suggested.push(near);
    }
  }
  const design = buildDesign(kind, body, suggested, problems);
  return { design: problems.count === before ? design : undefined, kind };
}

function required(
  body: Record<string, unknown>,
  key: string,
  kind: DesignKind,
  min: number,
  max: number,
  suggested: readonly string[],
  problems: ProblemList,
): number | undefined {
  if (body[key] === undefined) {
    // a misspelt key was already reported with this name suggested
    if (suggested.includes(key)) return undefined;
    problems.add(`design.${key}`, `missing; a ${kind} design needs ${key} (a whole number from ${min} to ${max})`);
    return undefined;
  }
  return readWholeNumber(body[key], `design.${key}`, problems, key, min, max);
}

function optional(body: Record<string, unknown>, key: string, fallback: number | undefined, min: number, max: number, problems: ProblemList): number | undefined {
  if (body[key] === undefined) return fallback;
  return readWholeNumber(body[key], `design.${key}`, problems, key, min, max);
}

function buildDesign(kind: DesignKind, body: Record<string, unknown>, suggested: readonly string[], problems: ProblemList): DesignSpec | undefined {
  switch (kind) {
    case 'grid':
      return { kind };
    case 'latin-hypercube': {
      const samples = required(body, 'samples', kind, 1, MAX_POINTS, suggested, problems);
      const seed = optional(body, 'seed', 0, 0, MAX_SEED, problems);
      return samples === undefined || seed === undefined ? undefined : { kind, samples, seed };
    }
    case 'sobol': {
      const samples = required(body, 'samples', kind, 1, MAX_SOBOL_INDEX, suggested, problems);
      const skip = optional(body, 'skip', 0, 0, MAX_SOBOL_INDEX - 1, problems);
      const seed = optional(body, 'seed', undefined, 0, MAX_SEED, problems);
      if (samples === undefined || skip === undefined) return undefined;
      if (!checkSobolLength(samples, skip, 'samples', problems)) return undefined;
      return seed === undefined ? { kind, samples, skip } : { kind, samples, skip, seed };
    }
    case 'saltelli': {
      const base = required(body, 'base', kind, 1, MAX_SOBOL_INDEX, suggested, problems);
      const skip = optional(body, 'skip', 0, 0, MAX_SOBOL_INDEX - 1, problems);
      const seed = optional(body, 'seed', undefined, 0, MAX_SEED, problems);
      if (base === undefined || skip === undefined) return undefined;
      if (!checkSobolLength(base, skip, 'base', problems)) return undefined;
      return seed === undefined ? { kind, base, skip } : { kind, base, skip, seed };
    }
  }
}

function checkSobolLength(n: number, skip: number, key: string, problems: ProblemList): boolean {
  if (n + skip <= MAX_SOBOL_INDEX) return true;
  problems.add(
    `design.${key}`,
    `${n} with skip ${skip} needs ${n + skip} Sobol points, more than the ${MAX_SOBOL_INDEX} (2^32) of the 32-bit sequence`,
  );
  return false;
}
