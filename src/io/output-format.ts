/**
 * The table formats meltsweep publishes, and which one a path asks for. The engine always keeps
 * its partial run as Arrow IPC segments; only the final publication converts to the format
 * asked for (src/io/table-sink.ts).
 */
import path from 'node:path';
import { InputError } from '../errors.js';

/** Formats of published tables: Arrow IPC file (default), Parquet (zstd), CSV with a units sidecar. */
export const OUTPUT_FORMATS = ['arrow', 'parquet', 'csv'] as const;
export type OutputFormat = (typeof OUTPUT_FORMATS)[number];

/** File extensions that name a format when --format is not given (lower case, with the dot). */
const FORMAT_EXTENSIONS: Readonly<Record<string, OutputFormat>> = Object.freeze({
  '.arrow': 'arrow',
  '.feather': 'arrow',
  '.ipc': 'arrow',
  '.parquet': 'parquet',
  '.csv': 'csv',
});

/** The format an output path's extension names, or null for any other extension. */
export function formatFromExtension(file: string): OutputFormat | null {
  return FORMAT_EXTENSIONS[path.extname(file).toLowerCase()] ?? null;
}

/** Parse a --format value. @throws InputError naming the allowed values */
export function parseOutputFormat(value: string): OutputFormat {
  const v = value.trim().toLowerCase();
  if ((OUTPUT_FORMATS as readonly string[]).includes(v)) return v as OutputFormat;
  throw new InputError(`--format: ${JSON.stringify(value)} is not a table format; choose one of ${OUTPUT_FORMATS.join(', ')}`);
}

/**
 * The format of an output: `format` when given, else the one its extension names
 * (.arrow/.feather/.ipc, .parquet, .csv), else arrow. The extension itself stays the user's choice.
 */
export function resolveOutputFormat(outPath: string, format?: OutputFormat | string): OutputFormat {
  if (format !== undefined) return parseOutputFormat(format);
  return formatFromExtension(outPath) ?? 'arrow';
}

/** How each format is called in messages. */
const FORMAT_TITLES: Readonly<Record<OutputFormat, string>> = { arrow: 'an Arrow IPC file', parquet: 'Parquet', csv: 'CSV' };

/**
 * A warning when an output's extension disagrees with the format it will be written in, or null.
 * Warned: a table extension naming another format (`-o r.parquet --format csv`), and an extension
 * that is no table format at all when the format comes from the default (`-o r.xlsx`: Arrow IPC).
 * Not warned: a name without an extension, or any extension with an explicit --format that it
 * does not contradict (`-o r.dat --format csv`).
 */
export function outputExtensionWarning(outPath: string, format?: OutputFormat | string): string | null {
  const resolved = resolveOutputFormat(outPath, format);
  const ext = path.extname(outPath);
  if (ext === '') return null;
  const named = formatFromExtension(outPath);
  const writes = `it is written as ${FORMAT_TITLES[resolved]}`;
  if (named !== null && named !== resolved) {
    return `${outPath}: the extension ${ext} names ${FORMAT_TITLES[named]}, but ${writes} (--format ${resolved}); rename the output or drop --format`;
  }
  if (named === null && format === undefined) {
    return `${outPath}: ${ext} is not a table format meltsweep writes, so ${writes}; use .arrow, .parquet or .csv, or give --format`;
  }
  return null;
}

/**
 * A companion table's path: the output's extension kept, `.<suffix>` put before it
 * (`r7.arrow` -> `r7.profiles.arrow`, `r7` -> `r7.profiles`).
 */
function companionPath(outPath: string, suffix: string): string {
  const ext = path.extname(outPath);
  return ext === '' ? `${outPath}.${suffix}` : `${outPath.slice(0, -ext.length)}.${suffix}${ext}`;
}

/** The profile table of an output (`run --profiles`). */
export function profilesPathFor(outPath: string): string {
  return companionPath(outPath, 'profiles');
}
