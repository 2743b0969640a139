/**
 * Newton solver of the steady 1D advection-diffusion-melting column below a conductive lid
 * (project physics reference, "Upwelling rate and conductive loss (1D steady column)").
 *
 * Steady energy in entropy form, z positive down, solid rising at w:
 *     k d2T/dz2 + rho_s w T ds/dz = 0,
 *     T ds = c_P dT - T (alpha/rho)_mix dP + T dS dF,  P = rho_s g z,
 * i.e. the linear operator kappa T'' + w T' equals the source S = (w/c_P) T ((alpha/rho)_mix dP/dz - dS dF/dz).
 *
 * Discretisation (cells c = [z_c, z_c+1], nodes i = 0 at the lid base .. N at the bottom):
 * exponentially fitted (Scharfetter-Gummel / Allen-Southwell) fluxes
 *     J_c = w T_c+1 + (kappa B(Pe_c) / h_c) (T_c+1 - T_c),  Pe_c = w h_c / kappa,  B(x) = x / (e^x - 1),
 * which are exact for kappa T'' + w T' = 0 on any grid, and the cell source integral
 *     Q_c = (w / c_P) Tbar_c ((alpha/rho)_mix,c (P_c+1 - P_c) - dS (F_c+1 - F_c))
 * shared between the two nodes of the cell with the weight theta_c = 1 - (1 - B(Pe_c)) / Pe_c that
 * makes the scheme exact for a piecewise-constant source (theta -> 1: upwind for large Pe,
 * theta -> 1/2: centred for small Pe). Far from the lid (Pe >> 1) a node equation reduces to
 * c_P dT = Tbar ((alpha/rho)_mix dP - dS dF), the implicit isentropic step of the isentropic column.
 * Node i: J_i - J_i-1 = theta_i Q_i + (1 - theta_i-1) Q_i-1 (rows divided by w, in kelvin).
 *
 * Top: the lid only conducts, T linear from T_s at z = 0, conductive flux continuous at z_lid:
 *     J_lid = kappa (T_0 - T_s) / z_lid + w T_0  (with z_lid = 0: T_0 = T_s at the surface).
 * Bottom: T_N = solid adiabat (Dirichlet).
 * Melt is extracted as it forms: F_i = max over j >= i of F_eq(T_j, P_j) (the running maximum along
 * the upward path, no refreezing). The Jacobian is tridiagonal: it treats the current running-max
 * pattern as fixed and keeps only the local dependence (a node that is its own maximum), which is
 * exact for the latent-heat term; the neglected non-local part enters only through the small
 * mixture expansivity. Newton steps are capped, backtracked on a scaled residual norm, and, if the
 * direct iteration fails, repeated by continuation in w from fast to slow upwelling.
 */
import type { MeltParams } from './params.js';
import { type NodeMeltTable, nodeMeltFraction } from './conductive-melt.js';
import { solveTridiagonal } from './tridiagonal.js';

/** The discrete problem, fixed for one column. Depths m, pressures Pa, temperatures K. */
export interface ConductiveSystem {
  /** node depths, m, from the lid base (index 0) to the bottom (index N) */
  readonly zM: Float64Array;
  /** node pressures, Pa (rho_s g z) */
  readonly pPa: Float64Array;
  /** melting-law terms at the node pressures */
  readonly melt: NodeMeltTable;
  /** lid thickness, m (0: the top node is the surface, held at T_s) */
  readonly lidM: number;
  readonly tSurfaceK: number;
  /** solid-adiabat temperature at the bottom node, K */
  readonly tBottomK: number;
  /** thermal diffusivity k / (rho_s c_P), m2/s */
  readonly kappaM2S: number;
  readonly params: MeltParams;
}

