/**
 * When a fit should not be trusted as it stands, and what to do next: too few effective rows, a
 * posterior cut off by the edge of the swept range, or no row that fits the observations.
 */
import type { FitSums } from './weighted-sums.js';
import type { FitAxis, FitBestRow, FitWarning, Observation } from './types.js';
import { formatFitNumber as fmt } from './format.js';

/** Below this effective sample size the posterior rests on too few rows. */
export const MIN_ESS = 50;

/** Share of the swept range (in t: x, or ln x on log axes) that counts as its edge. */
export const EDGE_ZONE = 0.05;

/** Mass of a cell mass function below t (the cumulative distribution is linear within cells). */
export function massBelow(mass: ArrayLike<number>, edgesT: ArrayLike<number>, t: number): number {
  let cum = 0;
  for (let i = 0; i < mass.length; i++) {
    const a = edgesT[i];
    const b = edgesT[i + 1];
    if (t >= b) cum += mass[i];
    else {
      if (t > a && b > a) cum += (mass[i] * (t - a)) / (b - a);
      break;
    }
  }
  return cum;
}

/** What the warnings are computed from. */
export interface WarningInputs {
  readonly ess: number;
  readonly rowsUsed: number;
  readonly within3Sd: number;
  readonly best: FitBestRow;
  readonly observations: readonly (Observation & { readonly totalSd: number })[];
  readonly sums: FitSums;
  readonly axes: readonly FitAxis[];
}


/**
 * The warnings of a fit, in order: no row within 3 sd, low effective sample size, then an edge
 * warning per input whose posterior piles against an end of its swept range (at least 5 % of the
 * posterior mass, and at least twice the prior's share, in the outer 5 % of the range).
 */
export function fitWarnings(w: WarningInputs): FitWarning[] {
  const out: FitWarning[] = [];
  if (w.within3Sd === 0) {
    const worst = w.observations.reduce((a, o) => (Math.abs(w.best.z[o.output]) > Math.abs(w.best.z[a.output]) ? o : a));
    out.push({
      kind: 'no-fit',
      message: `no row fits every observation within 3 sd: the closest row (scenario ${w.best.id}) is ${fmt(Math.abs(w.best.z[worst.output]))} sd from ${worst.output} = ${fmt(worst.value)}`,
      nextStep: 'widen the swept ranges (or sweep another input) until rows reach the observations; if the model cannot match them, say how far it may be off with --discrepancy OUTPUT=SD',
    });
  }
  if (w.ess < MIN_ESS) {
    out.push({
      kind: 'low-ess',
      message: `effective sample size ${fmt(w.ess)} (under ${MIN_ESS}): the posterior rests on a few of the ${w.rowsUsed} rows used and its quantiles are coarse`,
      nextStep: 'sweep more densely where the posterior lies: add --refine NEXT.yaml, run meltsweep run NEXT.yaml, and fit the new table',
    });
  }
  const s = w.sums;
  w.axes.forEach((axis, a) => {
    const cells = s.cells[a];
    if (cells.count < 2) return;
    const t0 = cells.edgesT[0];
    const t1 = cells.edgesT[cells.count];
    const lowCut = t0 + EDGE_ZONE * (t1 - t0);
    const highCut = t1 - EDGE_ZONE * (t1 - t0);
    const post = s.post[a];
    const prior = s.priorCount[a];
    const sides = [
      { side: 'lower', at: axis.min, post: massBelow(post, cells.edgesT, lowCut) / s.s1, prior: massBelow(prior, cells.edgesT, lowCut) / s.pn[a] },
      { side: 'upper', at: axis.max, post: 1 - massBelow(post, cells.edgesT, highCut) / s.s1, prior: 1 - massBelow(prior, cells.edgesT, highCut) / s.pn[a] },
    ];
    for (const e of sides) {
      if (e.post >= 0.05 && e.post >= 2 * e.prior) {
        out.push({
          kind: 'edge',
          input: axis.name,
          message: `${axis.name}: the posterior piles against the ${e.side} edge of the swept range (${fmt(e.at)}): ${(100 * e.post).toFixed(0)} % of its mass lies in the ${e.side === 'lower' ? 'lowest' : 'highest'} 5 % of the range`,
          nextStep: `extend ${axis.name} beyond ${fmt(e.at)} and run again (--refine NEXT.yaml writes such a sweep), unless ${fmt(e.at)} is a hard limit of the input`,
        });
      }
    }
  });
  return out;
}
