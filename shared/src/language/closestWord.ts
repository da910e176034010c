// "Did you mean" hints: the nearest word of a small vocabulary to a misspelt one.

/** Lowercase edit distance, for "did you mean" hints. */
export function editDistance(a: string, b: string): number {
  a = a.toLowerCase();
  b = b.toLowerCase();
  const row = Array.from({ length: b.length + 1 }, (_, j) => j);
  for (let i = 1; i <= a.length; i++) {
    let prev = row[0]!;
    row[0] = i;
    for (let j = 1; j <= b.length; j++) {
      const cur = row[j]!;
      row[j] = Math.min(row[j]! + 1, row[j - 1]! + 1, prev + (a[i - 1] === b[j - 1] ? 0 : 1));
      prev = cur;
    }
  }
  return row[b.length]!;
}

/** The closest candidate within a small edit distance, if any. */
export function closest(word: string, candidates: Iterable<string>): string | undefined {
  let best: string | undefined;
  let bestD = Infinity;
  const limit = word.length <= 3 ? 1 : 2;
  for (const c of candidates) {
    // Lengths further apart than the limit cannot be near; skipping them keeps a huge word cheap.
    if (Math.abs(c.length - word.length) > limit) continue;
    const d = editDistance(word, c);
    if (d < bestD) [best, bestD] = [c, d];
  }
  return bestD <= limit ? best : undefined;
}
