/**
 * The self-contained HTML page of a fit: what was observed and assumed, the warnings, prior
 * against posterior for every swept input, the matrix of two-input posterior densities, each
 * observed output against its posterior predictive, and the summary table. Every picture is an
 * inline SVG rendered in Node; the page needs no network access and runs no script.
 */
import fs from 'node:fs';
import path from 'node:path';
import { InputError } from '../errors.js';
import { formatFitNumber } from '../fit/format.js';
import type { FitSummary } from '../fit/types.js';
import { writeFileAtomic } from '../io/ipc-file.js';
import type { FitFileResult } from '../io/fit-file.js';
import { marginalSpec, pairMatrixSpec, predictiveSpec } from './fit-plots.js';
import { escapeHtml, htmlFigure, htmlPage, htmlTable } from './html.js';
import { renderSvg, type PlotSpec } from './render.js';

/** Kinds of picture on a fit page, as in each figure's data-plot attribute. */
export type FitPlotKind = 'marginal' | 'pairs' | 'predictive';

/** A built fit page. */
export interface FitPage {
  readonly html: string;
  /** the pictures, in page order, with the input or output each one shows */
  readonly plots: readonly { readonly kind: FitPlotKind; readonly name: string | null }[];
  /** warnings of the plotting libraries (none expected) */
  readonly warnings: readonly string[];
}

const f = formatFitNumber;

function summaryCells(s: FitSummary): string[] {
  return [f(s.mean), f(s.sd), f(s.p2_5), f(s.p16), f(s.p50), f(s.p84), f(s.p97_5)];
}

const PAGE_CSS = `
.warn { border-left: 4px solid #E69F00; background: #fff8ea; padding: 8px 12px; margin: 10px 0; border-radius: 4px; }
.warn p { margin: 2px 0; }
.warn .next { color: #5a6573; }
.ok { border-left: 4px solid #009E73; background: #eefaf5; padding: 8px 12px; margin: 10px 0; border-radius: 4px; }
`;

