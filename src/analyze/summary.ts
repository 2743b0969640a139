/**
 * A short terminal summary of a sensitivity report: per output, the inputs ranked by their
 * total-effect index (or first-order index when totals are not available), with values.
 */
import type { SensitivityMeasure, SensitivityRecord, SensitivityReport } from './types.js';

export interface SummaryOptions {
  /** notes printed before "... and N more" (default 6) */
  readonly maxNotes?: number;
}

function count(v: number): string {
  return v.toLocaleString('en-US');
}

function index(r: SensitivityRecord | undefined): string {
  if (r === undefined || r.value === null) return '-';
  const v = r.value.toFixed(3);
  return r.ci_low !== null && r.ci_high !== null ? `${v} [${r.ci_low.toFixed(3)}, ${r.ci_high.toFixed(3)}]` : v;
}

function general(v: number | null): string {
  if (v === null) return '-';
  const a = Math.abs(v);
  return a !== 0 && (a >= 1e4 || a < 1e-3) ? v.toExponential(2) : Number(v.toPrecision(3)).toString();
}

function table(rows: string[][]): string[] {
  const widths = rows[0].map((_, col) => Math.max(...rows.map((r) => r[col].length)));
  return rows.map((r) => `  ${r.map((cell, col) => cell.padEnd(widths[col])).join('  ')}`.trimEnd());
}

/** Render a report as a few lines of plain text (no colours), e.g. for `meltsweep analyze`. */
export function formatSensitivitySummary(report: SensitivityReport, options: SummaryOptions = {}): string {
  const maxNotes = options.maxNotes ?? 6;
  const { counts } = report;
  const lines: string[] = [];
  lines.push(
    `Sensitivity of ${report.outputs.length} output(s) to ${report.inputs.length} input(s), ${report.design} design: ` +
      `${count(counts.rows)} rows, ${count(counts.included)} included`,
  );
  const left = Object.entries(counts.leftOut);
  if (left.length > 0) lines.push(`Left out: ${left.map(([reason, k]) => `${reason} ${count(k)}`).join(', ')}`);

  const byKey = new Map<string, SensitivityRecord>();
  for (const r of report.records) byKey.set(`${r.output}\u0000${r.input}\u0000${r.measure}`, r);
  const get = (output: string, input: string, m: SensitivityMeasure): SensitivityRecord | undefined => byKey.get(`${output}\u0000${input}\u0000${m}`);

  for (const output of report.outputs) {
    const oc = counts.perOutput[output];
    const sd = oc.variance === null ? null : Math.sqrt(oc.variance);
    lines.push('');
    lines.push(`${output}  (${count(oc.used)} rows used; mean ${general(oc.mean)}, sd ${general(sd)})`);
    const hasTotal = report.inputs.some((i) => get(output, i, 'ST')?.value != null);
    const rankBy: SensitivityMeasure = hasTotal ? 'ST' : 'S1';
    const hasElasticity = report.inputs.some((i) => get(output, i, 'elasticity_median') !== undefined);
    const ranked = [...report.inputs].sort((p, q) => {
      const a = get(output, p, rankBy)?.value ?? -Infinity;
      const b = get(output, q, rankBy)?.value ?? -Infinity;
      return b - a;
    });
    const header = ['input', 'ST', 'S1'];
    if (hasElasticity) header.push('elasticity (p10 / median / p90)');
    const rows = [header];
    for (const input of ranked) {
      const row = [input, index(get(output, input, 'ST')), index(get(output, input, 'S1'))];
      if (hasElasticity) {
        const e = (m: SensitivityMeasure): string => general(get(output, input, m)?.value ?? null);
        row.push(`${e('elasticity_p10')} / ${e('elasticity_median')} / ${e('elasticity_p90')}`);
      }
      rows.push(row);
    }
    lines.push(...table(rows));
  }

  if (report.notes.length > 0) {
    lines.push('');
    lines.push('Notes:');
    for (const note of report.notes.slice(0, maxNotes)) lines.push(`  - ${note}`);
    if (report.notes.length > maxNotes) lines.push(`  ... and ${report.notes.length - maxNotes} more in the report`);
  }
  return lines.join('\n');
}
