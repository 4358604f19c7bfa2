/** Names shared by the explorer's HTML writer (Node) and its browser view. */
export const EXPLORER_CLASS = "quietframe-explorer";
export const STATE_SCRIPT_CLASS = "quietframe-state";
/** Panel of the standalone page where a reader pastes or opens another state. */
export { LOADER_CLASS } from "../core/page/names";
