import { QuietframeError } from "../errors";
import { loadTrajectoryState } from "../../widgets/trajectory/document";
import { trajectoryFigures } from "../../widgets/trajectory/figures";
import { trajectoryPage } from "../../widgets/trajectory/fragment";
import type { CliIo } from "./run";

/**
 * `render` for a trajectory widget's state: runs the simulation again from the state (seed,
 * step, duration, stored points, stop) and writes the page, the charts or every stored number.
 */
export async function renderTrajectory(
  text: string,
  input: string,
  format: "html" | "svg" | "png" | "csv",
  options: { strict: boolean; scale: number; source: string },
  io: CliIo,
): Promise<{ bytes: Uint8Array; fingerprint: string }> {
  const { state, computation, fingerprintMatches } = loadTrajectoryState(text, options.source);
  if (!fingerprintMatches) {
    const message =
      `the recomputed curves differ from the ones stored in ${input} ` +
      `(stored ${state.fingerprint}, written by quietframe ${state.quietframe}; recomputed ${computation.fingerprint})`;
    if (options.strict) throw new QuietframeError({ path: `${input}.fingerprint`, value: state.fingerprint, problem: message, allowed: "a state whose numbers this quietframe reproduces bit for bit (drop --strict to render anyway)" });
    io.err(`warning: ${message}\n`);
  }
  for (const c of computation.cautions) io.err(`caution: ${c}\n`);
  const encode = (s: string): Uint8Array => new TextEncoder().encode(s);
  const figures = await trajectoryFigures(computation, state, { scale: options.scale });
  const bytes =
    format === "csv" ? encode(figures.csv) : format === "svg" ? encode(figures.svg) : format === "png" ? figures.png : encode(trajectoryPage(state, computation, { svg: figures.svg, png: figures.png }));
  return { bytes, fingerprint: computation.fingerprint };
}
