/**
 * Seeded bijective permutation of [0, size) computed point by point, without a table: a
 * balanced Feistel network on the smallest even-bit domain 2^(2h) >= size, with cycle walking
 * (re-encrypt until the result falls inside [0, size)). Any bijection on the domain stays a
 * bijection on [0, size) under cycle walking (Black & Rogaway 2002, "Ciphers with arbitrary
 * finite domains"). Memory is O(1) whatever the size.
 */
import { absorb, fmix32 } from './mix.js';

/** Feistel rounds; four rounds of a good round function already scramble every bit. */
const ROUNDS = 4;

/** Largest size supported: halves of up to 26 bits keep every step in exact 32-bit arithmetic. */
const MAX_SIZE = 2 ** 52;

/** A keyed permutation of [0, size). */
export interface IndexPermutation {
  readonly size: number;
  /** the image of i (0 <= i < size); distinct i give distinct results */
  apply(i: number): number;
}

/** Build the permutation of [0, size) selected by a 32-bit key. */
export function makePermutation(size: number, key: number): IndexPermutation {
  if (!Number.isInteger(size) || size < 1 || size > MAX_SIZE) throw new RangeError(`permutation size ${size} must be a whole number from 1 to 2^52`);
  if (size === 1) return { size, apply: () => 0 };
  let bits = 1;
  while (2 ** bits < size) bits++;
  const halfBits = Math.ceil(bits / 2);
  const half = 2 ** halfBits;
  const mask = half - 1;
  // round keys as signed 32-bit words (unboxed in the JIT)
  const keys = Array.from({ length: ROUNDS }, (_, r) => absorb(key, r + 1));
  const [k0, k1, k2, k3] = keys;

  // domains up to 2^30 use pure 32-bit integer steps; larger ones split with exact float division
  const encrypt =
    halfBits <= 15
      ? (x: number): number => {
          let l = x >>> halfBits;
          let r = x & mask;
          let t: number;
          t = r; r = (l ^ fmix32(r ^ k0)) & mask; l = t;
          t = r; r = (l ^ fmix32(r ^ k1)) & mask; l = t;
          t = r; r = (l ^ fmix32(r ^ k2)) & mask; l = t;
          t = r; r = (l ^ fmix32(r ^ k3)) & mask; l = t;
          return (l << halfBits) | r;
        }
      : (x: number): number => {
          let l = Math.floor(x / half);
          let r = x - l * half;
          let t: number;
          t = r; r = (l ^ fmix32(r ^ k0)) & mask; l = t;
          t = r; r = (l ^ fmix32(r ^ k1)) & mask; l = t;
          t = r; r = (l ^ fmix32(r ^ k2)) & mask; l = t;
          t = r; r = (l ^ fmix32(r ^ k3)) & mask; l = t;
          return l * half + r;
        };

  return {
    size,
    apply(i: number): number {
      let x = encrypt(i);
      while (x >= size) x = encrypt(x);
      return x;
    },
  };
}