/** Build the page of a fitted results file. */
export async function buildFitPage(r: FitFileResult, title?: string): Promise<FitPage> {
  const fit = r.fit;
  const warnings: string[] = [];
  const plots: { kind: FitPlotKind; name: string | null }[] = [];
  let count = 0;
  const figure = async (kind: FitPlotKind, name: string | null, spec: PlotSpec, caption: string): Promise<string> => {
    const out = await renderSvg(spec, { idPrefix: `f${++count}-` });
    warnings.push(...out.warnings);
    plots.push({ kind, name });
    return htmlFigure(kind, out.svg, caption, name === null ? {} : { name });
  };
  const unit = (n: string): string => r.units[n] ?? '';
  const logInputs = new Set(r.prior.axes.filter((a) => a.scale === 'log').map((a) => a.name));

  const marginals: string[] = [];
  for (const h of fit.marginals) {
    marginals.push(await figure('marginal', h.name, marginalSpec(h, fit.posterior[h.name], unit(h.name), logInputs.has(h.name)), `${h.name}: prior (the design, grey) and posterior (blue) densities; shaded: the posterior's 16-84 % range; dashed: its median.`));
  }
  const names = r.prior.axes.map((a) => a.name);
  const pairSpec = pairMatrixSpec(names, fit.pairs, r.units, logInputs, fit.best.inputs);
  const pairs = pairSpec === null ? '' : await figure('pairs', null, pairSpec, 'Posterior density over each pair of swept inputs (the other inputs summed over). Cross: the best-fitting row.');
  const predictive: string[] = [];
  for (const h of fit.predictive) {
    const obs = fit.observations.find((o) => o.output === h.name) ?? null;
    const what = obs !== null ? 'observed value (red line, 1 and 2 sd bands) against the' : 'the';
    predictive.push(await figure('predictive', h.name, predictiveSpec(h, unit(h.name), obs, fit.predict[h.name]), `${h.name}: ${what} prior predictive (every used row, grey) and posterior predictive (blue).`));
  }

  const obsRows = fit.observations.map((o) => [o.output, f(o.value), f(o.sd), o.discrepancySd ? f(o.discrepancySd) : '0', f(o.totalSd), unit(o.output)]);
  const leftOut = Object.entries(fit.rowsLeftOut);
  const facts = htmlTable(
    ['', ''],
    [
      ['prior', fit.priorText],
      ['likelihood', 'independent Gaussian errors; total sd = sqrt(sd² + discrepancy²)'],
      ['rows used', `${fit.rowsUsed} of ${fit.rows} (${Object.entries(fit.usedByStatus).map(([k, v]) => `${k} ${v}`).join(', ')})`],
      ['rows left out', leftOut.length === 0 ? 'none' : leftOut.map(([k, v]) => `${k}: ${v}`).join('; ')],
      ['effective sample size', f(fit.ess)],
      ['rows within 3 sd of every observation', String(fit.rowsWithin3Sd)],
      ['best-fitting row', `scenario ${fit.best.id}: ${Object.entries(fit.best.inputs).map(([k, v]) => `${k} ${f(v)} ${unit(k)}`.trim()).join(', ')}; ${fit.observations.map((o) => `${o.output} ${f(fit.best.outputs[o.output])} (z ${f(fit.best.z[o.output])})`).join(', ')}`],
    ],
    'data kv',
  );
  const warningHtml =
    fit.warnings.length === 0
      ? '<div class="ok"><p>No warning: enough effective rows, the posterior stays inside the swept ranges, and rows fit the observations.</p></div>'
      : fit.warnings.map((w) => `<div class="warn" data-warning="${escapeHtml(w.kind)}"><p>${escapeHtml(w.message)}</p><p class="next">Next: ${escapeHtml(w.nextStep)}</p></div>`).join('\n');
  const head = ['', 'unit', 'mean', 'sd', '2.5 %', '16 %', '50 %', '84 %', '97.5 %'];
  const summary = htmlTable(head, [
    ...names.flatMap((n) => [
      [`${n} posterior`, unit(n), ...summaryCells(fit.posterior[n])],
      [`${n} prior`, unit(n), ...summaryCells(fit.prior[n])],
    ]),
    ...Object.keys(fit.predict).map((n) => [`${n} posterior predictive`, unit(n), ...summaryCells(fit.predict[n])]),
  ]);

  const pageTitle = title ?? `meltsweep fit: ${r.spec.name}`;
  const section = (heading: string, content: string, kind: string): string => `<section class="card" data-section="${kind}">\n<h2>${escapeHtml(heading)}</h2>\n${content}\n</section>`;
  const body = [
    `<header class="top"><h1>${escapeHtml(pageTitle)}</h1><p class="meta">${escapeHtml(path.basename(r.file))} · meltsweep ${escapeHtml(r.meta.toolVersion)} · sweep ${escapeHtml(r.meta.sweepHash.slice(0, 12))}</p></header>`,
    section('Observations and fit', `<div class="cols"><div>${htmlTable(['observed output', 'value', 'sd', 'discrepancy sd', 'total sd', 'unit'], obsRows)}</div><div>${facts}</div></div>\n${warningHtml}`, 'fit'),
    section('Inputs: prior and posterior', `<div class="plots">\n${marginals.join('\n')}\n</div>`, 'marginals'),
    pairs === '' ? section('Pairs of inputs', '<p class="meta">One swept input: no pair panels.</p>', 'pairs') : section('Pairs of inputs', `<div class="plots wide">\n${pairs}\n</div>`, 'pairs'),
    section('Observed against predicted', `<div class="plots">\n${predictive.join('\n')}\n</div>`, 'predictive'),
    section('Summary', summary, 'summary'),
    section(
      'Assumptions',
      `<ul class="notes"><li>${escapeHtml('Errors are Gaussian and independent between observations; the sd given is one standard deviation.')}</li><li>${escapeHtml("The prior is the sweep's own design: inputs outside the swept ranges have no weight, and a coarse design gives coarse answers.")}</li><li>${escapeHtml('The posterior is a model estimate: it says which inputs make this model reproduce the observations, not what the mantle is.')}</li><li>${escapeHtml('Rows that failed or whose onset lies beyond the model range are left out (counted above); no_melt rows count with their values.')}</li></ul>`,
      'assumptions',
    ),
    '<footer>Model estimates from a one-dimensional parameterised melting model, not observations. Not a tool for volcanic hazard assessment.</footer>',
  ];
  return { html: htmlPage(pageTitle, body.join('\n'), PAGE_CSS), plots, warnings };
}

/**
 * Build the page and write it atomically.
 * @throws InputError when the output folder does not exist
 */
export async function writeFitPage(r: FitFileResult, outPath: string, title?: string): Promise<FitPage> {
  const dir = path.dirname(path.resolve(outPath));
  if (!fs.existsSync(dir)) throw new InputError(`-o: folder ${dir} does not exist`);
  const page = await buildFitPage(r, title);
  writeFileAtomic(outPath, page.html);
  return page;
}
