/**
 * Newton solver of the steady conductive column (the discrete equations are in conductive-equations.ts).
 *
 * The unknown at a node is u = T + c_u F_eq (conductive-melt.ts) where the node holds
 * its own maximum, T elsewhere; both are Lipschitz in the equations for any melting law, unlike T alone
 * where F_eq(T) is steep. The Jacobian is tridiagonal (Thomas algorithm, buffers allocated once per
 * solve): it treats the current running-max pattern as fixed and keeps the dependences inside the
 * band, i.e. a node that is its own maximum and a node that holds the maximum reached just below it.
 * That is exact for the latent-heat term (dF = 0 between nodes holding the same maximum); the
 * neglected non-local part enters only through the small mixture expansivity. Steps are capped at
 * 150 K and backtracked on a scaled residual norm. Starting guess: the isentropic march (the node
 * equations without conduction, bottom up) shaped by the boundary layer of the linear problem. If the
 * direct iteration fails, the column is continued in w from 300x faster down to the target, halving
 * the log-step of a stage that fails.
 */
import {
  allocState,
  allocWork,
  assemble,
  type ConductiveSystem,
  evalState,
  meritOf,
  setCellCoefficients,
  type State,
  topHeatFlowWM2,
  type Work,
} from './conductive-equations.js';
import { nodeStateFromT, nodeStateFromU, U_LATENT_SCALE_K } from './conductive-melt.js';
import { solveTridiagonal } from './tridiagonal.js';

export type { ConductiveSystem } from './conductive-equations.js';

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

/** Convergence: the largest full Newton update of u, K. */
const TOL_K = 1e-6;
/** Largest change of u allowed in one Newton step, K. */
const MAX_STEP_K = 150;
/** Backtracking halvings before a step is taken anyway. */
const MAX_HALVINGS = 6;
/** Continuation: start this many times faster than the target rate, in this many stages. */
const CONTINUATION_SPEEDUP = 300;
const CONTINUATION_STAGES = 6;
/** Continuation: give up when the ratio between successive rates would fall below this, or after this many stages. */
const CONTINUATION_MIN_RATIO = 1.05;
const CONTINUATION_MAX_STAGES = 40;

/**
 * Initial guess: the isentropic march (node equations without conduction, from the bottom up), then
 * the boundary-layer shape of the linear problem, u_s + (u - u_s) phi(z) with the analytic lid
 * temperature. Leaves s.u and s.fEq set (s.fEq as starting points for the node solves).
 */
function initialGuess(sys: ConductiveSystem, w: Work, wMPerS: number, s: State): void {
  const p = sys.params;
  const cP = p.c_P;
  const dS = p.dS;
  const aS = p.alpha_s / p.rho_s;
  const da = p.alpha_f / p.rho_f - aS;
  const { u, fEq } = s;
  const last = u.length - 1;
  const m = w.node;
  s.byT.fill(0);
  // bottom node: on the solid adiabat (below the onset: u = T)
  fEq.fill(0);
  u[last] = sys.tBottomK;
  nodeStateFromU(sys.melt, last, u[last], 0, m);
  let tBelow = m[0];
  let fBelow = m[1];
  fEq[last] = m[1];
  u[last] = sys.tBottomK + U_LATENT_SCALE_K * m[1];
  for (let i = last - 1; i >= 0; i--) {
    const dPc = sys.pPa[i + 1] - sys.pPa[i];
    // start from the solid adiabat step; Newton in u while the node melts, in T otherwise
    let ui = u[i + 1] - tBelow * (aS * dPc) / cP;
    let ti = ui;
    let byT = false;
    let fGuess = fEq[i + 1];
    for (let it = 0; it < 12; it++) {
      if (byT) nodeStateFromT(sys.melt, i, ti, fGuess, m);
      else nodeStateFromU(sys.melt, i, ui, fGuess, m);
      const t = m[0];
      ui = t + U_LATENT_SCALE_K * m[1];
      const act = m[1] > fBelow;
      const fHere = act ? m[1] : fBelow;
      fGuess = m[1];
      const tBar = 0.5 * (t + tBelow);
      const src = (aS + 0.5 * (fHere + fBelow) * da) * dPc - dS * (fBelow - fHere);
      const g = cP * (tBelow - t) - tBar * src;
      let step: number;
      if (act) {
        step = g / ((cP + 0.5 * src) * m[2] + tBar * m[3] * (0.5 * da * dPc + dS));
        ui += step;
        byT = false;
      } else {
        step = g / (cP + 0.5 * src);
        ti = t + step;
        byT = true;
      }
      // only a starting guess: the Newton iteration on the whole column refines it
      if (!(Math.abs(step) >= 1e-3)) break;
    }
    if (byT) nodeStateFromT(sys.melt, i, ti, fGuess, m);
    else nodeStateFromU(sys.melt, i, ui, fGuess, m);
    if (!(Number.isFinite(m[0]) && Number.isFinite(m[1]))) {
      // the local solve went astray: fall back to the solid adiabat step
      nodeStateFromT(sys.melt, i, tBelow * (1 - (aS * dPc) / cP), fEq[i + 1], m);
    }
    u[i] = m[0] + U_LATENT_SCALE_K * m[1];
    fEq[i] = m[1];
    tBelow = m[0];
    if (m[1] > fBelow) fBelow = m[1];
  }
  const delta = sys.kappaM2S / wMPerS;
  const phiLid = sys.lidM > 0 ? sys.lidM / delta / (1 + sys.lidM / delta) : 0;
  const z0 = sys.zM[0];
  for (let i = 0; i < last; i++) {
    const phi = 1 - (1 - phiLid) * Math.exp(-(sys.zM[i] - z0) / delta);
    u[i] = sys.tSurfaceK + (u[i] - sys.tSurfaceK) * phi;
  }
}

