import { QuietframeError, QuietframeErrors } from "../../src/errors";

/** The QuietframeError that fn throws; any other error propagates, and no error fails the test. */
export function quietframeErrorOf(fn: () => unknown): QuietframeError {
  try {
    fn();
  } catch (e) {
    if (e instanceof QuietframeError) return e;
    throw e;
  }
  throw new Error("expected a QuietframeError");
}

/** The one problem fn reports: a QuietframeError, or a QuietframeErrors holding exactly one; anything else fails the test. */
export function singleProblemOf(fn: () => unknown): QuietframeError {
  try {
    fn();
  } catch (e) {
    if (e instanceof QuietframeError) return e;
    if (e instanceof QuietframeErrors && e.problems.length === 1) return e.problems[0];
    throw e;
  }
  throw new Error("expected a QuietframeError");
}