/** Converged (or last) state of the column. */
export interface ConductiveSolution {
  readonly converged: boolean;
  /** why the iteration failed; null when converged */
  readonly reason: string | null;
  /** temperature at the nodes, K */
  readonly tK: Float64Array;
  /** equilibrium melt fraction F_eq(T, P, X) at the nodes */
  readonly fEq: Float64Array;
  /** extracted melt fraction: running maximum of fEq from the bottom up */
  readonly f: Float64Array;
  /** Newton steps taken (all continuation stages together) */
  readonly iterations: number;
  /** conductive heat flow out of the top of the mantle column (= through the lid), W/m2 */
  readonly surfaceHeatFlowWM2: number;
}

export interface ConductiveSolveOptions {
  /** cap on Newton steps per stage (default 60) */
  readonly maxIterations: number;
}

/** Convergence: the largest full Newton update, K. */
const TOL_K = 1e-6;
/** Largest temperature change allowed in one Newton step, K. */
const MAX_STEP_K = 150;
/** Backtracking halvings before a step is taken anyway. */
const MAX_HALVINGS = 6;
/** Continuation: start this many times faster than the target rate, in this many stages. */
const CONTINUATION_SPEEDUP = 300;
const CONTINUATION_STAGES = 6;

/** Scratch arrays of one solve (allocated per call; nothing is shared between calls). */
interface Work {
  readonly n: number;
  readonly e: Float64Array;
  readonly theta: Float64Array;
  readonly dP: Float64Array;
  readonly q: Float64Array;
  readonly dqc: Float64Array;
  readonly dqn: Float64Array;
  readonly slope: Float64Array;
  readonly active: Uint8Array;
  readonly res: Float64Array;
  readonly sub: Float64Array;
  readonly diag: Float64Array;
  readonly sup: Float64Array;
  readonly rhs: Float64Array;
  readonly scratch: Float64Array;
  readonly weight: Float64Array;
  readonly tTrial: Float64Array;
  readonly fEqTrial: Float64Array;
  readonly fTrial: Float64Array;
  readonly melt2: Float64Array;
  /** 1 / (w z_lid) kappa, or 0 with no lid */
  betaLid: number;
}

function allocWork(nodes: number): Work {
  const f = (): Float64Array => new Float64Array(nodes);
  return {
    n: nodes,
    e: f(), theta: f(), dP: f(), q: f(), dqc: f(), dqn: f(), slope: f(),
    active: new Uint8Array(nodes),
    res: f(), sub: f(), diag: f(), sup: f(), rhs: f(), scratch: f(), weight: f(),
    tTrial: f(), fEqTrial: f(), fTrial: f(),
    melt2: new Float64Array(2),
    betaLid: 0,
  };
}

/** Cell coefficients for upwelling rate w: e = B(Pe)/Pe = 1/(e^Pe - 1) and theta. */
function setCellCoefficients(sys: ConductiveSystem, w: Work, wMPerS: number): void {
  const z = sys.zM;
  const last = z.length - 1;
  for (let c = 0; c < last; c++) {
    const pe = (wMPerS * (z[c + 1] - z[c])) / sys.kappaM2S;
    let oneMinusBOverPe: number;
    let e: number;
    if (pe < 1e-2) {
      // series: (1 - B)/Pe = 1/2 - Pe/12 + Pe^3/720 - ...
      oneMinusBOverPe = 0.5 - pe / 12 + (pe * pe * pe) / 720;
      e = 1 / Math.expm1(pe);
    } else if (pe > 700) {
      e = 0;
      oneMinusBOverPe = 1 / pe;
    } else {
      e = 1 / Math.expm1(pe);
      oneMinusBOverPe = (1 - pe * e) / pe;
    }
    w.e[c] = e;
    w.theta[c] = 1 - oneMinusBOverPe;
    w.dP[c] = sys.pPa[c + 1] - sys.pPa[c];
  }
  w.betaLid = sys.lidM > 0 ? sys.kappaM2S / (wMPerS * sys.lidM) : 0;
}

