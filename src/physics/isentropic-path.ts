/**
 * What an integration of the isentropic melting path returns (fixed-step: isentropic-column.ts;
 * error-controlled: isentropic-adaptive.ts), and the quadrature of the first interval above a
 * point where F starts as a power of the distance (the onset).
 */
import type { ColumnProfile } from './types.js';

/** The melting path from onset to top, with the integrals the column aggregates need. */
export interface IsentropicPath {
  /** number of pressure steps taken */
  readonly steps: number;
  /** melt fraction at the top */
  readonly fTop: number;
  /** largest melt fraction on the path (equal to fTop: F never decreases) */
  readonly fMax: number;
  /** temperature at the top, degC */
  readonly tTopC: number;
  /** int F dP from top to onset (trapezoid on the step points), GPa */
  readonly meltIntegralGpa: number;
  /** int W dP, W = water carried by the melt per unit mass of source, wt% GPa */
  readonly waterIntegralWtPctGpa: number;
  /** water carried by the melt per unit mass of source at the top, wt% */
  readonly waterExtractedWtPct: number;
  /** water left in the residue at the top, wt% of the residue */
  readonly residueWaterWtPct: number;
  /** present when requested: the path from onset (index 0) to top */
  readonly profile?: ColumnProfile;
}

/**
 * int_0^h y dDelta for y = a Delta^m + b Delta^n (m = beta1, n = 2 beta1 - 1) with y(h) = yEnd and
 * dy/dDelta(h) = slopeEnd: exact for the two leading terms of the melt fraction above the onset.
 */
export function onsetIntervalIntegral(yEnd: number, slopeEnd: number, h: number, beta1: number): number {
  const m = beta1;
  const n = 2 * beta1 - 1;
  const bTerm = (slopeEnd * h - m * yEnd) / (n - m);
  const aTerm = yEnd - bTerm;
  return h * (aTerm / (m + 1) + bTerm / (n + 1));
}
