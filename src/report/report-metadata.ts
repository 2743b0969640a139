/**
 * The "Run" section of the report: what was swept and how, the model and its parameters, and how
 * many rows ended in each status. Units come from the field and parameter registries.
 */
import type { ResultsTableMeta } from '../io/arrow-schema.js';
import { inputsOfSpec, processOfSpec } from '../process/registry.js';
import { PARAM_INFO, PARAM_NAMES } from '../physics/params.js';
import { COLUMN_STATUSES } from '../physics/types.js';
import type { SweepSpec } from '../spec/types.js';
import { escapeHtml, htmlTable } from './html.js';
import { formatNumber, type FieldLabels } from './labels.js';
import type { ResultsColumns } from './results-columns.js';
import { CATEGORICAL } from './theme.js';

/** Status colours of the count bar (Okabe-Ito: ok blue, no melt sky blue, out of range orange, failed vermillion). */
const STATUS_COLOURS: Readonly<Record<(typeof COLUMN_STATUSES)[number], string>> = {
  ok: CATEGORICAL[0],
  no_melt: CATEGORICAL[5],
  onset_beyond_range: CATEGORICAL[4],
  failed: CATEGORICAL[1],
};

/** One line describing the design. */
export function designText(spec: SweepSpec): string {
  const d = spec.design;
  switch (d.kind) {
    case 'grid':
      return spec.axes.length === 0 ? 'grid (a single point)' : `grid, ${spec.axes.map((a) => a.values.length).join(' × ')} (last axis fastest)`;
    case 'latin-hypercube':
      return `latin-hypercube, ${d.samples} samples, seed ${d.seed}`;
    case 'sobol':
      return `sobol, ${d.samples} samples, skip ${d.skip}${d.seed === undefined ? '' : `, shift seed ${d.seed}`}`;
    case 'saltelli':
      return `saltelli, base ${d.base} × ${spec.axes.length + 2} blocks, skip ${d.skip}${d.seed === undefined ? '' : `, shift seed ${d.seed}`}`;
  }
}

function listValues(values: readonly number[]): string {
  const shown = values.length <= 8 ? values.map(formatNumber) : [...values.slice(0, 3).map(formatNumber), '…', ...values.slice(-2).map(formatNumber)];
  return shown.join(', ');
}

/** A parameter unit as printed: "°C/GPa²" for "degC/GPa^2", "kg/m³", "wt%/GPa^λ" ("" for a number without unit). */
export function printedUnit(unit: string): string {
  if (unit === '-') return '';
  return unit
    .replace(/degC/g, '°C')
    .replace(/\^2\b/g, '²')
    .replace(/(m|s)3\b/g, '$1³')
    .replace(/(m|s)2\b/g, '$1²')
    .replace(/\^gamma\b/g, '^γ')
    .replace(/\^lambda\b/g, '^λ');
}

/** The process and its options in words ("thermal auto, water batch, step 0.05 GPa" for decompression). */
function modelText(spec: SweepSpec): string {
  const process = processOfSpec(spec);
  const options = process.model.summary?.(spec.model) ?? '';
  return process === processOfSpec({ ...spec, model: { params: {} } }) ? options : `process ${process.name}${options === '' ? '' : `, ${options}`}`;
}

/** The HTML of the Run section. */
export function metadataSection(meta: ResultsTableMeta, spec: SweepSpec, table: ResultsColumns, labels: FieldLabels): string {
  // an input as a reader knows it, with the column name of the table beside it
  const inputName = (name: string): string => `${labels.heading(name)} (${name})`;
  const rowsInFile = meta.rowEnd - meta.rowStart;
  const summary = htmlTable(
    ['', ''],
    [
      ['sweep', spec.name],
      ['design', designText(spec)],
      ['points in the sweep', String(meta.pointCount)],
      ['rows in this file', rowsInFile === meta.pointCount ? String(rowsInFile) : `${rowsInFile} (rows ${meta.rowStart}-${meta.rowEnd}, shard ${meta.shard})`],
      ['model', modelText(spec)],
    ],
    'data kv',
  );
  const axes = htmlTable(
    ['input', 'unit', spec.design.kind === 'grid' ? 'values' : 'range', 'scale'],
    spec.axes.map((a) => [inputName(a.name), labels.unit(a.name), spec.design.kind === 'grid' ? listValues(a.values) : `${formatNumber(a.min)} to ${formatNumber(a.max)}`, a.scale]),
  );
  const swept = new Set<string>(spec.axes.map((a) => a.name));
  const fixed = htmlTable(
    ['input', 'value', 'unit'],
    inputsOfSpec(spec).map((i) => i.name).filter((n) => !swept.has(n)).map((n) => {
      const v = spec.fixed[n];
      return [inputName(n), v === undefined ? 'not given' : formatNumber(v), labels.unit(n)];
    }),
  );
  const total = Math.max(1, table.rows);
  const bar = COLUMN_STATUSES.filter((s) => table.statusCounts[s] > 0)
    .map((s) => `<span title="${s}: ${table.statusCounts[s]}" style="width:${((100 * table.statusCounts[s]) / total).toFixed(3)}%;background:${STATUS_COLOURS[s]}"></span>`)
    .join('');
  const counts = htmlTable(
    ['status', 'rows', 'share'],
    COLUMN_STATUSES.map((s) => [s, String(table.statusCounts[s]), `${((100 * table.statusCounts[s]) / total).toFixed(1)} %`]),
  );
  const params = htmlTable(
    ['parameter', 'value', 'unit', 'description'],
    PARAM_NAMES.map((n) => {
      const v = meta.params[n];
      const changed = v !== PARAM_INFO[n].value;
      return [n, `${formatNumber(v)}${changed ? ` (default ${formatNumber(PARAM_INFO[n].value)})` : ''}`, printedUnit(PARAM_INFO[n].unit), PARAM_INFO[n].description];
    }),
    'data params',
  );
  return `<div class="cols">
<div>${summary}</div>
<div><h3>Rows by status</h3><div class="status-bar">${bar}</div>${counts}</div>
</div>
<div class="cols">
<div><h3>Swept inputs</h3>${spec.axes.length > 0 ? axes : '<p class="meta">none</p>'}</div>
<div><h3>Constant inputs</h3>${inputsOfSpec(spec).some((i) => !swept.has(i.name)) ? fixed : '<p class="meta">none: every input is swept</p>'}</div>
</div>
<details><summary>${escapeHtml(`Model parameters (${PARAM_NAMES.filter((n) => meta.params[n] !== PARAM_INFO[n].value).length} changed from the defaults)`)}</summary>${params}</details>`;
}
