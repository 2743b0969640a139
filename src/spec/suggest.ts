/**
 * "Did you mean ...?" for unknown keys: the nearest allowed name by edit distance.
 */

/**
 * Optimal-string-alignment distance (Levenshtein plus adjacent transpositions), so a
 * swapped pair of letters (`desgin`) counts as one edit.
 */
export function editDistance(a: string, b: string): number {
  const n = a.length;
  const m = b.length;
  if (n === 0) return m;
  if (m === 0) return n;
  // three rolling rows: i-2, i-1, i
  let prev2 = new Array<number>(m + 1).fill(0);
  let prev = Array.from({ length: m + 1 }, (_, j) => j);
  let cur = new Array<number>(m + 1).fill(0);
  for (let i = 1; i <= n; i++) {
    cur[0] = i;
    for (let j = 1; j <= m; j++) {
      const cost = a[i - 1] === b[j - 1] ? 0 : 1;
      let d = Math.min(prev[j] + 1, cur[j - 1] + 1, prev[j - 1] + cost);
      if (i > 1 && j > 1 && a[i - 1] === b[j - 2] && a[i - 2] === b[j - 1]) d = Math.min(d, prev2[j - 2] + 1);
      cur[j] = d;
    }
    [prev2, prev, cur] = [prev, cur, prev2];
  }
  return prev[m];
}

/**
 * The allowed name nearest to `given`, or null when none is close enough to be a likely typo.
 * Close means: same name ignoring case and `-`/`_`, one is a prefix of the other (at least
 * two letters, e.g. `water` -> `water_ppm`), or an edit distance of at most max(2, length / 3).
 * Ties go to the earlier name in `allowed`.
 */
export function suggestName(given: string, allowed: readonly string[]): string | null {
  const g = simplify(given);
  if (g.length === 0) return null;
  let best: string | null = null;
  let bestScore = Number.POSITIVE_INFINITY;
  for (const name of allowed) {
    const a = simplify(name);
    let score: number;
    if (a === g) score = 0;
    else if (g.length >= 2 && (a.startsWith(g) || g.startsWith(a))) score = 0.5;
    else {
      const d = editDistance(g, a);
      score = d <= Math.max(2, Math.floor(Math.max(g.length, a.length) / 3)) ? d : Number.POSITIVE_INFINITY;
    }
    if (score < bestScore) {
      bestScore = score;
      best = name;
    }
  }
  return best;
}

/**
 * "did you mean X; " for a name near one of `allowed` (ready to put before a list of the allowed
 * names), else "".
 */
export function didYouMean(given: string, allowed: readonly string[]): string {
  const near = suggestName(given, allowed);
  return near === null || near === given ? '' : `did you mean ${near}? `;
}

function simplify(s: string): string {
  return s.toLowerCase().replace(/[-_\s]/g, '');
}
