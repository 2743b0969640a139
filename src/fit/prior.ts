/**
 * The prior of a fit is the sweep's own design: every row of the design equally likely. This file
 * says so in one sentence, naming each swept input and how the design spreads it.
 */
import type { FitPrior } from './types.js';
import { formatFitNumber as fmt } from './format.js';


/**
 * One sentence stating the prior, e.g. "the sweep's own design: grid of 9 x 5 = 45 points, each
 * equally likely (tp_c: 9 values 1280-1440 degC; ...)".
 * @param units unit of each input by name (left out when absent or empty)
 */
export function describePrior(prior: FitPrior, units: Readonly<Record<string, string>> = {}): string {
  const unit = (name: string): string => (units[name] ? ` ${units[name]}` : '');
  if (prior.kind === 'grid') {
    const count = prior.axes.reduce((n, a) => n * a.values.length, 1);
    const axes = prior.axes
      .map((a) => `${a.name}: ${a.values.length} value${a.values.length === 1 ? '' : 's'} ${fmt(a.min)}-${fmt(a.max)}${unit(a.name)}${a.scale === 'log' ? ', log spacing' : ''}`)
      .join('; ');
    return `the sweep's own design: grid of ${prior.axes.map((a) => a.values.length).join(' x ')} = ${count} points, each equally likely (${axes})`;
  }
  const laws = prior.axes.map((a) => `${a.scale === 'log' ? 'log-uniform' : 'uniform'} on ${a.name} ${fmt(a.min)}-${fmt(a.max)}${unit(a.name)}`).join('; ');
  const rows =
    prior.kind === 'saltelli'
      ? 'every row of the A, B and AB blocks equally likely (each row is a uniform draw over the box; the AB rows reuse coordinates of A and B)'
      : 'each sample equally likely';
  return `the sweep's own design: ${prior.kind} samples, ${rows} (${laws})`;
}
