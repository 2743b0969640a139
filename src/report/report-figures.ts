/**
 * `report --figures DIR`: every figure of a report as SVG, PNG and PDF files, at a chosen width
 * and resolution. Figures that can be laid out again (maps, column diagrams) are drawn at the
 * requested width; the others are scaled to it. Nothing is replaced without `force`.
 */
import fs from 'node:fs';
import path from 'node:path';
import { InputError } from '../errors.js';
import { writeFileAtomic } from '../io/ipc-file.js';
import { exportFigure, FIGURE_FORMATS, layoutWidthFor, type ExportSize } from './export.js';
import { renderFigure, type FigureLayout } from './figure.js';

/** A figure of a report with what is needed to draw it again at another width. */
export interface ReportFigure {
  readonly kind: string;
  readonly output: string | null;
  readonly svg: string;
  /** null: drawn at its own layout only (exports scale it) */
  readonly layout: FigureLayout | null;
  readonly caption: string;
}

/** `03-map-crust_km`: the page order, the kind and the output of a figure. */
export function figureStem(index: number, figure: Pick<ReportFigure, 'kind' | 'output'>): string {
  return [String(index + 1).padStart(2, '0'), figure.kind, ...(figure.output === null ? [] : [figure.output])].join('-');
}

/** Every file `writeReportFigures` writes, in order. */
export function reportFigureFiles(dir: string, figures: readonly Pick<ReportFigure, 'kind' | 'output'>[]): string[] {
  return figures.flatMap((f, k) => FIGURE_FORMATS.map((format) => path.join(dir, `${figureStem(k, f)}.${format}`)));
}

/** Files in dir named like report figures (NN-kind[-output].svg|png|pdf). */
const FIGURE_FILE = /^[0-9]{2}-[a-z-]+(-[A-Za-z0-9_]+)?\.(svg|png|pdf)$/;

/**
 * Check a --figures folder before the report is built: not a file, and (without force) holding
 * no figure files of an earlier report. @throws InputError
 */
export function checkFiguresDir(dir: string, force = false): void {
  if (!fs.existsSync(dir)) {
    const parent = path.dirname(path.resolve(dir));
    if (!fs.existsSync(parent)) throw new InputError(`--figures: folder ${parent} does not exist`);
    return;
  }
  if (!fs.statSync(dir).isDirectory()) throw new InputError(`--figures: ${dir} is a file; give a folder`);
  if (force) return;
  const taken = fs.readdirSync(dir).filter((f) => FIGURE_FILE.test(f));
  if (taken.length > 0) throw new InputError(`--figures: ${dir} already holds ${taken.length} figure file${taken.length > 1 ? 's' : ''} (${taken[0]}${taken.length > 1 ? ', ...' : ''}); give --force to replace them, or choose another folder`);
}

/**
 * Write every figure as SVG, PNG and PDF into dir (created when missing).
 * @throws InputError when a file exists and force is not set (before anything is written)
 */
export async function writeReportFigures(dir: string, figures: readonly ReportFigure[], size: ExportSize, force = false): Promise<string[]> {
  checkFiguresDir(dir, force);
  const files = reportFigureFiles(dir, figures);
  fs.mkdirSync(dir, { recursive: true });
  const target = layoutWidthFor(size);
  for (const [k, f] of figures.entries()) {
    const svg = f.layout !== null && target !== undefined ? (await renderFigure(f.layout, target)).svg : f.svg;
    for (const format of FIGURE_FORMATS) writeFileAtomic(path.join(dir, `${figureStem(k, f)}.${format}`), await exportFigure(svg, format, size, f.caption));
  }
  return files;
}
