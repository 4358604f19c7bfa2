/**
 * Checks shared by every kind's strict state reader: paths in errors, JSON-only copies,
 * single-model documents.
 */
import { QuietframeError, QuietframeErrors, QUIETFRAME_VERSION } from "../../../src/index";
import { WIDGET_MODULE, type JupyterWidgetStateDocument } from "./widget-state";

/**
 * Checks shared by the strict readers of quietframe state files: every failure names its path,
 * and copies are built with defined (never assigned) keys so nothing reaches a prototype.
 */

export const FINGERPRINT_PATTERN = /^sha256:[0-9a-f]{64}$/;

/**
 * The stored fingerprint of a state: a missing one is named as missing (a hand-written or
 * truncated state), a malformed one as malformed; `what` says what it fingerprints ("curve").
 */
export function expectFingerprint(v: unknown, path: string, what: string): string {
  if (v === undefined) {
    throw new QuietframeError({
      path,
      problem: `is missing: the state records no ${what} fingerprint, so nothing can show that its numbers are the ones it was saved with`,
      allowed: '"sha256:" followed by 64 lowercase hex digits, as quietframe writes it with every saved state (docs/fingerprint.md)',
    });
  }
  if (typeof v !== "string" || !FINGERPRINT_PATTERN.test(v)) {
    throw new QuietframeError({ path, value: v, problem: `is not a ${what} fingerprint`, allowed: '"sha256:" followed by 64 lowercase hex digits (docs/fingerprint.md)' });
  }
  return v;
}
export const VERSION_PATTERN = /^\d{1,9}\.\d{1,9}\.\d{1,9}(?:-[0-9A-Za-z.-]{1,64})?(?:\+[0-9A-Za-z.-]{1,64})?$/;
// Names that mean something to JavaScript objects; never valid in a set-up.
export const RESERVED_KEYS = new Set(["__proto__", "constructor", "prototype"]);
// Deeper nesting than any set-up needs; guards the recursive copy against hostile input.
export const MAX_SETUP_DEPTH = 32;

/** Deterministic model id: the same curves (fingerprint) always get the same id. */
export function modelIdOf(prefix: string, fingerprint: string): string {
  return `${prefix}${fingerprint.slice("sha256:".length, "sha256:".length + 16)}`;
}

/** A widget-state document (format 2.0) whose one model is `state`. */
export function singleModelDocument(id: string, modelName: string, state: object): JupyterWidgetStateDocument {
  return {
    version_major: 2,
    version_minor: 0,
    state: {
      [id]: {
        model_name: modelName,
        model_module: WIDGET_MODULE,
        model_module_version: QUIETFRAME_VERSION,
        state: state as unknown as Record<string, unknown>,
      },
    },
  };
}

/** Re-throws model errors (one or many) with their paths mapped by `where`. */
export function rebasedErrors<T>(where: (path: string) => string, fn: () => T): T {
  const rebase = (e: QuietframeError): QuietframeError => new QuietframeError({ path: where(e.path), value: e.value, problem: e.problem, allowed: e.allowed });
  try {
    return fn();
  } catch (e) {
    if (e instanceof QuietframeError) throw rebase(e);
    if (e instanceof QuietframeErrors) throw new QuietframeErrors(e.problems.map(rebase));
    throw e;
  }
}

/** A copy that holds only JSON data; keys are defined, never assigned, so none can reach a prototype. */
export function copyJson(value: unknown, path: string, depth: number): unknown {
  if (value === null || typeof value === "string" || typeof value === "boolean") return value;
  if (typeof value === "number") {
    if (Number.isFinite(value)) return value;
    throw new QuietframeError({ path, value, problem: "is not a finite number", allowed: "JSON numbers" });
  }
  if (depth >= MAX_SETUP_DEPTH) {
    throw new QuietframeError({ path, problem: `is nested more than ${MAX_SETUP_DEPTH} levels deep`, allowed: "a set-up as docs/setup-format.md describes it" });
  }
  if (Array.isArray(value)) return value.map((v, i) => copyJson(v, `${path}[${i}]`, depth + 1));
  if (isRecord(value)) {
    const out: Record<string, unknown> = {};
    for (const key of Object.keys(value)) {
      if (RESERVED_KEYS.has(key)) {
        throw new QuietframeError({ path: `${path}.${key}`, problem: "is a reserved name, not a field of a set-up", allowed: "the fields of docs/setup-format.md" });
      }
      define(out, key, copyJson(value[key], `${path}.${key}`, depth + 1));
    }
    return out;
  }
  throw new QuietframeError({ path, value: String(value), problem: "is not JSON data", allowed: "objects, arrays, strings, finite numbers, booleans, null" });
}

export function define(target: Record<string, unknown>, key: string, value: unknown): void {
  Object.defineProperty(target, key, { value, enumerable: true, writable: true, configurable: true });
}

export function isRecord(v: unknown): v is Record<string, unknown> {
  return typeof v === "object" && v !== null && !Array.isArray(v);
}

export function expectRecord(v: unknown, path: string, allowed: string): Record<string, unknown> {
  if (!isRecord(v)) throw new QuietframeError({ path, value: v, problem: v === undefined ? "is required" : "must be an object", allowed });
  return v;
}

export function expectArray(v: unknown, path: string, allowed: string): unknown[] {
  if (!Array.isArray(v)) throw new QuietframeError({ path, value: v, problem: v === undefined ? "is required" : "must be an array", allowed });
  return v;
}

export function rejectUnknownKeys(obj: Record<string, unknown>, known: readonly string[], path: string, what: string): void {
  for (const key of Object.keys(obj)) {
    if (!known.includes(key)) {
      throw new QuietframeError({ path: `${path}.${key}`, problem: `is not a field of ${what}`, allowed: known.join(", ") });
    }
  }
}
