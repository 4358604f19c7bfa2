/**
 * "Did you mean …": the nearest known name to a mistyped one, by edit distance, for unknown
 * options, commands, component types and component names in the CLI's messages.
 */
import { QuietframeError, QuietframeErrors } from "../errors";

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

/**
 * Adds the nearest name to problems that refuse a name and list the names allowed (an unknown
 * component type, component, port or detector): the refused name is the one quoted in the
 * problem ("no component named 'x'") or the value. Other errors pass unchanged.
 */
export function withSuggestions(e: QuietframeError | QuietframeErrors): QuietframeError | QuietframeErrors {
  if (e instanceof QuietframeErrors) return new QuietframeErrors(e.problems.map((p) => withSuggestion(p)));
  return withSuggestion(e);
}

function withSuggestion(e: QuietframeError): QuietframeError {
  const names = e.allowed
    ?.split(/,\s*|\s+or\s+/)
    .map((n) => n.trim().replace(/^"(.*)"$/, "$1"))
    .filter((n) => n.length > 0);
  if (!names || names.length === 0 || !names.every((n) => /^[\w.-]+$/.test(n))) return e;
  const refused = /named '([^']+)'/.exec(e.problem)?.[1] ?? (typeof e.value === "string" ? e.value : undefined);
  if (refused === undefined || names.includes(refused)) return e;
  const hint = didYouMean(refused, names);
  return hint ? new QuietframeError({ path: e.path, value: e.value, problem: `${e.problem}${hint}`, allowed: e.allowed }) : e;
}
