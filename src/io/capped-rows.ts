/**
 * Rows with a capped onset (`model.deep_onset: cap`): their onset lies deeper than the model covers
 * and the column was computed from there up, so onset_p_gpa is the cap (a lower bound) and the melt
 * amounts miss the melting below it. sensitivity, report and fit use them or leave them out on
 * request (`--capped include|exclude`, default include) and always say how many there are.
 */
import { InputError } from '../errors.js';

/** The flag column of capped rows (1 = capped). */
export const CAPPED_FLAG = 'onset_capped';

const CAPPED_CHOICES = ['include', 'exclude'] as const;
export type CappedChoice = (typeof CAPPED_CHOICES)[number];

/** Parse `--capped`. @throws InputError naming the allowed values */
export function parseCappedOption(value: string): CappedChoice {
  const v = value.trim().toLowerCase();
  if ((CAPPED_CHOICES as readonly string[]).includes(v)) return v as CappedChoice;
  throw new InputError(`--capped: ${JSON.stringify(value)} is not allowed; choose include or exclude (rows whose onset was capped at 8 GPa)`);
}

/** The help text of `--capped`. */
export const CAPPED_HELP =
  'rows whose onset lies deeper than 8 GPa and was capped (sweeps with model.deep_onset: cap): include (default) or exclude';

/**
 * The sentence that says how many capped rows a file has and what was done with them; null for a
 * table without the flag column (a sweep without deep_onset: cap).
 */
export function cappedNote(cappedRows: number | null, choice: CappedChoice): string | null {
  if (cappedRows === null) return null;
  if (cappedRows === 0) return 'capped onsets: none (no onset deeper than 8 GPa in this sweep)';
  const rows = `${cappedRows.toLocaleString('en-US')} row${cappedRows === 1 ? '' : 's'}`;
  return choice === 'include'
    ? `capped onsets: ${rows} with an onset deeper than 8 GPa, computed from 8 GPa up (onset_p_gpa = 8 and the melt amounts are lower bounds), are included; --capped exclude leaves them out`
    : `capped onsets: ${rows} with an onset deeper than 8 GPa are left out (--capped exclude); --capped include uses them`;
}
