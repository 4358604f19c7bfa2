/**
 * Writing a file so that no reader ever sees it half-written: the text goes to a temporary
 * file beside the target (a name no reader looks for), is flushed to the disk, and is renamed
 * over the target in one step. Two writers of the same target leave one whole file.
 * Node only.
 */
import { closeSync, fsyncSync, openSync, renameSync, rmSync, writeSync } from "node:fs";
import { basename, dirname, join } from "node:path";
import { randomBytes } from "node:crypto";
import { QuietframeError } from "../errors";

/** Temporary files of atomicWrite start with this; readers skip them. */
export const TEMPORARY_PREFIX = ".writing-";

/** Writes `text` to `target` atomically; a directory that cannot be written is a QuietframeError naming it. */
export function atomicWrite(target: string, text: string | Uint8Array): void {
  const temporary = join(dirname(target), `${TEMPORARY_PREFIX}${basename(target)}.${process.pid}.${randomBytes(4).toString("hex")}`);
  let fd: number | undefined;
  try {
    fd = openSync(temporary, "wx", 0o644);
    writeSync(fd, typeof text === "string" ? Buffer.from(text, "utf8") : text);
    fsyncSync(fd);
    closeSync(fd);
    fd = undefined;
    renameSync(temporary, target);
  } catch (e) {
    if (fd !== undefined) closeSync(fd);
    removeQuietly(temporary);
    throw unwritable(dirname(target), e);
  }
}

/** A file-system error while writing into `dir` as a QuietframeError naming the directory. */
export function unwritable(dir: string, e: unknown): unknown {
  const code = (e as NodeJS.ErrnoException | undefined)?.code;
  if (typeof code !== "string") return e;
  const reasons: Record<string, string> = {
    EACCES: "cannot be written (no permission)",
    EPERM: "cannot be written (not permitted)",
    EROFS: "is on a read-only file system",
    ENOENT: "does not exist",
    ENOTDIR: "is not a directory",
    ENOSPC: "has no space left",
    EDQUOT: "is over its disk quota",
  };
  return new QuietframeError({ path: dir, problem: reasons[code] ?? `cannot be written (${code})`, allowed: "a directory this user can write" });
}

/** Removes a leftover temporary file; where it could not be made there is nothing to remove. */
function removeQuietly(file: string): void {
  try {
    rmSync(file, { force: true });
  } catch {
    // ENOTDIR and the like: the file was never created.
  }
}
