/**
 * Sweep file text (YAML or JSON) -> plain data -> validated SweepSpec. Syntax errors name the
 * file, line and column: `ridge.yaml:4:1: YAML syntax error: ...`.
 */
import { open } from 'node:fs/promises';
import { basename, dirname, extname } from 'node:path';
import { parseDocument } from 'yaml';
import { InputError } from '../errors.js';
import { findJsonSyntaxError } from './json-syntax.js';
import { MAX_SWEEP_FILE_BYTES } from './limits.js';
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
  let data: unknown;
  try {
    data = JSON.parse(text) as unknown;
  } catch (err) {
    const found = findJsonSyntaxError(text);
    if (found !== null) throw new InputError(`${at(text, sourceName, found.offset)}: JSON syntax error: ${found.message}`);
    // the scanner accepts everything JSON.parse accepts; keep the runtime's words if they ever differ
    throw new InputError(`${sourceName}: JSON syntax error: ${err instanceof Error ? err.message : String(err)}`);
  }
  // JSON.parse keeps the last of two equal keys without a word; YAML refuses them, and so does this
  // (JSON is YAML 1.2, so the YAML parser finds them with their position)
  const dup = parseDocument(text, { prettyErrors: false, uniqueKeys: true }).errors.find((e) => e.code === 'DUPLICATE_KEY');
  if (dup !== undefined) throw new InputError(`${at(text, sourceName, dup.pos[0])}: JSON error: a key appears twice in one object; keep one`);
  return data;
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
  return parseSweepText(await readSweepText(path), path);
}

/**
 * The text of a sweep file, checked before it is parsed: a regular file (not a device, pipe or
 * folder) of at most MAX_SWEEP_FILE_BYTES, read no further than that, holding UTF-8 text.
 * @throws InputError naming the file and what is wrong
 */
async function readSweepText(path: string): Promise<string> {
  let bytes: Buffer;
  try {
    const fh = await open(path, 'r');
    try {
      const st = await fh.stat();
      if (st.isDirectory()) throw new InputError(`${path}: cannot read the sweep file (it is a directory)`);
      if (!st.isFile()) throw new InputError(`${path}: not a regular file (a device, pipe or socket); give a sweep file (YAML or JSON)`);
      const limit = MAX_SWEEP_FILE_BYTES;
      if (st.size > limit) throw new InputError(`${path}: ${formatBytes(st.size)} is too large for a sweep file; at most ${formatBytes(limit)} (a sweep describes axes, not data)`);
      const buf = Buffer.alloc(limit + 1);
      let n = 0;
      for (;;) {
        const { bytesRead } = await fh.read(buf, n, buf.length - n, n);
        if (bytesRead === 0) break;
        n += bytesRead;
        if (n > limit) throw new InputError(`${path}: more than ${formatBytes(limit)}; a sweep file holds at most that (a sweep describes axes, not data)`);
      }
      bytes = buf.subarray(0, n);
    } finally {
      await fh.close();
    }
  } catch (err) {
    if (err instanceof InputError) throw err;
    const code = (err as NodeJS.ErrnoException).code;
    const why = code === 'ENOENT' ? 'no such file' : code === 'EISDIR' ? 'it is a directory' : code === 'EACCES' ? 'permission denied' : String((err as Error).message);
    throw new InputError(`${path}: cannot read the sweep file (${why})`);
  }
  if (bytes.includes(0)) throw new InputError(`${path}: not a text file (it holds NUL bytes); a sweep file is YAML or JSON text`);
  try {
    return new TextDecoder('utf-8', { fatal: true }).decode(bytes);
  } catch {
    throw new InputError(`${path}: not UTF-8 text; a sweep file is YAML or JSON text in UTF-8`);
  }
}

function formatBytes(n: number): string {
  return n >= 1024 * 1024 ? `${(n / (1024 * 1024)).toFixed(1)} MiB` : `${n} bytes`;
}