interface StageOutcome {
  converged: boolean;
  reason: string | null;
  iterations: number;
  /** the state the stage ended with (one of the two buffers) */
  state: State;
}

/** Damped Newton iteration at one upwelling rate, from the unknowns in cur.u. */
function newtonStage(
  sys: ConductiveSystem,
  w: Work,
  wMPerS: number,
  cur0: State,
  trial0: State,
  maxIterations: number,
): StageOutcome {
  let cur = cur0;
  let trial = trial0;
  setCellCoefficients(sys, w, wMPerS);
  const unknowns = cur.u.length - 1;
  const rhs = w.rhs;
  evalState(sys, w, cur);
  assemble(sys, w, cur);
  for (let it = 0; it < maxIterations; it++) {
    for (let i = 0; i < unknowns; i++) {
      rhs[i] = -w.res[i];
      w.weight[i] = 1 / Math.abs(w.diag[i]);
    }
    const merit0 = meritOf(w, unknowns);
    if (!solveTridiagonal(w.sub, w.diag, w.sup, rhs, w.scratch, unknowns)) {
      return { converged: false, reason: 'singular Newton matrix', iterations: it + 1, state: cur };
    }
    let maxStep = 0;
    for (let i = 0; i < unknowns; i++) {
      const d = Math.abs(rhs[i]);
      if (d > maxStep) maxStep = d;
    }
    if (maxStep < TOL_K) {
      // the state (T, F, residual) is kept as evaluated: the remaining update is below TOL_K
      return { converged: true, reason: null, iterations: it + 1, state: cur };
    }
    let lambda = maxStep > MAX_STEP_K ? MAX_STEP_K / maxStep : 1;
    trial.u[unknowns] = cur.u[unknowns];
    trial.byT[unknowns] = 0;
    for (let h = 0; ; h++) {
      for (let i = 0; i < unknowns; i++) {
        if (cur.active[i] === 1) {
          trial.u[i] = cur.u[i] + lambda * rhs[i];
          trial.byT[i] = 0;
        } else {
          trial.tK[i] = cur.tK[i] + lambda * rhs[i];
          trial.byT[i] = 1;
        }
      }
      trial.fEq.set(cur.fEq);
      evalState(sys, w, trial);
      assemble(sys, w, trial);
      const merit = meritOf(w, unknowns);
      if (merit <= merit0 * (1 - 1e-4 * lambda) || h >= MAX_HALVINGS) break;
      lambda *= 0.5;
    }
    // accept: res/Jacobian in w already belong to the trial state
    const t = cur;
    cur = trial;
    trial = t;
    if (!(cur.tK[0] > 0) || !Number.isFinite(cur.tK[0])) {
      return { converged: false, reason: 'Newton iteration left the physical range (T <= 0 K)', iterations: it + 1, state: cur };
    }
  }
  return {
    converged: false,
    reason: `Newton iteration did not converge in ${maxIterations} step${maxIterations === 1 ? '' : 's'}`,
    iterations: maxIterations,
    state: cur,
  };
}

