/**
 * Direction numbers of the Sobol sequence, 32 bits, for dimensions 1 to 32.
 *
 * Source: S. Joe and F. Y. Kuo, "Constructing Sobol sequences with better two-dimensional
 * projections", SIAM J. Sci. Comput. 30 (2008) 2635-2654; the first rows of their published
 * table new-joe-kuo-6.21201 (dimensions 2..32; dimension 1 is the van der Corput sequence with
 * every m_i = 1). Each row is [d, s, a, m_1 ... m_s]: s is the degree of the primitive
 * polynomial x^s + c_1 x^(s-1) + ... + c_(s-1) x + 1, a encodes c_1 ... c_(s-1) as bits (c_1 the
 * most significant), and m_i are the initial odd integers (m_i < 2^i). The rows were checked
 * against two independent public transcriptions of the table.
 *
 * The full direction numbers follow from the recurrence of Bratley & Fox (1988), ACM TOMS 14,
 * 88-100 (Algorithm 659), in the scaled form of Joe & Kuo:
 *   V_i = m_i 2^(32-i) (i <= s),
 *   V_i = V_(i-s) XOR (V_(i-s) >> s) XOR c_1 V_(i-1) XOR ... XOR c_(s-1) V_(i-s+1) (i > s).
 */

/** Rows [d, s, a, m_1 ... m_s] of new-joe-kuo-6.21201 for d = 2..32 (Joe & Kuo 2008). */
export const JOE_KUO_2008_ROWS: readonly (readonly number[])[] = [
  [2, 1, 0, 1],
  [3, 2, 1, 1, 3],
  [4, 3, 1, 1, 3, 1],
  [5, 3, 2, 1, 1, 1],
  [6, 4, 1, 1, 1, 3, 3],
  [7, 4, 4, 1, 3, 5, 13],
  [8, 5, 2, 1, 1, 5, 5, 17],
  [9, 5, 4, 1, 1, 5, 5, 5],
  [10, 5, 7, 1, 1, 7, 11, 19],
  [11, 5, 11, 1, 1, 5, 1, 1],
  [12, 5, 13, 1, 1, 1, 3, 11],
  [13, 5, 14, 1, 3, 5, 5, 31],
  [14, 6, 1, 1, 3, 3, 9, 7, 49],
  [15, 6, 13, 1, 1, 1, 15, 21, 21],
  [16, 6, 16, 1, 3, 1, 13, 27, 49],
  [17, 6, 19, 1, 1, 1, 15, 7, 5],
  [18, 6, 22, 1, 3, 1, 15, 13, 25],
  [19, 6, 25, 1, 1, 5, 5, 19, 61],
  [20, 7, 1, 1, 3, 7, 11, 23, 15, 103],
  [21, 7, 4, 1, 3, 7, 13, 13, 15, 69],
  [22, 7, 7, 1, 1, 3, 13, 7, 35, 63],
  [23, 7, 8, 1, 3, 5, 9, 1, 25, 53],
  [24, 7, 14, 1, 3, 1, 13, 9, 35, 107],
  [25, 7, 19, 1, 3, 1, 5, 27, 61, 31],
  [26, 7, 21, 1, 1, 5, 11, 19, 41, 61],
  [27, 7, 28, 1, 3, 5, 3, 3, 13, 69],
  [28, 7, 31, 1, 1, 7, 13, 1, 19, 1],
  [29, 7, 32, 1, 3, 7, 5, 13, 19, 59],
  [30, 7, 37, 1, 1, 3, 9, 25, 29, 41],
  [31, 7, 41, 1, 3, 5, 13, 23, 1, 55],
  [32, 7, 42, 1, 3, 7, 3, 13, 59, 17],
];

/** Number of dimensions this table provides (saltelli uses 2k of them for k inputs). */
export const SOBOL_MAX_DIMENSIONS = 32;

/** Bits of every direction number; point indices stay below 2^32. */
export const SOBOL_BITS = 32;

/**
 * The 32 direction numbers of one dimension (1-based `dim`), as unsigned 32-bit integers:
 * element b is V_(b+1), the number XORed in for bit b of the Gray code of the point index.
 */
export function sobolDirectionNumbers(dim: number): Uint32Array {
  if (!Number.isInteger(dim) || dim < 1 || dim > SOBOL_MAX_DIMENSIONS) {
    throw new RangeError(`Sobol dimension ${dim} is outside 1-${SOBOL_MAX_DIMENSIONS}`);
  }
  const v = new Uint32Array(SOBOL_BITS);
  if (dim === 1) {
    for (let i = 1; i <= SOBOL_BITS; i++) v[i - 1] = 2 ** (SOBOL_BITS - i);
    return v;
  }
  const row = JOE_KUO_2008_ROWS[dim - 2];
  const s = row[1];
  const a = row[2];
  for (let i = 1; i <= s; i++) v[i - 1] = row[2 + i] * 2 ** (SOBOL_BITS - i);
  for (let i = s + 1; i <= SOBOL_BITS; i++) {
    let x = v[i - s - 1] ^ (v[i - s - 1] >>> s);
    for (let k = 1; k <= s - 1; k++) {
      if (((a >>> (s - 1 - k)) & 1) === 1) x ^= v[i - k - 1];
    }
    v[i - 1] = x >>> 0;
  }
  return v;
}
