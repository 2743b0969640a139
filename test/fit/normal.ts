/**
 * The normal distribution and the normal truncated to [lo, hi], in closed form, for checking fits.
 * Phi from the erfc continued-fraction-free rational approximation of Abramowitz & Stegun 7.1.26
 * (absolute error below 1.5e-7); quantiles by bisection on it; truncated-normal moments from
 * Johnson, Kotz & Balakrishnan, Continuous Univariate Distributions vol. 1 (1994), section 10.1.
 */

/** erf(x), Abramowitz & Stegun (1964) 7.1.26. */
export function erf(x: number): number {
  const s = Math.sign(x);
  const a = Math.abs(x);
  const t = 1 / (1 + 0.3275911 * a);
  const y = 1 - ((((1.061405429 * t - 1.453152027) * t + 1.421413741) * t - 0.284496736) * t + 0.254829592) * t * Math.exp(-a * a);
  return s * y;
}

export const phi = (z: number): number => Math.exp(-0.5 * z * z) / Math.sqrt(2 * Math.PI);
export const Phi = (z: number): number => 0.5 * (1 + erf(z / Math.SQRT2));

/** z with Phi(z) = p, by bisection. */
export function PhiInv(p: number): number {
  let lo = -10;
  let hi = 10;
  for (let i = 0; i < 200; i++) {
    const mid = 0.5 * (lo + hi);
    if (Phi(mid) < p) lo = mid;
    else hi = mid;
  }
  return 0.5 * (lo + hi);
}

/** Mean, sd and quantiles of N(mu, sigma^2) truncated to [lo, hi]. */
export function truncatedNormal(mu: number, sigma: number, lo: number, hi: number) {
  const a = (lo - mu) / sigma;
  const b = (hi - mu) / sigma;
  const z = Phi(b) - Phi(a);
  const r = (phi(a) - phi(b)) / z;
  const mean = mu + sigma * r;
  const variance = sigma * sigma * (1 + (a * phi(a) - b * phi(b)) / z - r * r);
  const q = (p: number): number => mu + sigma * PhiInv(Phi(a) + p * z);
  return { mean, sd: Math.sqrt(variance), p2_5: q(0.025), p16: q(0.16), p50: q(0.5), p84: q(0.84), p97_5: q(0.975) };
}
