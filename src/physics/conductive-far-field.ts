/**
 * The sub-solidus steady solution of the conductive column, imposed at the bottom of its domain
 * (project physics reference, "Upwelling rate and conductive loss (1D steady column)").
 *
 * Without melt the steady energy balance of solid rising at w (z positive down) is
 *     kappa T'' + w T' = w a T,   a = alpha_s g / c_P,
 * whose solutions are exp(m z) with kappa m^2 + w m - w a = 0:
 *     m+ = (w / (2 kappa)) (sqrt(1 + 4 kappa a / w) - 1) > 0  (the slowly growing far field),
 *     m- = -(w / (2 kappa)) (sqrt(1 + 4 kappa a / w) + 1) < 0  (the boundary layer, decaying downward).
 * The far field T = Tp[K] exp(m+ z) is the steady column of potential temperature Tp: it tends to
 * the solid adiabat Tp exp(a z) as w -> infinity and stays a steady solution at any depth, unlike
 * the adiabat (k T_ad'' != 0), so a column that imposes it at a depth z_b well below the lid's and
 * the melting region's boundary layers (z_b >= onset + 10 kappa/w) does not depend on z_b.
 */
import type { MeltParams } from './params.js';
import { KELVIN_OFFSET } from './units.js';

/**
 * m+ (1/m), the growth rate with depth of the sub-solidus steady solution, written as
 * 2a / (1 + sqrt(1 + 4 kappa a / w)) (the same number without the cancellation at large w).
 *
 * @param wMPerS upwelling rate, m/s (> 0)
 * @param kappaM2S thermal diffusivity, m2/s
 */
export function farFieldGrowthPerM(wMPerS: number, kappaM2S: number, p: MeltParams): number {
  const a = (p.alpha_s * p.g) / p.c_P;
  return (2 * a) / (1 + Math.sqrt(1 + (4 * kappaM2S * a) / wMPerS));
}

/** m- (1/m), the (negative) decay rate with depth of the boundary-layer solution. */
export function boundaryLayerDecayPerM(wMPerS: number, kappaM2S: number, p: MeltParams): number {
  const a = (p.alpha_s * p.g) / p.c_P;
  return -(wMPerS / (2 * kappaM2S)) * (Math.sqrt(1 + (4 * kappaM2S * a) / wMPerS) + 1);
}

/**
 * Temperature (K) of the sub-solidus steady far field at depth zM (m): Tp[K] exp(m+ z).
 *
 * @param tpC mantle potential temperature, degC
 * @param zM depth below the surface, m
 * @param wMPerS upwelling rate, m/s (> 0)
 * @param kappaM2S thermal diffusivity, m2/s
 */
export function farFieldTempK(tpC: number, zM: number, wMPerS: number, kappaM2S: number, p: MeltParams): number {
  return (tpC + KELVIN_OFFSET) * Math.exp(farFieldGrowthPerM(wMPerS, kappaM2S, p) * zM);
}