/**
 * Solve the steady column for upwelling rate wMPerS (m/s). Tries Newton from guessTK (temperatures at
 * the nodes, K) when given, then from the isentropic guess; if that fails, continues in w from 300x
 * faster down to the target.
 * Never throws for a bad iteration: returns converged = false with a reason.
 */
export function solveConductiveSystem(
  sys: ConductiveSystem,
  wMPerS: number,
  options: ConductiveSolveOptions,
  guessTK?: Float64Array,
): ConductiveSolution {
  const nodes = sys.zM.length;
  const w = allocWork(nodes);
  const a = allocState(nodes);
  const b = allocState(nodes);
  const maxIt = Math.max(1, Math.floor(options.maxIterations));
  let total = 0;
  let stage: StageOutcome | undefined;
  if (guessTK !== undefined && guessTK.length === nodes) {
    // a warm start (the same column on a coarser grid): every node set by its temperature
    a.tK.set(guessTK);
    a.tK[nodes - 1] = sys.tBottomK;
    a.byT.fill(1);
    a.fEq.fill(0);
    stage = newtonStage(sys, w, wMPerS, a, b, maxIt);
    total += stage.iterations;
  }
  if (stage === undefined || !stage.converged) {
    initialGuess(sys, w, wMPerS, a);
    stage = newtonStage(sys, w, wMPerS, a, b, maxIt);
    total += stage.iterations;
  }
  if (!stage.converged) {
    // continuation from fast upwelling (nearly isentropic, easy) down to the target rate; a stage
    // that fails is retried from the last converged state with a smaller ratio of rates
    const keepU = new Float64Array(nodes);
    const keepF = new Float64Array(nodes);
    let wDone = wMPerS * CONTINUATION_SPEEDUP;
    initialGuess(sys, w, wDone, a);
    stage = newtonStage(sys, w, wDone, a, b, maxIt);
    total += stage.iterations;
    let ratio = Math.pow(CONTINUATION_SPEEDUP, 1 / CONTINUATION_STAGES);
    for (let k = 0; stage.converged && wDone > wMPerS && k < CONTINUATION_MAX_STAGES; k++) {
      const done = stage.state;
      keepU.set(done.u);
      keepF.set(done.fEq);
      const wNext = Math.max(wMPerS, wDone / ratio);
      const next = newtonStage(sys, w, wNext, done, done === a ? b : a, maxIt);
      total += next.iterations;
      if (next.converged) {
        wDone = wNext;
        stage = next;
        continue;
      }
      if (ratio < CONTINUATION_MIN_RATIO) {
        stage = next;
        break;
      }
      ratio = Math.sqrt(ratio);
      // back to the last converged state (kept in the buffer `done` by value)
      done.u.set(keepU);
      done.fEq.set(keepF);
      done.byT.fill(0);
      stage = newtonStage(sys, w, wDone, done, done === a ? b : a, maxIt);
      total += stage.iterations;
    }
    if (stage.converged && wDone > wMPerS) {
      stage = { converged: false, reason: 'continuation in upwelling rate did not reach the target rate', iterations: 0, state: stage.state };
    }
  }
  const s = stage.state;
  const converged = stage.converged && allFinite(s.tK) && allFinite(s.f);
  const reason = converged ? null : (stage.reason ?? 'non-finite temperature');
  return {
    converged,
    reason,
    tK: s.tK,
    fEq: s.fEq,
    f: s.f,
    iterations: total,
    surfaceHeatFlowWM2: converged ? topHeatFlowWM2(sys, w, wMPerS, s.tK) : Number.NaN,
  };
}

function allFinite(a: Float64Array): boolean {
  for (let i = 0; i < a.length; i++) if (!Number.isFinite(a[i])) return false;
  return true;
}
