/** The explorer's target line: a level relative to the SQL, checked where a state is made or read. */
import { QuietframeError } from "../../src/index";

/** ±100 dB spans twenty decades of power: wider than any ratio panel draws. */
export const TARGET_DB_LIMIT = 100;

/** The target level in dB (negative is below the SQL), or an error naming the field, the value and what is allowed. */
export function checkTargetDb(value: unknown, path: string): number {
  if (typeof value !== "number" || !Number.isFinite(value) || Math.abs(value) > TARGET_DB_LIMIT)
    throw new QuietframeError({
      path,
      value,
      problem: "is not a target level in dB relative to the SQL",
      allowed: `a number of dB from −${TARGET_DB_LIMIT} to ${TARGET_DB_LIMIT} (negative is below the SQL, e.g. −3)`,
    });
  return value;
}
