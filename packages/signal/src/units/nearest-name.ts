/**
 * Levenshtein distance (insertions, deletions, substitutions each cost 1; Levenshtein 1966, Soviet
 * Physics Doklady 10:707), with the usual two-row dynamic programme.
 */
export function editDistance(a: string, b: string): number {
  if (a === b) return 0;
  if (a.length === 0) return b.length;
  if (b.length === 0) return a.length;
  let previous = Array.from({ length: b.length + 1 }, (_, j) => j);
  let current = new Array<number>(b.length + 1);
  for (let i = 1; i <= a.length; i++) {
    current[0] = i;
    for (let j = 1; j <= b.length; j++) {
      const substitution = previous[j - 1]! + (a.charCodeAt(i - 1) === b.charCodeAt(j - 1) ? 0 : 1);
      current[j] = Math.min(previous[j]! + 1, current[j - 1]! + 1, substitution);
    }
    [previous, current] = [current, previous];
  }
  return previous[b.length]!;
}

/**
 * The candidate closest to `name` (case and punctuation ignored), when it is close enough to be a slip of
 * the keyboard: at most 2 edits, and no more than half the longer name (so 'fs' is not "corrected" to 'g',
 * while 'gg' still points to 'g'). A typo such as 'unti' for 'unit' or 'smaple_rate' for 'sampleRate' is one or two edits; two
 * unrelated words of a few letters are not. Undefined when nothing qualifies.
 */
export function nearestName(name: string, candidates: readonly string[]): string | undefined {
  const fold = (s: string) => s.toLowerCase().replace(/[^a-z0-9/^]/g, '');
  const wanted = fold(name);
  let best: string | undefined;
  let bestDistance = Infinity;
  for (const candidate of candidates) {
    const d = editDistance(wanted, fold(candidate));
    if (d < bestDistance) {
      best = candidate;
      bestDistance = d;
    }
  }
  if (best === undefined) return undefined;
  const longer = Math.max(wanted.length, fold(best).length);
  return bestDistance <= 2 && bestDistance <= longer / 2 ? best : undefined;
}
