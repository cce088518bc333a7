/**
 * Suggestions for misspelt names: the closest candidate by edit distance.
 */

/**
 * Edit distance by optimal string alignment: the fewest single-character insertions, deletions,
 * substitutions and swaps of two neighbouring characters that turn `a` into `b` (Levenshtein,
 * 1966, with Damerau's 1964 transposition). Examples: `editDistance("mesures", "measures")` is 1,
 * `editDistance("levle", "level")` is 1.
 */
export function editDistance(a: string, b: string): number {
  const rows: number[][] = [Array.from({ length: b.length + 1 }, (_, j) => j)];
  for (let i = 1; i <= a.length; i++) {
    const row = [i];
    for (let j = 1; j <= b.length; j++) {
      const cost = a[i - 1] === b[j - 1] ? 0 : 1;
      let best = Math.min(rows[i - 1][j] + 1, row[j - 1] + 1, rows[i - 1][j - 1] + cost);
      if (i > 1 && j > 1 && a[i - 1] === b[j - 2] && a[i - 2] === b[j - 1]) best = Math.min(best, rows[i - 2][j - 2] + 1);
      row.push(best);
    }
    rows.push(row);
  }
  return rows[a.length][b.length];
}

/**
 * The candidate closest to `word` (ignoring case), or null when none is close: a candidate is
 * close when at most a third of the word's characters (at least one) must change. Ties go to the
 * candidate listed first.
 */
export function closest(word: string, candidates: readonly string[]): string | null {
  const limit = Math.max(1, Math.floor(word.length / 3));
  let best: string | null = null;
  let bestDistance = Infinity;
  for (const candidate of candidates) {
    const distance = editDistance(word.toLowerCase(), candidate.toLowerCase());
    if (distance <= limit && distance < bestDistance) {
      best = candidate;
      bestDistance = distance;
    }
  }
  return best;
}
