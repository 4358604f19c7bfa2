/**
 * What a referee is told when a saved state is recomputed: whether the numbers are bit for bit
 * the stored ones, which quietframe wrote the state and which recomputed it, and (under
 * --strict) which fields the fingerprint does not cover and why. `quietframe render` prints it;
 * under --strict every doubt about the numbers is an error instead of a warning.
 */
import { QuietframeError, QUIETFRAME_VERSION } from "../../../src/index";

/** A field of a saved state that the fingerprint does not cover, and why it cannot change the numbers. */
export interface UncheckedField {
  /** Path of the field in the input, e.g. "state.setup.components[1].params.temperature". */
  readonly path: string;
  readonly reason: string;
}

/** The parts of a loaded state this check reads (see LoadedWidget in ../kind.ts). */
export interface RecomputedState {
  readonly fingerprint: { readonly stored: string | null; readonly recomputed: string; readonly writtenBy: string };
  readonly unchecked?: readonly UncheckedField[];
}

export interface ReproductionReport {
  /** Doubts about the numbers that do not stop a plain render. */
  readonly warnings: string[];
  /** What --strict did not check, one line per field, with the reason. */
  readonly notes: string[];
}

const DROP_STRICT = "drop --strict to render the recomputed numbers anyway";

/**
 * Compares a recomputed state with what it stores. `source` names the input in messages (the
 * file as the user typed it). Throws a QuietframeError under `strict` where the numbers cannot
 * be shown to be the stored ones; otherwise returns warnings.
 */
export function checkReproduction(loaded: RecomputedState, source: string, strict: boolean, version: string = QUIETFRAME_VERSION): ReproductionReport {
  const warnings: string[] = [];
  const notes: string[] = [];
  const fp = loaded.fingerprint;
  const versions = fp.writtenBy === version ? `written by quietframe ${fp.writtenBy}, this quietframe` : `written by quietframe ${fp.writtenBy}, recomputed by quietframe ${version}`;
  if (fp.stored === null) {
    const message = `${source} records no fingerprint of its numbers (${versions}), so nothing shows that the recomputed numbers (${fp.recomputed}) are the ones it was saved with`;
    if (strict) {
      throw new QuietframeError({
        path: `${source}.fingerprint`,
        problem: `is missing: ${message}`,
        allowed: `a state saved with its fingerprint (quietframe writes one with every state; docs/fingerprint.md), or ${DROP_STRICT}`,
      });
    }
    warnings.push(message);
  } else if (fp.recomputed !== fp.stored) {
    const message = `the recomputed curves differ from the ones stored in ${source} (stored ${fp.stored}, ${versions}; recomputed ${fp.recomputed})`;
    if (strict) {
      throw new QuietframeError({ path: `${source}.fingerprint`, value: fp.stored, problem: message, allowed: `a state whose numbers this quietframe reproduces bit for bit (${DROP_STRICT})` });
    }
    warnings.push(message);
  } else if (fp.writtenBy !== version) {
    warnings.push(`${source} was written by quietframe ${fp.writtenBy} and is recomputed by quietframe ${version}; the numbers agree bit for bit (${fp.recomputed})`);
  }
  if (strict) for (const u of loaded.unchecked ?? []) notes.push(`--strict does not check ${u.path}: ${u.reason}`);
  return { warnings, notes };
}
