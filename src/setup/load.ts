import { parseJsonText } from "./parse-json";
import { validateSetup, type ResolvedSetup } from "./validate";

/**
 * Passes 1 and 2 in one call: a set-up as JSON text (parsed, errors with line and column) or
 * as an object, validated into SI numbers with resolved ports.
 */
export function loadSetup(input: string | unknown, source = "setup"): ResolvedSetup {
  return validateSetup(typeof input === "string" ? parseJsonText(input, source) : input);
}
