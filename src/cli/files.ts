/** Reading inputs and writing outputs of the CLI's file commands, with errors that name the path. */
import { randomBytes } from "node:crypto";
import { readFileSync, renameSync, rmSync, writeFileSync } from "node:fs";
import { QuietframeError } from "../errors";

export function readText(path: string): string {
  try {
    return readFileSync(path, "utf8");
  } catch (e) {
    throw new QuietframeError({ path, problem: `cannot be read (${(e as NodeJS.ErrnoException).code ?? "error"})`, allowed: "a readable file" });
  }
}

/** Writes through a temporary file beside the target, so a failure never leaves a partial output. */
export function writeAtomically(path: string, data: Uint8Array | string): void {
  const temporary = `${path}.${randomBytes(6).toString("hex")}.tmp`;
  try {
    writeFileSync(temporary, data);
    renameSync(temporary, path);
  } catch (e) {
    rmSync(temporary, { force: true });
    throw new QuietframeError({ path, problem: `cannot be written (${(e as NodeJS.ErrnoException).code ?? "error"})`, allowed: "a writable path" });
  }
}
