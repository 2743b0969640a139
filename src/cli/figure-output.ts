/**
 * The options every picture-writing command shares: `-o FILE.svg|png|pdf`, `--width 85mm|1200px`,
 * `--dpi 300` and `--force` (an existing file is never replaced without it).
 */
import fs from 'node:fs';
import path from 'node:path';
import type { Command } from 'commander';
import { collectInputErrors, InputError } from '../errors.js';
import { DEFAULT_DPI, formatOfPath, parseDpiOption, parseWidthOption, type ExportSize, type FigureFormat } from '../report/export-options.js';

/** Raw values of the shared picture options. */
export interface FigureCliOptions {
  output: string;
  width?: string;
  dpi?: string;
  force?: boolean;
}

/** Add --width, --dpi and --force to a command that writes pictures. */
export function addFigureSizeOptions(cmd: Command): Command {
  return cmd
    .option('--width <width>', 'figure width: physical (85mm, 17.8cm, 3.35in; the layout follows it) or PNG pixels (1200px)')
    .option('--dpi <n>', `PNG resolution in dots per inch (default ${DEFAULT_DPI}); with a pixel width it also sets the physical size`)
    .option('--force', 'replace existing output files');
}

/** Refuse to replace an existing file without --force, and a missing folder. @throws InputError naming the option */
export function checkOutputFile(option: string, file: string, force: boolean | undefined): void {
  if (file.trim() === '') throw new InputError(`${option}: the file name is empty`);
  const dir = path.dirname(path.resolve(file));
  if (!fs.existsSync(dir) || !fs.statSync(dir).isDirectory()) throw new InputError(`${option}: folder ${dir} does not exist`);
  if (fs.statSync(file, { throwIfNoEntry: false })?.isDirectory() === true) throw new InputError(`${option}: ${file} is a folder; give a file name`);
  const link = fs.lstatSync(file, { throwIfNoEntry: false });
  if (link === undefined || force) return;
  if (link.isSymbolicLink() && !fs.existsSync(file)) {
    throw new InputError(`${option}: ${file} is a symbolic link to a missing file (${fs.readlinkSync(file)}); give --force to replace the link`);
  }
  throw new InputError(`${option}: ${file} already exists; give --force to replace it`);
}

/**
 * The format (from -o's extension) and export size of a picture command.
 * @throws InputError naming each bad option, the value and what is allowed
 */
export function figureOutput(o: FigureCliOptions): { format: FigureFormat; size: ExportSize } {
  const problems: string[] = [];
  const format = formatOfPath(o.output);
  if (format === null) problems.push(`-o: ${JSON.stringify(o.output)} is not allowed; give a file name ending in .svg, .png or .pdf`);
  const size = figureSize(o, problems);
  if (problems.length > 0) throw new InputError(problems);
  return { format: format as FigureFormat, size };
}

/** --width and --dpi of a picture; each bad value is added to `problems` (the caller throws). */
export function figureSize(o: { readonly width?: string; readonly dpi?: string }, problems: string[]): ExportSize {
  const attempt = <T>(fn: () => T): T | undefined => collectInputErrors<T | undefined>(problems, fn, undefined);
  const width = o.width === undefined ? undefined : attempt(() => parseWidthOption(o.width as string));
  const dpi = o.dpi === undefined ? undefined : attempt(() => parseDpiOption(o.dpi as string));
  return { width, dpi };
}
