/**
 * The 15-point Gauss–Kronrod rule with its embedded 7-point Gauss–Legendre rule (Kronrod 1965;
 * the constants as tabulated in QUADPACK, Piessens et al. 1983, routine qk15, from memory; the
 * tests check them: exact for polynomials up to degree 22 and 13 respectively, weights sum to 2).
 * |K15 - G7| estimates the error of the Gauss rule and bounds that of the Kronrod result.
 */

/** Abscissae on [-1, 1], non-negative half: odd indices are the Gauss nodes (index 7 = 0). */
export const KRONROD15_NODES: readonly number[] = Object.freeze([
  0.991455371120812639206854697526329, 0.949107912342758524526189684047851, 0.864864423359769072789712788640926,
  0.741531185599394439863864773280788, 0.586087235467691130294144845693013, 0.405845151377397166906606412076961,
  0.207784955007898467600689403773245, 0,
]);

/** Kronrod weights of KRONROD15_NODES. */
export const KRONROD15_WEIGHTS: readonly number[] = Object.freeze([
  0.02293532201052922496373200805897, 0.063092092629978553290700663189204, 0.104790010322250183839876322541518,
  0.140653259715525918745189590510238, 0.16900472663926790282658342659855, 0.190350578064785409913256402421014,
  0.204432940075298892414161999234649, 0.209482141084727828012999174891714,
]);

/** Gauss–Legendre 7-point weights of KRONROD15_NODES[1], [3], [5], [7]. */
export const GAUSS7_WEIGHTS: readonly number[] = Object.freeze([
  0.129484966168869693270611432679082, 0.27970539148927666790146777142378, 0.381830050505118944950369775488975,
  0.417959183673469387755102040816327,
]);

/** The 15 abscissae of [-1, 1] in ascending order (handy for callers that evaluate in a loop). */
export const KRONROD15_ASCENDING: readonly number[] = Object.freeze([
  ...KRONROD15_NODES.slice(0, 7).map((x) => -x),
  0,
  ...KRONROD15_NODES.slice(0, 7).reverse(),
]);

/** Kronrod weight of each KRONROD15_ASCENDING abscissa. */
export const KRONROD15_WEIGHTS_ASCENDING: readonly number[] = Object.freeze([
  ...KRONROD15_WEIGHTS.slice(0, 7),
  KRONROD15_WEIGHTS[7],
  ...KRONROD15_WEIGHTS.slice(0, 7).reverse(),
]);

/** Gauss weight of each KRONROD15_ASCENDING abscissa (0 where the node is Kronrod-only). */
export const GAUSS7_WEIGHTS_ASCENDING: readonly number[] = Object.freeze(
  KRONROD15_ASCENDING.map((_, i) => {
    const k = i <= 7 ? i : 14 - i; // index into the non-negative half
    return k % 2 === 1 ? GAUSS7_WEIGHTS[(k - 1) / 2] : 0;
  }),
);