/** Melt fractions at temperatures tK: equilibrium, slope, running maximum and its pattern. */
function evalMelt(sys: ConductiveSystem, w: Work, tK: Float64Array, fEq: Float64Array, f: Float64Array): void {
  const last = tK.length - 1;
  const m = w.melt2;
  for (let i = 0; i <= last; i++) {
    nodeMeltFraction(sys.melt, i, tK[i] - 273.15, fEq[i], m);
    fEq[i] = m[0];
    w.slope[i] = m[1];
  }
  f[last] = fEq[last];
  w.active[last] = fEq[last] > 0 ? 1 : 0;
  for (let i = last - 1; i >= 0; i--) {
    if (fEq[i] > f[i + 1]) {
      f[i] = fEq[i];
      w.active[i] = 1;
    } else {
      f[i] = f[i + 1];
      w.active[i] = 0;
    }
  }
}

/**
 * Residual rows (kelvin) and the tridiagonal Jacobian at tK, with melt state f already evaluated.
 * Unknowns are T_0 .. T_N-1; T_N is the Dirichlet bottom value.
 */
function assemble(sys: ConductiveSystem, w: Work, tK: Float64Array, f: Float64Array): void {
  const p = sys.params;
  const cP = p.c_P;
  const dS = p.dS;
  const aS = p.alpha_s / p.rho_s;
  const da = p.alpha_f / p.rho_f - aS;
  const last = tK.length - 1;
  const { e, theta, dP, q, dqc, dqn, slope, active, res, sub, diag, sup } = w;
  for (let c = 0; c < last; c++) {
    const t0 = tK[c];
    const t1 = tK[c + 1];
    const tBar = 0.5 * (t0 + t1);
    const f0 = f[c];
    const f1 = f[c + 1];
    const a = aS + 0.5 * (f0 + f1) * da;
    const src = a * dP[c] - dS * (f1 - f0);
    q[c] = (tBar * src) / cP;
    const phi0 = active[c] === 1 ? slope[c] : 0;
    const phi1 = active[c + 1] === 1 ? slope[c + 1] : 0;
    dqc[c] = (0.5 * src + tBar * phi0 * (0.5 * da * dP[c] + dS)) / cP;
    dqn[c] = (0.5 * src + tBar * phi1 * (0.5 * da * dP[c] - dS)) / cP;
  }
  // top row
  if (sys.lidM > 0) {
    const adv = 1 + e[0];
    res[0] = adv * (tK[1] - tK[0]) - w.betaLid * (tK[0] - sys.tSurfaceK) - theta[0] * q[0];
    diag[0] = -adv - w.betaLid - theta[0] * dqc[0];
    sup[0] = adv - theta[0] * dqn[0];
  } else {
    res[0] = tK[0] - sys.tSurfaceK;
    diag[0] = 1;
    sup[0] = 0;
  }
  sub[0] = 0;
  for (let i = 1; i < last; i++) {
    const adv = 1 + e[i];
    const up = 1 - theta[i - 1];
    res[i] =
      adv * (tK[i + 1] - tK[i]) - e[i - 1] * (tK[i] - tK[i - 1]) - theta[i] * q[i] - up * q[i - 1];
    sub[i] = e[i - 1] - up * dqc[i - 1];
    diag[i] = -adv - e[i - 1] - theta[i] * dqc[i] - up * dqn[i - 1];
    sup[i] = adv - theta[i] * dqn[i];
  }
}

/** Sum of squared residual rows scaled by the given weights. */
function meritOf(w: Work, unknowns: number): number {
  let s = 0;
  for (let i = 0; i < unknowns; i++) {
    const r = w.res[i] * w.weight[i];
    s += r * r;
  }
  return s;
}

/**
 * Initial guess: the isentropic march (node equations without conduction, from the bottom up),
 * then the linear boundary-layer shape T_s + (T - T_s) phi(z) with the analytic lid temperature.
 */
