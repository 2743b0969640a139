/**
 * A fit as text (the CLI's summary) and as the `--json` object.
 */
import { formatSignificant } from '../number-format.js';
import type { FitResult, FitSummary } from './types.js';

/** A number with 4 significant digits (exponent form for very large or small magnitudes). */
export function formatFitNumber(v: number): string {
  return formatSignificant(v, { expAbove: 1e6, expDigits: 3 });
}

const COLUMNS: readonly (keyof FitSummary)[] = ['mean', 'sd', 'p2_5', 'p16', 'p50', 'p84', 'p97_5'];
const HEADS = ['mean', 'sd', '2.5 %', '16 %', '50 %', '84 %', '97.5 %'];

function table(title: string, rows: Readonly<Record<string, FitSummary>>, units: Readonly<Record<string, string>>): string[] {
  const names = Object.keys(rows);
  if (names.length === 0) return [];
  const body = names.map((n) => [n, units[n] ?? '', ...COLUMNS.map((k) => formatFitNumber(rows[n][k]))]);
  const head = [title, 'unit', ...HEADS];
  const widths = head.map((h, i) => Math.max(h.length, ...body.map((r) => r[i].length)));
  const line = (r: readonly string[]): string => r.map((c, i) => (i < 2 ? c.padEnd(widths[i]) : c.padStart(widths[i]))).join('  ');
  return [line(head), ...body.map((r) => `${line(r)}`)];
}

function counts(c: Readonly<Record<string, number>>): string {
  return Object.entries(c)
    .map(([k, v]) => `${k} ${v}`)
    .join(', ');
}

/** The fit in words and tables, as the CLI prints it. */
export function formatFitSummary(fit: FitResult, units: Readonly<Record<string, string>> = {}, source = 'the table'): string {
  const u = (name: string): string => (units[name] ? ` ${units[name]}` : '');
  const lines: string[] = [];
  lines.push(`fit of ${source}`);
  lines.push(`prior: ${fit.priorText}`);
  for (const o of fit.observations) {
    const disc = o.discrepancySd ? ` (with model discrepancy ${formatFitNumber(o.discrepancySd)}: total sd ${formatFitNumber(o.totalSd)})` : '';
    lines.push(`observed: ${o.output} = ${formatFitNumber(o.value)} +- ${formatFitNumber(o.sd)}${u(o.output)}${disc}`);
  }
  const leftOut = Object.values(fit.rowsLeftOut).reduce((a, b) => a + b, 0);
  lines.push(`rows: ${fit.rowsUsed} of ${fit.rows} used (${counts(fit.usedByStatus)})${leftOut > 0 ? `; ${leftOut} left out (${counts(fit.rowsLeftOut)})` : ''}`);
  lines.push(`effective sample size: ${formatFitNumber(fit.ess)}; rows within 3 sd of every observation: ${fit.rowsWithin3Sd}`);
  lines.push('');
  lines.push(...table('posterior', fit.posterior, units));
  const predicted = table('posterior predictive', fit.predict, units);
  if (predicted.length > 0) lines.push('', ...predicted);
  lines.push('');
  const b = fit.best;
  const at = Object.entries(b.inputs)
    .map(([k, v]) => `${k} ${formatFitNumber(v)}${u(k)}`)
    .join(', ');
  const misfit = fit.observations.map((o) => `${o.output} ${formatFitNumber(b.outputs[o.output])}${u(o.output)} (z ${formatFitNumber(b.z[o.output])})`).join(', ');
  lines.push(`best-fitting row: scenario ${b.id} (${at}): ${misfit}`);
  if (fit.warnings.length > 0) {
    lines.push('', 'warnings:');
    for (const w of fit.warnings) lines.push(`  - ${w.message}`, `    next: ${w.nextStep}`);
  }
  return lines.join('\n');
}

/** The `--json` object: rows_used, rows_left_out (by reason), ess, posterior, predict, best. */
export function fitJson(fit: FitResult, predict: readonly string[], bestRow: Readonly<Record<string, unknown>>): Record<string, unknown> {
  const pick = (s: FitSummary): FitSummary => ({ mean: s.mean, sd: s.sd, p2_5: s.p2_5, p16: s.p16, p50: s.p50, p84: s.p84, p97_5: s.p97_5 });
  return {
    rows_used: fit.rowsUsed,
    rows_left_out: { ...fit.rowsLeftOut },
    ess: fit.ess,
    posterior: Object.fromEntries(Object.entries(fit.posterior).map(([k, s]) => [k, pick(s)])),
    predict: Object.fromEntries(predict.map((k) => [k, pick(fit.predict[k])])),
    best: { ...bestRow },
  };
}
