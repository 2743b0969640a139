/**
 * A short terminal summary of a sensitivity report: one line per distinct output with the inputs
 * ranked by their total-effect index (first-order where totals are not available), rounded to the
 * estimator's precision; outputs that copy another are named beside it, indices that need more
 * samples are listed, then warnings and the first notes. The full table (intervals, elasticities,
 * slopes) is in the sensitivity file.
 */
import { formatIndex, needsMoreSamples } from './precision.js';
import type { SensitivityMeasure, SensitivityRecord, SensitivityReport } from './types.js';

export interface SummaryOptions {
  /** notes printed before "... and N more" (default 6) */
  readonly maxNotes?: number;
}

function count(v: number): string {
  return v.toLocaleString('en-US');
}

/** Render a report as a few lines of plain text (no colours), e.g. after `meltsweep run`. */
export function formatSensitivitySummary(report: SensitivityReport, options: SummaryOptions = {}): string {
  const maxNotes = options.maxNotes ?? 6;
  const { counts, design } = report;
  const byKey = new Map<string, SensitivityRecord>();
  for (const r of report.records) byKey.set(`${r.output}\u0000${r.input}\u0000${r.measure}`, r);
  const get = (output: string, input: string, m: SensitivityMeasure): SensitivityRecord | undefined => byKey.get(`${output}\u0000${input}\u0000${m}`);

  const distinct = report.outputs.filter((o) => report.copies[o] === undefined);
  const lines: string[] = [];
  const left = Object.entries(counts.leftOut);
  lines.push(
    `Sensitivity (${design} design): ${count(counts.rows)} rows, ${count(counts.included)} used` +
      (left.length > 0 ? ` (left out: ${left.map(([reason, k]) => `${reason} ${count(k)}`).join(', ')})` : '') +
      `; ${report.inputs.length} input(s); ${report.outputs.length} output(s)` +
      (distinct.length < report.outputs.length ? `, ${distinct.length} distinct` : ''),
  );
  const hasTotal = report.records.some((r) => r.measure === 'ST' && r.value !== null);
  lines.push(
    hasTotal
      ? 'Inputs ranked by total-effect index ST (first-order S1 in brackets), rounded to the precision of each estimate:'
      : 'Inputs ranked by first-order index S1, rounded to the precision of each estimate:',
  );

  const width = Math.max(...distinct.map((o) => o.length));
  const flagged: string[] = [];
  for (const output of distinct) {
    const oc = counts.perOutput[output];
    const rankBy: SensitivityMeasure = report.inputs.some((i) => get(output, i, 'ST')?.value != null) ? 'ST' : 'S1';
    const ranked = [...report.inputs].sort((p, q) => (get(output, q, rankBy)?.value ?? -Infinity) - (get(output, p, rankBy)?.value ?? -Infinity));
    const cells: string[] = [];
    for (const input of ranked) {
      const main = get(output, input, rankBy);
      const s1 = get(output, input, 'S1');
      let cell = `${input} ${main === undefined ? '-' : formatIndex(main, design)}`;
      if (rankBy === 'ST' && s1 !== undefined) cell += ` (${formatIndex(s1, design)})`;
      cells.push(cell);
      for (const r of [main, rankBy === 'ST' ? s1 : undefined]) {
        const why = r === undefined ? null : needsMoreSamples(r, design);
        if (r !== undefined && why !== null) {
          const ci = r.ci_low !== null && r.ci_high !== null ? ` [${r.ci_low.toFixed(2)}, ${r.ci_high.toFixed(2)}]` : '';
          flagged.push(`${output} / ${input}: ${r.measure} ${r.value?.toFixed(2)}${ci}: ${why}`);
        }
      }
    }
    const allNull = cells.length > 0 && report.inputs.every((i) => get(output, i, rankBy)?.value == null);
    let text = allNull ? (oc.used === 0 ? 'no usable rows' : 'constant over the used rows') : cells.join(' > ');
    if (oc.used < counts.included && oc.used > 0) text += `  [${count(oc.used)} rows]`;
    const also = report.outputs.filter((o) => report.copies[o]?.of === output);
    if (also.length > 0) text += `  (same as ${also.join(', ')})`;
    lines.push(`  ${output.padEnd(width)}  ${text}`);
  }
  if (flagged.length > 0) {
    lines.push('Needs more samples (estimator noise; a larger design narrows these):');
    for (const f of flagged) lines.push(`  ${f}`);
  }
  if (report.warnings.length > 0) {
    lines.push('Warnings:');
    for (const w of report.warnings) lines.push(`  - ${w}`);
  }
  if (report.notes.length > 0) {
    lines.push('Notes:');
    for (const note of report.notes.slice(0, maxNotes)) lines.push(`  - ${note}`);
    if (report.notes.length > maxNotes) lines.push(`  ... and ${report.notes.length - maxNotes} more in the sensitivity table's metadata`);
  }
  return lines.join('\n');
}