function initialGuess(sys: ConductiveSystem, w: Work, wMPerS: number, tK: Float64Array, fEq: Float64Array): void {
  const p = sys.params;
  const cP = p.c_P;
  const dS = p.dS;
  const aS = p.alpha_s / p.rho_s;
  const da = p.alpha_f / p.rho_f - aS;
  const last = tK.length - 1;
  const m = w.melt2;
  tK[last] = sys.tBottomK;
  nodeMeltFraction(sys.melt, last, sys.tBottomK - 273.15, 0, m);
  fEq[last] = m[0];
  let fBelow = m[0];
  for (let i = last - 1; i >= 0; i--) {
    const dPc = sys.pPa[i + 1] - sys.pPa[i];
    const tNext = tK[i + 1];
    let t = tNext * (1 - (aS * dPc) / cP);
    let fHere = fBelow;
    for (let it = 0; it < 8; it++) {
      nodeMeltFraction(sys.melt, i, t - 273.15, fEq[i + 1], m);
      const act = m[0] > fBelow;
      fHere = act ? m[0] : fBelow;
      const phi = act ? m[1] : 0;
      const tBar = 0.5 * (t + tNext);
      const a = aS + 0.5 * (fHere + fBelow) * da;
      const src = a * dPc - dS * (fBelow - fHere);
      const g = cP * (tNext - t) - tBar * src;
      const gp = -cP - 0.5 * src - tBar * phi * (0.5 * da * dPc + dS);
      const step = -g / gp;
      t += step;
      if (Math.abs(step) < 1e-6) break;
    }
    nodeMeltFraction(sys.melt, i, t - 273.15, fEq[i + 1], m);
    fEq[i] = m[0];
    tK[i] = t;
    fBelow = m[0] > fBelow ? m[0] : fBelow;
  }
  const delta = sys.kappaM2S / wMPerS;
  const phiLid = sys.lidM > 0 ? sys.lidM / delta / (1 + sys.lidM / delta) : 0;
  const z0 = sys.zM[0];
  for (let i = 0; i < last; i++) {
    const phi = 1 - (1 - phiLid) * Math.exp(-(sys.zM[i] - z0) / delta);
    tK[i] = sys.tSurfaceK + (tK[i] - sys.tSurfaceK) * phi;
  }
}

interface StageOutcome {
  converged: boolean;
  reason: string | null;
  iterations: number;
}

/** Damped Newton iteration at one upwelling rate, from the state in tK / fEq. */
function newtonStage(
  sys: ConductiveSystem,
  w: Work,
  wMPerS: number,
  tK: Float64Array,
  fEq: Float64Array,
  f: Float64Array,
  maxIterations: number,
): StageOutcome {
  setCellCoefficients(sys, w, wMPerS);
  const unknowns = tK.length - 1;
  const { tTrial, fEqTrial, fTrial, rhs } = w;
  evalMelt(sys, w, tK, fEq, f);
  assemble(sys, w, tK, f);
  for (let it = 0; it < maxIterations; it++) {
    for (let i = 0; i < unknowns; i++) {
      rhs[i] = -w.res[i];
      w.weight[i] = 1 / Math.abs(w.diag[i]);
    }
    const merit0 = meritOf(w, unknowns);
    if (!solveTridiagonal(w.sub, w.diag, w.sup, rhs, w.scratch, unknowns)) {
      return { converged: false, reason: 'singular Newton matrix', iterations: it + 1 };
    }
    let maxStep = 0;
    for (let i = 0; i < unknowns; i++) {
      const s = Math.abs(rhs[i]);
      if (s > maxStep) maxStep = s;
    }
    if (maxStep < TOL_K) {
      for (let i = 0; i < unknowns; i++) tK[i] += rhs[i];
      evalMelt(sys, w, tK, fEq, f);
      return { converged: true, reason: null, iterations: it + 1 };
    }
    let lambda = maxStep > MAX_STEP_K ? MAX_STEP_K / maxStep : 1;
    tTrial[unknowns] = tK[unknowns];
    fEqTrial.set(fEq);
    for (let h = 0; ; h++) {
      let positive = true;
      for (let i = 0; i < unknowns; i++) {
        const t = tK[i] + lambda * rhs[i];
        tTrial[i] = t;
        if (!(t > 1)) positive = false;
      }
      if (positive) {
        evalMelt(sys, w, tTrial, fEqTrial, fTrial);
        assemble(sys, w, tTrial, fTrial);
        const merit = meritOf(w, unknowns);
        if (merit <= merit0 * (1 - 1e-4 * lambda) || h >= MAX_HALVINGS) break;
      } else if (h >= MAX_HALVINGS) {
        return { converged: false, reason: 'Newton step drove the temperature below 1 K', iterations: it + 1 };
      }
      lambda *= 0.5;
    }
    tK.set(tTrial);
    fEq.set(fEqTrial);
    f.set(fTrial);
    // res/Jacobian in w now belong to the accepted state
  }
  return {
    converged: false,
    reason: `Newton iteration did not converge in ${maxIterations} steps`,
    iterations: maxIterations,
  };
}

