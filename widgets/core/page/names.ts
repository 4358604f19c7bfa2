/**
 * Names every widget kind shares between its HTML writer (Node) and the browser runtime: the
 * event the runtime fires when it is installed and the attributes it keeps on each widget root.
 */
export const RUNTIME_READY_EVENT = "quietframe:runtime-ready";
/** On the root element of every kind's fragment; the bootstrap finds widgets of any kind by it. */
export const VERSION_ATTRIBUTE = "data-quietframe-version";
/** Attributes the runtime keeps current on each widget element (read by tests and pages). */
export const FINGERPRINT_ATTRIBUTE = "data-quietframe-fingerprint";
export const STATUS_ATTRIBUTE = "data-quietframe-status";
/** The standalone page's panel that opens another saved state (core/browser/state-loader.ts). */
export const LOADER_CLASS = "quietframe-loader";
