/**
 * Discrete equations of the steady 1D advection-diffusion-melting column below a conductive lid
 * (project physics reference, "Upwelling rate and conductive loss (1D steady column)"): the state at
 * one iterate, the residual and its tridiagonal Jacobian. The Newton iteration is in conductive-solver.ts.
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
 * Bottom: T_N = Tp[K] exp(m+ z_N), the sub-solidus steady solution (Dirichlet; conductive-far-field.ts).
 * Melt is extracted as it forms: F_i = max over j >= i of F_eq(T_j, P_j) (the running maximum along
 * the upward path, no refreezing).
 *
 * Unknowns of the Newton iteration: u = T + c_u F_eq (conductive-melt.ts) at nodes that hold their own
 * maximum, T at the others; the Jacobian is taken in those variables.
 */
import type { MeltParams } from './params.js';
import { type NodeMeltTable, nodeStateFromT, nodeStateFromU, U_LATENT_SCALE_K } from './conductive-melt.js';

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
  /** temperature imposed at the bottom node (sub-solidus steady solution), K */
  readonly tBottomK: number;
  /** thermal diffusivity k / (rho_s c_P), m2/s */
  readonly kappaM2S: number;
  readonly params: MeltParams;
}

/** The column at one iterate: the unknowns u = T + c_u F_eq and everything derived from them. */
export interface State {
  readonly u: Float64Array;
  readonly tK: Float64Array;
  readonly fEq: Float64Array;
  /** running maximum of fEq from the bottom up */
  readonly f: Float64Array;
  /** dT/du at each node */
  readonly tau: Float64Array;
  /** dF_eq/du at each node, 1/K */
  readonly psi: Float64Array;
  /** 1 where the node holds its own maximum (f = fEq > f below) */
  readonly active: Uint8Array;
  /** 1 where the node was set by its temperature (tK given, u derived), 0 where by u */
  readonly byT: Uint8Array;
}

/** A zeroed State for a grid of `nodes` nodes. */
export function allocState(nodes: number): State {
  return {
    u: new Float64Array(nodes),
    tK: new Float64Array(nodes),
    fEq: new Float64Array(nodes),
    f: new Float64Array(nodes),
    tau: new Float64Array(nodes),
    psi: new Float64Array(nodes),
    active: new Uint8Array(nodes),
    byT: new Uint8Array(nodes),
  };
}

/** Cell coefficients, residual and Jacobian of one solve (allocated per call, never shared). */
export interface Work {
  readonly e: Float64Array;
  readonly theta: Float64Array;
  readonly dP: Float64Array;
  readonly q: Float64Array;
  readonly res: Float64Array;
  readonly sub: Float64Array;
  readonly diag: Float64Array;
  readonly sup: Float64Array;
  readonly rhs: Float64Array;
  readonly scratch: Float64Array;
  readonly weight: Float64Array;
  readonly node: Float64Array;
  /** kappa / (w z_lid), or 0 with no lid */
  betaLid: number;
}

/** A zeroed Work for a grid of `nodes` nodes. */
export function allocWork(nodes: number): Work {
  const f = (): Float64Array => new Float64Array(nodes);
  return {
    e: f(), theta: f(), dP: f(), q: f(),
    res: f(), sub: f(), diag: f(), sup: f(), rhs: f(), scratch: f(), weight: f(),
    node: new Float64Array(4),
    betaLid: 0,
  };
}

