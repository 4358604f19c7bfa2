/**
 * "Did you mean …": the nearest known name to a mistyped one, by edit distance. QuietframeError
 * adds it to any problem that refuses a name against a list of choices (component types,
 * components, ports, detectors, choice parameters, commands and options).
 */

/**
 * Edit distance with adjacent transpositions (optimal string alignment): insertions,
 * deletions, substitutions and swaps of two neighbouring characters each cost 1, so
 * "stirct" is one step from "strict". Case is ignored.
 */
export function editDistance(a: string, b: string): number {
  const s = a.toLowerCase();
  const t = b.toLowerCase();
  let before = new Array<number>(t.length + 1).fill(0);
  let previous = Array.from({ length: t.length + 1 }, (_, j) => j);
  for (let i = 1; i <= s.length; i++) {
    const current = [i];
    for (let j = 1; j <= t.length; j++) {
      const cost = s[i - 1] === t[j - 1] ? 0 : 1;
      let d = Math.min(previous[j] + 1, current[j - 1] + 1, previous[j - 1] + cost);
      if (i > 1 && j > 1 && s[i - 1] === t[j - 2] && s[i - 2] === t[j - 1]) d = Math.min(d, before[j - 2] + 1);
      current.push(d);
    }
    before = previous;
    previous = current;
  }
  return previous[t.length];
}

/**
 * The candidate nearest to `word`, when it is close enough to be a typo: at most a third of
 * the word's length away (at least one edit). Ties go to the earlier candidate.
 */
export function nearestName(word: string, candidates: readonly string[]): string | undefined {
  const limit = Math.max(1, Math.floor(word.length / 3));
  let best: string | undefined;
  let bestDistance = Infinity;
  for (const c of candidates) {
    const d = editDistance(word, c);
    if (d < bestDistance) {
      best = c;
      bestDistance = d;
    }
  }
  return bestDistance > 0 && bestDistance <= limit ? best : undefined;
}

/** ` (did you mean "x"?)`, or nothing when no candidate is close. */
export function didYouMean(word: string, candidates: readonly string[]): string {
  const near = nearestName(word, candidates);
  return near === undefined ? "" : ` (did you mean "${near}"?)`;
}
