/**
 * The named errors meltsweep raises. The CLI maps them to exit codes:
 * InputError (bad sweep file, option or parameter) -> 2, RunError (the run failed) -> 1.
 */

/** Bad input: names the field, the value found and what is allowed. Exit code 2. */
export class InputError extends Error {
  override readonly name: string = 'InputError';
  readonly problems: readonly string[];
  constructor(problems: string | readonly string[]) {
    const list = typeof problems === 'string' ? [problems] : problems;
    super(list.join('\n'));
    this.problems = list;
  }
}

/** A run that could not complete (write error, pool failure). Exit code 1. */
export class RunError extends Error {
  override readonly name: string = 'RunError';
}

/**
 * Run fn; when it throws an InputError, add its problems to `problems` and return `fallback`
 * instead, so a command can name every bad option at once. Other errors pass through.
 */
export function collectInputErrors<T>(problems: string[], fn: () => T, fallback: T): T {
  try {
    return fn();
  } catch (err) {
    if (!(err instanceof InputError)) throw err;
    problems.push(...err.problems);
    return fallback;
  }
}

export const EXIT_OK = 0;
export const EXIT_RUN_FAILED = 1;
export const EXIT_BAD_INPUT = 2;