/** Cell coefficients for upwelling rate w: e = B(Pe)/Pe = 1/(e^Pe - 1) and theta. */
export function setCellCoefficients(sys: ConductiveSystem, w: Work, wMPerS: number): void {
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

/**
 * Temperatures and melt fractions from the unknowns: from s.u, or from s.tK where s.byT is set (then u
 * is derived). s.fEq holds the previous values as starting points.
 */
export function evalState(sys: ConductiveSystem, w: Work, s: State): void {
  const last = s.u.length - 1;
  const m = w.node;
  for (let i = 0; i <= last; i++) {
    if (s.byT[i] === 1) {
      nodeStateFromT(sys.melt, i, s.tK[i], s.fEq[i], m);
      s.u[i] = m[0] + U_LATENT_SCALE_K * m[1];
    } else {
      nodeStateFromU(sys.melt, i, s.u[i], s.fEq[i], m);
    }
    s.tK[i] = m[0];
    s.fEq[i] = m[1];
    s.tau[i] = m[2];
    s.psi[i] = m[3];
  }
  const { f, fEq, active } = s;
  f[last] = fEq[last];
  active[last] = fEq[last] > 0 ? 1 : 0;
  for (let i = last - 1; i >= 0; i--) {
    if (fEq[i] > f[i + 1]) {
      f[i] = fEq[i];
      active[i] = 1;
    } else {
      f[i] = f[i + 1];
      active[i] = 0;
    }
  }
}

/**
 * Residual rows (kelvin) and the tridiagonal Jacobian at state s, in the Newton variables: u at nodes
 * that hold their own maximum (their F matters), T elsewhere (their F_eq does not enter, and T is then
 * the better-conditioned variable: dT/du vanishes where T_eq(F) is flat). Unknowns are nodes 0 .. N-1;
 * node N is the Dirichlet bottom.
 */
export function assemble(sys: ConductiveSystem, w: Work, s: State): void {
  const p = sys.params;
  const cP = p.c_P;
  const dS = p.dS;
  const aS = p.alpha_s / p.rho_s;
  const da = p.alpha_f / p.rho_f - aS;
  const { tK, f, tau, psi, active } = s;
  const last = tK.length - 1;
  const { e, theta, dP, q, res, sub, diag, sup } = w;
  // cell c couples rows c and c+1 through q_c; its derivatives go straight into the Jacobian
  for (let i = 0; i < last; i++) {
    res[i] = 0;
    sub[i] = 0;
    diag[i] = 0;
    sup[i] = 0;
  }
  for (let c = 0; c < last; c++) {
    const t0 = tK[c];
    const t1 = tK[c + 1];
    const tBar = 0.5 * (t0 + t1);
    const f0 = f[c];
    const f1 = f[c + 1];
    const src = (aS + 0.5 * (f0 + f1) * da) * dP[c] - dS * (f1 - f0);
    const qc = (tBar * src) / cP;
    q[c] = qc;
    // partials of q_c in T and F
    const qT = (0.5 * src) / cP;
    const qF0 = (tBar * (0.5 * da * dP[c] + dS)) / cP;
    const qF1 = (tBar * (0.5 * da * dP[c] - dS)) / cP;
    // dF_c/du_c, dF_c+1/du_c+1, and dF_c/du_c+1 when node c holds the maximum reached at c+1
    const psi0 = active[c] === 1 ? psi[c] : 0;
    const psi1 = active[c + 1] === 1 ? psi[c + 1] : 0;
    const psi0Next = active[c] === 0 && active[c + 1] === 1 ? psi1 : 0;
    const tau0 = active[c] === 1 ? tau[c] : 1;
    const tau1 = active[c + 1] === 1 ? tau[c + 1] : 1;
    const dqc = qT * tau0 + qF0 * psi0;
    const dqn = qT * tau1 + qF1 * psi1 + qF0 * psi0Next;
    // row c takes theta_c q_c, row c+1 takes (1 - theta_c) q_c
    const th = theta[c];
    res[c] -= th * qc;
    diag[c] -= th * dqc;
    if (c + 1 < last) sup[c] -= th * dqn;
    if (c + 1 < last) {
      const up = 1 - th;
      res[c + 1] -= up * qc;
      sub[c + 1] -= up * dqc;
      diag[c + 1] -= up * dqn;
    }
  }
  // conductive-advective part: row i gets (1 + e_i)(T_i+1 - T_i) - e_i-1 (T_i - T_i-1)
  for (let i = 0; i < last; i++) {
    const adv = 1 + e[i];
    const tauI = active[i] === 1 ? tau[i] : 1;
    res[i] += adv * (tK[i + 1] - tK[i]);
    diag[i] -= adv * tauI;
    if (i + 1 < last) sup[i] += adv * (active[i + 1] === 1 ? tau[i + 1] : 1);
    if (i > 0) {
      const el = e[i - 1];
      res[i] -= el * (tK[i] - tK[i - 1]);
      diag[i] -= el * tauI;
      sub[i] += el * (active[i - 1] === 1 ? tau[i - 1] : 1);
    }
  }
  const tau0 = active[0] === 1 ? tau[0] : 1;
  if (sys.lidM > 0) {
    // lid: conductive flux kappa (T_0 - T_s) / z_lid leaves the top node
    res[0] -= w.betaLid * (tK[0] - sys.tSurfaceK);
    diag[0] -= w.betaLid * tau0;
  } else {
    // no lid: the top node is the surface, T_0 = T_s
    res[0] = tK[0] - sys.tSurfaceK;
    diag[0] = tau0;
    sup[0] = 0;
  }
}

/** Sum of squared residual rows scaled by w.weight. */
export function meritOf(w: Work, unknowns: number): number {
  let s = 0;
  for (let i = 0; i < unknowns; i++) {
    const r = w.res[i] * w.weight[i];
    s += r * r;
  }
  return s;
}

/**
 * Conductive heat flow at the top of the mantle column, W/m2: rho_s c_P w [(1 + e_0)(T_1 - T_0) - theta_0 q_0],
 * i.e. k dT/dz at z_lid+ from the discrete flux balance of the top node; with a lid it equals
 * k (T_0 - T_s) / z_lid by the top-node equation. Needs w assembled at the final state.
 */
export function topHeatFlowWM2(sys: ConductiveSystem, w: Work, wMPerS: number, tK: Float64Array): number {
  const p = sys.params;
  if (sys.lidM > 0) return (p.k * (tK[0] - sys.tSurfaceK)) / sys.lidM;
  return p.rho_s * p.c_P * wMPerS * ((1 + w.e[0]) * (tK[1] - tK[0]) - w.theta[0] * w.q[0]);
}
