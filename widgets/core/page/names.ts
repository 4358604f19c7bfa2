/**
 * Names shared by the HTML writer (Node) and the browser runtime: the classes that mark a
 * widget and its embedded state, and the event the runtime fires when it is installed.
 */
export const EXPLORER_CLASS = "quietframe-explorer";
export const STATE_SCRIPT_CLASS = "quietframe-state";
export const RUNTIME_READY_EVENT = "quietframe:runtime-ready";
/** Panel of the standalone page where a reader pastes or opens another state. */
export const LOADER_CLASS = "quietframe-loader";
/** Attributes the runtime keeps current on each widget element (read by tests and pages). */
export const FINGERPRINT_ATTRIBUTE = "data-quietframe-fingerprint";
export const STATUS_ATTRIBUTE = "data-quietframe-status";