/**
 * Solve the steady column for upwelling rate wMPerS (m/s). Tries Newton from the isentropic guess;
 * if that fails, continues in w from 300x faster down to the target.
 * Never throws for a bad iteration: returns converged = false with a reason.
 */
export function solveConductiveSystem(
  sys: ConductiveSystem,
  wMPerS: number,
  options: ConductiveSolveOptions,
): ConductiveSolution {
  const nodes = sys.zM.length;
  const w = allocWork(nodes);
  const tK = new Float64Array(nodes);
  const fEq = new Float64Array(nodes);
  const f = new Float64Array(nodes);
  const maxIt = Math.max(1, Math.floor(options.maxIterations));
  initialGuess(sys, w, wMPerS, tK, fEq);
  let total = 0;
  let stage = newtonStage(sys, w, wMPerS, tK, fEq, f, maxIt);
  total += stage.iterations;
  if (!stage.converged) {
    // continuation from fast (nearly isentropic, easy) to the target rate
    const wStart = wMPerS * CONTINUATION_SPEEDUP;
    initialGuess(sys, w, wStart, tK, fEq);
    for (let s = 0; s <= CONTINUATION_STAGES; s++) {
      const ws = wStart * Math.pow(wMPerS / wStart, s / CONTINUATION_STAGES);
      stage = newtonStage(sys, w, ws, tK, fEq, f, maxIt);
      total += stage.iterations;
      if (!stage.converged) break;
    }
  }
  const converged = stage.converged && allFinite(tK) && allFinite(f);
  const reason = converged ? null : stage.reason ?? 'non-finite temperature';
  return {
    converged,
    reason,
    tK,
    fEq,
    f,
    iterations: total,
    surfaceHeatFlowWM2: converged ? topHeatFlowWM2(sys, w, wMPerS, tK) : NaN,
  };
}

/**
 * Conductive heat flow at the top of the mantle column, W/m2: rho_s c_P w [(1 + e_0)(T_1 - T_0) - theta_0 q_0],
 * i.e. k dT/dz at z_lid+ from the discrete flux balance of the top node; with a lid it equals
 * k (T_0 - T_s) / z_lid by the top-node equation.
 */
function topHeatFlowWM2(sys: ConductiveSystem, w: Work, wMPerS: number, tK: Float64Array): number {
  const p = sys.params;
  setCellCoefficients(sys, w, wMPerS);
  if (sys.lidM > 0) return (p.k * (tK[0] - sys.tSurfaceK)) / sys.lidM;
  return p.rho_s * p.c_P * wMPerS * ((1 + w.e[0]) * (tK[1] - tK[0]) - w.theta[0] * w.q[0]);
}

function allFinite(a: Float64Array): boolean {
  for (let i = 0; i < a.length; i++) if (!Number.isFinite(a[i])) return false;
  return true;
}
