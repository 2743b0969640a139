/** Option parsers shared by commands: each throws InputError naming the option, value and what is allowed. */
import { InputError } from '../errors.js';
import { outputExtensionWarning, type OutputFormat } from '../io/output-format.js';

export function parseWorkers(value: string): number {
  const n = Number(value);
  if (!Number.isInteger(n) || n < 1 || n > 1024) throw new InputError(`--workers: ${value} is not allowed; give a whole number from 1 to 1024`);
  return n;
}

export function parseNumberOption(option: string, value: string, min: number, max: number, unit: string): number {
  const n = Number(value);
  if (value.trim() === '' || !Number.isFinite(n)) throw new InputError(`${option}: ${JSON.stringify(value)} is not a number; allowed ${min} to ${max} ${unit}`);
  if (n < min || n > max) throw new InputError(`${option}: ${value} ${unit} is outside the allowed range ${min} to ${max} ${unit}`);
  return n;
}

/** Print on stderr when an output's extension disagrees with the format it is written in. */
/** Print a note to stderr (something the user should know that is not an error). */
export function printNote(message: string): void {
  process.stderr.write(`note: ${message}\n`);
}

export function warnOutputExtension(outPath: string, format?: OutputFormat): void {
  const w = outputExtensionWarning(outPath, format);
  if (w !== null) process.stderr.write(`warning: ${w}\n`);
}
