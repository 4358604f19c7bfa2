/** Mime bundles and their display from a tslab kernel (several media types in one output). */
import { inspect } from "node:util";
import { QuietframeError } from "../../../src/index";

/**
 * Sends Jupyter display_data from a tslab kernel. tslab's public `display.raw` sends one
 * media type per message; a widget needs several representations in ONE message (the front
 * end picks the richest it may show: live HTML when trusted, PNG otherwise). So we call the
 * running kernel's own writer, the function tslab's jupyter module keeps for the executing
 * cell. Outside a kernel nothing is sent and the bundle is returned for the caller to use.
 */

/** A Jupyter mime bundle: media type → text, JSON (for +json types) or bytes (sent base64). */
export type MimeBundle = Record<string, unknown>;

export interface DisplayOptions {
  /** Per-type metadata, e.g. { "image/png": { width: 560 } }. */
  metadata?: Record<string, unknown>;
  /** Lets a later call with `update: true` replace this output in place. */
  displayId?: string;
  /** Replace the output that has `displayId` (update_display_data) instead of adding one. */
  update?: boolean;
}

export interface DisplayResult {
  /** "kernel": one message with every type; "per-mime": one message per type; "none": no kernel. */
  readonly via: "kernel" | "per-mime" | "none";
  /** The bundle as sent (bytes base64-encoded), or as it would have been sent. */
  readonly bundle: Readonly<Record<string, unknown>>;
}

type KernelWriter = (content: { data: Record<string, unknown>; metadata: Record<string, unknown>; transient: Record<string, unknown> }, update: boolean) => void;

// How a media type must look; keeps typos from producing outputs no front end shows.
const MIME_TYPE = /^[A-Za-z0-9][\w.+-]*\/[A-Za-z0-9][\w.+-]*$/;
// nbformat stores only these types as JSON; every other type must be text.
const JSON_MIME = /^application\/(.*\+)?json$/;
// The kernel's module, wherever it was installed; library code may see another tslab copy.
const KERNEL_MODULE = /[\\/]tslab[\\/]dist[\\/]jupyter\.js$/;

/** Checks and encodes a bundle the way Jupyter stores it (bytes become base64 text). */
export function encodeBundle(bundle: MimeBundle): Record<string, unknown> {
  if (typeof bundle !== "object" || bundle === null || Array.isArray(bundle)) {
    throw new QuietframeError({ path: "bundle", value: bundle, problem: "must be an object of media type → data", allowed: '{"text/plain": "…", "image/png": bytes, …}' });
  }
  const out: Record<string, unknown> = {};
  const types = Object.keys(bundle);
  if (types.length === 0) throw new QuietframeError({ path: "bundle", problem: "is empty", allowed: "at least one media type (text/plain always works)" });
  for (const type of types) {
    const value = bundle[type];
    if (!MIME_TYPE.test(type)) throw new QuietframeError({ path: `bundle.${type}`, problem: "is not a media type", allowed: 'e.g. "text/html", "image/png"' });
    if (value instanceof Uint8Array) out[type] = Buffer.from(value.buffer, value.byteOffset, value.byteLength).toString("base64");
    else if (typeof value === "string") out[type] = value;
    else if (JSON_MIME.test(type) && typeof value === "object" && value !== null) out[type] = value;
    else {
      throw new QuietframeError({
        path: `bundle.${type}`,
        value: typeof value,
        problem: "cannot be stored in a notebook",
        allowed: "text, bytes (Uint8Array), or a JSON object for application/…+json types",
      });
    }
  }
  return out;
}

/** The running tslab kernel's display writer, if this process is a kernel executing a cell. */
export function kernelDisplayWriter(): KernelWriter | undefined {
  for (const [file, mod] of Object.entries(require.cache)) {
    if (!mod || !KERNEL_MODULE.test(file)) continue;
    const writer = (mod.exports as { lastWriteDisplayData?: unknown } | undefined)?.lastWriteDisplayData;
    // Only the copy the kernel runs has it set: it is assigned when a cell starts executing.
    if (typeof writer === "function") return writer as KernelWriter;
  }
  return undefined;
}

/** Displays a mime bundle in the running kernel; see DisplayResult for what happened. */
export function displayBundle(bundle: MimeBundle, options: DisplayOptions = {}): DisplayResult {
  const data = encodeBundle(bundle);
  const writer = kernelDisplayWriter();
  if (writer) {
    const transient: Record<string, unknown> = options.displayId ? { display_id: options.displayId } : {};
    writer({ data, metadata: options.metadata ?? {}, transient }, options.update === true);
    return result("kernel", data);
  }
  const raw = tslabRawDisplay();
  if (raw) {
    // Less good: each type becomes its own output, so the front end shows all of them.
    try {
      for (const type of Object.keys(data)) raw(type, data[type]);
      return result("per-mime", data);
    } catch {
      // tslab is installed but this process is not executing a cell.
    }
  }
  return result("none", data);
}

// tslab prints a cell's last value; a bundle can be megabytes, so print only what was sent.
function result(via: DisplayResult["via"], bundle: Record<string, unknown>): DisplayResult {
  const r: DisplayResult = { via, bundle };
  Object.defineProperty(r, inspect.custom, { value: () => `DisplayResult { via: ${via}, types: ${Object.keys(bundle).join(", ")} }`, enumerable: false });
  return r;
}

function tslabRawDisplay(): ((type: string, data: unknown) => void) | undefined {
  // tslab's executor sets this global; elsewhere, loading tslab (and its compiler) is wasted time.
  if (!("__tslab__" in globalThis)) return undefined;
  try {
    const tslab = require("tslab") as { display?: { raw?: (type: string, data: unknown) => void } };
    const display = tslab.display;
    return typeof display?.raw === "function" ? display.raw.bind(display) : undefined;
  } catch {
    return undefined;
  }
}

/** Displays Markdown (tables of figures, notes), with the same text as the plain fallback. */
export function displayMarkdown(markdown: string): void {
  displayBundle({ "text/markdown": markdown, "text/plain": markdown });
}
