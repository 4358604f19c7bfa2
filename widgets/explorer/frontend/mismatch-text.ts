/** Front-end module "quietframe-live": the words shown when the kernel's chart comes from another quietframe version (no DOM, so tests read it in Node). */
import { LIVE_MODULE, LIVE_MODULE_VERSION } from "../live/names";

/** Class of the message's root element (tests and styles find it by this). */
export const VERSION_MISMATCH_CLASS = "quietframe-live-version-mismatch";

/** The words shown in place of the chart: both versions, and the one step that fixes it. */
export function versionMismatchText(kernelVersion: string, installedVersion: string = LIVE_MODULE_VERSION): string {
  return (
    `quietframe's chart cannot be drawn here: the kernel sends a chart of quietframe ${kernelVersion}, ` +
    `but this Jupyter has the front-end extension "${LIVE_MODULE}" of quietframe ${installedVersion}. ` +
    `Install the extension of the quietframe the kernel runs (npx quietframe extension install, in that project; ` +
    `see docs/kernel.md), then reload this page. The kernel, the controls and the saved state are not affected.`
  );
}
