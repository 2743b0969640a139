/**
 * The solid (melt-free) mantle adiabat.
 *
 * dT/dP = alpha_s T / (rho_s c_P)  =>  T(P) = Tp[K] exp(alpha_s P / (rho_s c_P)), P in Pa
 * (project physics reference; the solid part of the entropy relation of Katz, Spiegelman &
 * Langmuir 2003, G-cubed 4(9), 1073, appendix). Tp is the potential temperature: the adiabat
 * extrapolated to P = 0.
 */
import type { MeltParams } from './params.js';
import { KELVIN_OFFSET, PA_PER_GPA } from './units.js';

/** Temperature (K) of the solid adiabat with potential temperature tpC (degC) at pGpa (GPa). */
export function adiabatTempK(tpC: number, pGpa: number, p: MeltParams): number {
  return (tpC + KELVIN_OFFSET) * Math.exp((p.alpha_s * pGpa * PA_PER_GPA) / (p.rho_s * p.c_P));
}

/** Temperature (degC) of the solid adiabat with potential temperature tpC (degC) at pGpa (GPa). */
export function adiabatTempC(tpC: number, pGpa: number, p: MeltParams): number {
  return adiabatTempK(tpC, pGpa, p) - KELVIN_OFFSET;
}

/**
 * Gradient of the solid adiabat with depth, K/km: dT/dz = (dT/dP)(dP/dz) = alpha_s g T / c_P
 * (z = P / (rho_s g)).
 */
export function adiabatGradientKPerKm(tpC: number, pGpa: number, p: MeltParams): number {
  return ((p.alpha_s * p.g * adiabatTempK(tpC, pGpa, p)) / p.c_P) * 1000;
}
