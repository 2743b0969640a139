/**
 * Sweep file text (YAML or JSON) -> plain data -> validated SweepSpec. Syntax errors name the
 * file, line and column: `ridge.yaml:4:1: YAML syntax error: ...`.
 */
import { readFile } from 'node:fs/promises';
import { basename, dirname, extname } from 'node:path';
import { parseDocument } from 'yaml';
import { InputError } from '../errors.js';
import { findJsonSyntaxError } from './json-syntax.js';
import { positionAt } from './text-position.js';
import type { SweepSpec } from './types.js';
import { validateSweep } from './validate.js';

/** Syntax of a sweep file. */
export type SweepFormat = 'json' | 'yaml';

/** Largest alias expansion accepted in a YAML file (guards against alias bombs). */
const MAX_YAML_ALIASES = 100;

/**
 * The format of a sweep file: by extension (.json; .yaml / .yml), otherwise JSON when the
 * text starts with `{`, else YAML.
 */
export function detectSweepFormat(text: string, sourceName: string): SweepFormat {
  const ext = extname(sourceName).toLowerCase();
  if (ext === '.json') return 'json';
  if (ext === '.yaml' || ext === '.yml') return 'yaml';
  return text.trimStart().startsWith('{') ? 'json' : 'yaml';
}

/**
 * Parse a sweep file's text without validating its content.
 * @param sourceName file name used in messages and to pick the format
 * @throws InputError with `<sourceName>:<line>:<column>: ... syntax error: ...`
 */
export function parseSweepData(text: string, sourceName: string): unknown {
  const body = text.startsWith('\uFEFF') ? text.slice(1) : text;
  return detectSweepFormat(body, sourceName) === 'json' ? parseJson(body, sourceName) : parseYaml(body, sourceName);
}

function at(text: string, sourceName: string, offset: number): string {
  const { line, column } = positionAt(text, offset);
  return `${sourceName}:${line}:${column}`;
}

function parseJson(text: string, sourceName: string): unknown {
  try {
    return JSON.parse(text) as unknown;
  } catch (err) {
    const found = findJsonSyntaxError(text);
    if (found !== null) throw new InputError(`${at(text, sourceName, found.offset)}: JSON syntax error: ${found.message}`);
    // the scanner accepts everything JSON.parse accepts; keep the runtime's words if they ever differ
    throw new InputError(`${sourceName}: JSON syntax error: ${err instanceof Error ? err.message : String(err)}`);
  }
}

function parseYaml(text: string, sourceName: string): unknown {
  const doc = parseDocument(text, { prettyErrors: false, uniqueKeys: true });
  const first = doc.errors[0];
  if (first !== undefined) {
    const message = first.code === 'MULTIPLE_DOCS' ? 'a sweep file holds one document; found a second one' : first.message;
    throw new InputError(`${at(text, sourceName, first.pos[0])}: YAML syntax error: ${message}`);
  }
  try {
    return doc.toJS({ maxAliasCount: MAX_YAML_ALIASES }) as unknown;
  } catch (err) {
    throw new InputError(`${sourceName}: YAML error: ${err instanceof Error ? err.message : String(err)}`);
  }
}

/**
 * Parse and validate a sweep file's text (JSON or YAML, chosen by the extension of
 * `sourceName` or by the content). A file without `name` takes the base name of `sourceName`; file
 * names inside the model section (a flux geotherm table) are relative to the folder of `sourceName`.
 * @throws InputError listing every problem (syntax errors with line and column).
 */
export function parseSweepText(text: string, sourceName: string): SweepSpec {
  const data = parseSweepData(text, sourceName);
  const stem = basename(sourceName, extname(sourceName));
  return validateSweep(data, { defaultName: stem === '' ? 'sweep' : stem, baseDir: dirname(sourceName) });
}

/**
 * Read, parse and validate a sweep file.
 * @throws InputError when the file cannot be read or is not a valid sweep.
 */
export async function loadSweepFile(path: string): Promise<SweepSpec> {
  let text: string;
  try {
    text = await readFile(path, 'utf8');
  } catch (err) {
    const code = (err as NodeJS.ErrnoException).code;
    const why = code === 'ENOENT' ? 'no such file' : code === 'EISDIR' ? 'it is a directory' : code === 'EACCES' ? 'permission denied' : String((err as Error).message);
    throw new InputError(`${path}: cannot read the sweep file (${why})`);
  }
  return parseSweepText(text, path);
}
