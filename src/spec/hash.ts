/**
 * Identity of a sweep: sha256 of the canonical JSON of its normalized spec. Stored with the
 * output so a resumed or sharded run can check it is continuing the same sweep.
 */
import { createHash } from 'node:crypto';
import { normalizeSweep } from './normalize.js';
import type { SweepSpec } from './types.js';

/** JSON with object keys sorted at every level (arrays keep their order), no whitespace. */
export function canonicalJson(value: unknown): string {
  return JSON.stringify(sortKeys(value));
}

function sortKeys(value: unknown): unknown {
  if (Array.isArray(value)) return value.map(sortKeys);
  if (typeof value === 'object' && value !== null) {
    const obj = value as Record<string, unknown>;
    const out: Record<string, unknown> = {};
    for (const key of Object.keys(obj).sort()) {
      if (obj[key] !== undefined) out[key] = sortKeys(obj[key]);
    }
    return out;
  }
  return value;
}

/** sha256 (64 lowercase hex digits) of the canonical JSON of the normalized spec. */
export function sweepHash(spec: SweepSpec): string {
  return createHash('sha256').update(canonicalJson(normalizeSweep(spec))).digest('hex');
}
