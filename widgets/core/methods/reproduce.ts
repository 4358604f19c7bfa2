/**
 * The closing sentence of every methods text: the exact command that reproduces the figure
 * from the saved state, and the fingerprint it checks.
 */
import { QUIETFRAME_VERSION } from "../../../src/index";
import type { Writer } from "./writers";

export interface ReproduceFacts {
  /** File name of the saved state (default "state.json"). */
  readonly stateFile?: string;
  /** quietframe version that wrote the state. */
  readonly writtenBy: string;
  /** "sha256:<hex>"; null where the state records no fingerprint. */
  readonly fingerprint: string | null;
  /** Whether rendering recomputes the numbers from the state's parameters (false: the state carries them). */
  readonly recomputed?: boolean;
  /** What the fingerprint hashes, in words. */
  readonly hashes?: string;
}

/** The render command a reader runs: --strict fails unless the recomputed numbers match the fingerprint. */
export function reproduceCommand(stateFile = "state.json", strict = true): string {
  const quoted = /^[A-Za-z0-9._/-]+$/.test(stateFile) ? stateFile : `'${stateFile.replace(/'/g, "'\\''")}'`;
  const stem = stateFile.replace(/\.[A-Za-z]+$/, "").replace(/^.*\//, "") || "figure";
  const out = /^[A-Za-z0-9._-]+$/.test(stem) ? `${stem}.svg` : "figure.svg";
  return `quietframe render ${quoted} -o ${out}${strict ? " --strict" : ""}`;
}

export function reproduceSentence(w: Writer, facts: ReproduceFacts): string {
  const writtenBy = facts.writtenBy === QUIETFRAME_VERSION ? "" : ` The state was written by quietframe ${w.text(facts.writtenBy)}; this text by ${w.text(QUIETFRAME_VERSION)}.`;
  if (facts.fingerprint === null) {
    const how = facts.recomputed ? "recomputes the figure from the parameters in the accompanying widget-state file" : "draws the figure from the numbers stored in the accompanying widget-state file";
    return `quietframe ${w.text(QUIETFRAME_VERSION)} ${how}: ${w.code(reproduceCommand(facts.stateFile, false))}.${writtenBy}`;
  }
  return (
    `The accompanying widget-state file reproduces the figure with quietframe ${w.text(QUIETFRAME_VERSION)}: ${w.code(reproduceCommand(facts.stateFile))}, which recomputes every number and fails unless ` +
    `the result matches the fingerprint ${w.code(facts.fingerprint)} (SHA-256 over the exact IEEE-754 doubles, little-endian, of ${w.text(facts.hashes ?? "every computed series")}, each preceded by its label).${writtenBy}`
  );
}
