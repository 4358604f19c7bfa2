import { QuietframeError } from "../../src/errors";

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
