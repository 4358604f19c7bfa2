/**
 * Node only: reads the CSV files a set-up's classical noise terms name and writes their points
 * into the description, so that what is validated, saved in states and sent to workers is the
 * data itself (the file name stays beside it). Paths are relative to the set-up file's folder.
 */
import { readFileSync } from "node:fs";
import { dirname, resolve } from "node:path";
import { QuietframeError } from "../errors";
import { parseSpectrumCsv } from "./spectrum-csv";

/**
 * The parsed description with each `spectrum.file` that has no points yet read in; other
 * fields untouched (a malformed list is left for validation to report). `setupPath`: the set-up
 * file, whose folder relative spectrum paths start from.
 */
export function readSpectrumFiles(description: unknown, setupPath: string): unknown {
  if (typeof description !== "object" || description === null) return description;
  const list = (description as Record<string, unknown>).classicalNoise;
  if (!Array.isArray(list)) return description;
  const folder = dirname(resolve(setupPath));
  const classicalNoise = list.map((term, i) => {
    const spectrum = typeof term === "object" && term !== null ? (term as Record<string, unknown>).spectrum : undefined;
    if (typeof spectrum !== "object" || spectrum === null) return term;
    const { file, points } = spectrum as Record<string, unknown>;
    if (typeof file !== "string" || points !== undefined) return term;
    let text: string;
    try {
      text = readFileSync(resolve(folder, file), "utf8");
    } catch (e) {
      const reason = (e as NodeJS.ErrnoException).code === "ENOENT" ? "does not exist" : "cannot be read";
      throw new QuietframeError({
        path: `classicalNoise[${i}].spectrum.file`,
        value: file,
        problem: `${reason} (looked in the set-up file's folder, ${folder})`,
        allowed: "a CSV file of frequency and ASD, its path relative to the set-up file",
      });
    }
    return { ...(term as Record<string, unknown>), spectrum: { ...(spectrum as Record<string, unknown>), ...parseSpectrumCsv(text, file) } };
  });
  return { ...(description as Record<string, unknown>), classicalNoise };
}
