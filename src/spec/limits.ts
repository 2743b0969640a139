/**
 * Size limits of a sweep. Points are addressed by plain numbers (exact up to 2^53), so the
 * limits are about what a sweep can sensibly mean, not about memory: nothing proportional to
 * the point count is ever materialised.
 */

/**
 * Largest sweep file read, bytes (4 MiB): a sweep describes axes, not data; the largest sensible
 * one (a few axes of MAX_AXIS_VALUES listed values) is about 2 MB.
 */
export const MAX_SWEEP_FILE_BYTES = 4 * 1024 * 1024;

/** Largest number of points a plan may have (2^40, about 1.1e12). */
export const MAX_POINTS = 2 ** 40;

/** Largest number of values one grid axis may have (they are stored in the spec). */
export const MAX_AXIS_VALUES = 100_000;

/** Largest seed (2^53 - 1): seeds are whole numbers 0..MAX_SEED. */
export const MAX_SEED = Number.MAX_SAFE_INTEGER;

/**
 * Sobol points are computed with 32-bit direction numbers, so indices (skip + samples) stay
 * below 2^32; past that the sequence would repeat.
 */
export const MAX_SOBOL_INDEX = 2 ** 32;

/** Smallest allowed isentropic pressure step, GPa. */
export const STEP_GPA_MIN = 0.001;
/** Largest allowed isentropic pressure step, GPa. */
export const STEP_GPA_MAX = 0.5;
/** The isentropic pressure step, GPa, of sweeps made before tolerances existed (and of --step without a value). */
export const STEP_GPA_DEFAULT = 0.05;
/** Smallest allowed relative tolerance of the isentropic column. */
export const TOLERANCE_MIN = 1e-6;
/** Largest allowed relative tolerance of the isentropic column. */
export const TOLERANCE_MAX = 1e-2;
/** Default relative tolerance of the isentropic column. */
export const TOLERANCE_DEFAULT = 1e-4;
/** Default and smallest relative tolerance of the conductive column (its grid control stops at resolution 64). */
export { DEFAULT_CONDUCTIVE_TOLERANCE as CONDUCTIVE_TOLERANCE_DEFAULT, CONDUCTIVE_TOLERANCE_MIN } from '../physics/conductive-tolerance.js';
