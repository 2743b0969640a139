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

/** A whole-number key of a design (samples, base, skip, seed): its allowed range and default. */
export interface DesignNumberKey {
  readonly min: number;
  readonly max: number;
  /** true when the design needs the key; otherwise `fallback` applies when it is left out */
  readonly required: boolean;
  /** value when left out (undefined: absent from the spec) */
  readonly fallback?: number;
  readonly description: string;
}

const SEED_TEXT = 'seed of the random numbers (the same seed gives the same points on every machine)';
const SKIP_TEXT = 'leading Sobol points dropped (default 0 keeps the first point)';

/**
 * The whole-number keys each design kind takes, with their ranges: read by the validator below
 * and by the JSON Schema of the sweep file (sweep-schema.ts), so the two cannot disagree.
 */
export const DESIGN_NUMBER_KEYS: Readonly<Record<DesignKind, Readonly<Record<string, DesignNumberKey>>>> = {
  grid: {},
  'latin-hypercube': {
    samples: { min: 1, max: MAX_POINTS, required: true, description: 'number of points; each axis gets one in each of this many equal-probability strata' },
    seed: { min: 0, max: MAX_SEED, required: false, fallback: 0, description: `${SEED_TEXT}; default 0` },
  },
  sobol: {
    samples: { min: 1, max: MAX_SOBOL_INDEX, required: true, description: 'number of Sobol points' },
    skip: { min: 0, max: MAX_SOBOL_INDEX - 1, required: false, fallback: 0, description: SKIP_TEXT },
    seed: { min: 0, max: MAX_SEED, required: false, description: `${SEED_TEXT}; absent: the unscrambled sequence, present: a random digital shift` },
  },
  saltelli: {
    base: { min: 1, max: MAX_SOBOL_INDEX, required: true, description: 'base N: the design has N (k + 2) points for k swept inputs' },
    skip: { min: 0, max: MAX_SOBOL_INDEX - 1, required: false, fallback: 0, description: SKIP_TEXT },
    seed: { min: 0, max: MAX_SEED, required: false, description: `${SEED_TEXT}; absent: the unscrambled sequence, present: a random digital shift` },
  },
};

/** Keys each design kind takes. */
const DESIGN_KEYS: Readonly<Record<DesignKind, readonly string[]>> = {
  grid: ['kind', ...Object.keys(DESIGN_NUMBER_KEYS.grid)],
  'latin-hypercube': ['kind', ...Object.keys(DESIGN_NUMBER_KEYS['latin-hypercube'])],
  sobol: ['kind', ...Object.keys(DESIGN_NUMBER_KEYS.sobol)],
  saltelli: ['kind', ...Object.keys(DESIGN_NUMBER_KEYS.saltelli)],
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

function required(body: Record<string, unknown>, key: string, kind: DesignKind, suggested: readonly string[], problems: ProblemList): number | undefined {
  const { min, max } = numberKey(kind, key);
  if (body[key] === undefined) {
    // a misspelt key was already reported with this name suggested
    if (suggested.includes(key)) return undefined;
    problems.add(`design.${key}`, `missing; a ${kind} design needs ${key} (a whole number from ${min} to ${max})`);
    return undefined;
  }
  return readWholeNumber(body[key], `design.${key}`, problems, key, min, max);
}

function optional(body: Record<string, unknown>, key: string, kind: DesignKind, problems: ProblemList): number | undefined {
  const { min, max, fallback } = numberKey(kind, key);
  if (body[key] === undefined) return fallback;
  return readWholeNumber(body[key], `design.${key}`, problems, key, min, max);
}

function numberKey(kind: DesignKind, key: string): DesignNumberKey {
  const k = DESIGN_NUMBER_KEYS[kind][key];
  if (k === undefined) throw new Error(`validate-design: ${kind} has no key ${key}`);
  return k;
}

function buildDesign(kind: DesignKind, body: Record<string, unknown>, suggested: readonly string[], problems: ProblemList): DesignSpec | undefined {
  switch (kind) {
    case 'grid':
      return { kind };
    case 'latin-hypercube': {
      const samples = required(body, 'samples', kind, suggested, problems);
      const seed = optional(body, 'seed', kind, problems);
      return samples === undefined || seed === undefined ? undefined : { kind, samples, seed };
    }
    case 'sobol': {
      const samples = required(body, 'samples', kind, suggested, problems);
      const skip = optional(body, 'skip', kind, problems);
      const seed = optional(body, 'seed', kind, problems);
      if (samples === undefined || skip === undefined) return undefined;
      if (!checkSobolLength(samples, skip, 'samples', problems)) return undefined;
      return seed === undefined ? { kind, samples, skip } : { kind, samples, skip, seed };
    }
    case 'saltelli': {
      const base = required(body, 'base', kind, suggested, problems);
      const skip = optional(body, 'skip', kind, problems);
      const seed = optional(body, 'seed', kind, problems);
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
