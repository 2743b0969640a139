/** Printed summaries of runs, shared by run, demo and merge. */
import { COLUMN_STATUSES, type ColumnStatus } from '../physics/types.js';
import type { RunSummary } from '../run/run-sweep.js';

const fmt = (n: number): string => Math.round(n).toLocaleString('en-US');

export function formatCounts(counts: Readonly<Record<ColumnStatus, number>>): string {
  return COLUMN_STATUSES.map((s) => `${s} ${fmt(counts[s])}`).join(', ');
}

export function formatRunSummary(s: RunSummary): string {
  const rate = s.seconds > 0 ? s.computedRows / s.seconds : 0;
  const lines = [
    `results: ${s.outPath}`,
    `rows: ${fmt(s.rows)} (${formatCounts(s.counts)})`,
    `time: ${s.seconds.toFixed(2)} s on ${s.workers} worker${s.workers === 1 ? '' : 's'}, ${fmt(rate)} columns/s` +
      (s.computedRows < s.rows ? ` (${fmt(s.rows - s.computedRows)} rows were already done)` : ''),
  ];
  if (s.retriedChunks > 0 || s.lostChunks > 0) {
    lines.push(`worker faults: ${s.retriedChunks} chunk(s) retried, ${s.lostChunks} chunk(s) recorded as failed`);
  }
  if (s.counts.failed > 0) lines.push(`note: ${fmt(s.counts.failed)} scenario(s) failed; their reasons are in the "reason" column`);
  return lines.join('\n');
}
