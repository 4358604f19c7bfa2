import { readFileSync } from "node:fs";
import { resolve } from "node:path";
import { QuietframeError } from "../errors";
import { parseJsonText } from "./parse-json";
import type { SetupDescription } from "./format";
import { validateSetup } from "./validate";
import { readSpectrumFiles } from "./spectrum-files";

/**
 * Reads a set-up file (relative paths from the working directory) and the spectrum files its
 * classical noise terms name (relative to the set-up file), and checks it; errors name the
 * file, the field (or line) and the value. Node only: the browser-safe entry never reads files.
 */
export function loadSetupFile(path: string, hint = "a set-up JSON file"): SetupDescription {
  let text: string;
  try {
    text = readFileSync(resolve(path), "utf8");
  } catch (e) {
    const reason = (e as NodeJS.ErrnoException).code === "ENOENT" ? "does not exist" : "cannot be read";
    throw new QuietframeError({ path, problem: `${reason} (looked in ${process.cwd()})`, allowed: hint });
  }
  const setup = readSpectrumFiles(parseJsonText(text, path), path);
  validateSetup(setup);
  return setup as SetupDescription;
}
