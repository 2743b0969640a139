/**
 * A tiny seeded pseudo-random generator for the bootstrap. Each call to {@link createRng} returns
 * an independent generator with its own state; nothing is kept at module level.
 */

/** Uniform draws in [0, 1) and uniform integers in [0, n). */
export interface Rng {
  next(): number;
  /** an integer in [0, n), n >= 1 */
  below(n: number): number;
}

/**
 * Mulberry32 (a 32-bit multiply-xorshift generator, public domain). Period 2^32, ample for
 * resampling up to a few million base rows a few hundred times.
 */
export function createRng(seed: number): Rng {
  let state = seed >>> 0;
  const nextUint = (): number => {
    state = (state + 0x6d2b79f5) >>> 0;
    let t = state;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return (t ^ (t >>> 14)) >>> 0;
  };
  return {
    next: () => nextUint() / 4294967296,
    below: (n: number) => Math.floor((nextUint() / 4294967296) * n),
  };
}

/**
 * Derive a 32-bit seed from a base seed and labels (FNV-1a over the labels), so that each
 * (output, input group) gets its own stream whatever order they are analysed in.
 */
export function deriveSeed(seed: number, ...labels: readonly string[]): number {
  let h = (0x811c9dc5 ^ (seed >>> 0)) >>> 0;
  h = Math.imul(h, 0x01000193) >>> 0;
  for (const label of labels) {
    for (let i = 0; i < label.length; i++) {
      h ^= label.charCodeAt(i);
      h = Math.imul(h, 0x01000193) >>> 0;
    }
    h ^= 0xff; // label separator
    h = Math.imul(h, 0x01000193) >>> 0;
  }
  return h >>> 0;
}
