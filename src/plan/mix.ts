/**
 * Counter-based hashing: random-looking 32-bit words from (seed, stream, index) with no
 * generator state, so any point can be computed on its own and any index range filled
 * independently. The mixer is the 32-bit finaliser of MurmurHash3 (fmix32, public domain),
 * a bijection on 32-bit words with full avalanche.
 *
 * Words are kept as signed 32-bit integers inside loops (they stay unboxed small integers in
 * the JIT); convert with `>>> 0` where an unsigned value is needed.
 */

/** MurmurHash3 fmix32: bijective 32-bit mixer. Returns the word as a signed 32-bit integer. */
export function fmix32(h: number): number {
  h ^= h >>> 16;
  h = Math.imul(h, 0x85ebca6b);
  h ^= h >>> 13;
  h = Math.imul(h, 0xc2b2ae35);
  return h ^ (h >>> 16);
}

/** Fold one more 32-bit word into a running hash (signed 32-bit result). */
export function absorb(h: number, word: number): number {
  return fmix32((Math.imul(h ^ word, 0x9e3779b1) + 0x7f4a7c15) | 0);
}

/**
 * An unsigned 32-bit key from a seed (whole number below 2^53) and small integer tags naming
 * the purpose (stream), the input and the round.
 */
export function deriveKey(seed: number, ...tags: readonly number[]): number {
  // ToUint32 (>>> 0) is exact modulo 2^32 for integers below 2^53
  let h = absorb(absorb(0x243f6a88, seed >>> 0), Math.floor(seed / 4294967296));
  for (const t of tags) h = absorb(h, t);
  return h >>> 0;
}

const TWO_POW_M32 = 2 ** -32;
const TWO_POW_M53 = 2 ** -53;

/**
 * Uniform double in [0, 1) with 53 random bits from a key and an index below 2^53:
 * the same (key, index) always gives the same number.
 */
export function hashUnit(key: number, index: number): number {
  const h1 = absorb(absorb(key, index | 0), (index / 4294967296) | 0);
  const h2 = absorb(h1, 0x68e31da4);
  return (h1 >>> 0) * TWO_POW_M32 + (h2 >>> 11) * TWO_POW_M53;
}
