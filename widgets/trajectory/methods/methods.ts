/**
 * The methods export of a trajectory widget (Markdown, LaTeX, BibTeX): the set-up at the
 * state's values and its model, and everything a reader needs to repeat the run bit for bit —
 * seed, step, duration, stored points, starting state, where a stopped run ended, the
 * random-number generator, the exact discretization and the filter.
 */
import { methodsDocument, type MethodsDocument, type MethodsOptions } from "../../core/methods/document";
import { reproduceSentence } from "../../core/methods/reproduce";
import { componentItems, conventionSentence, modelSentences, wiringSentences } from "../../core/methods/setup-model";
import type { Writer } from "../../core/methods/writers";
import type { TrajectoryState } from "../format";
import type { TrajectoryComputation } from "../model";

export function trajectoryMethods(state: TrajectoryState, computation: TrajectoryComputation, options: MethodsOptions = {}): MethodsDocument {
  const title = state.title ?? (computation.setup.name || "Simulated measurement run");
  return methodsDocument(
    `Methods: ${title}`,
    (w) => [
      w.paragraph(
        "Set-up",
        `Measurement runs were simulated with quietframe from the linear state-space model of the set-up${computation.setup.name ? ` ${w.quote(w.text(computation.setup.name))}` : ""}, which consists of:`,
      ),
      w.list(componentItems(w, computation.setup)),
      wiringSentences(w, computation.setup).join(" "),
      w.paragraph("Conventions", conventionSentence(w)),
      w.paragraph("Model", modelSentences(w, computation.setup).join(" ")),
      w.paragraph("Simulation", simulationSentence(w, computation)),
      w.paragraph("Filter", filterSentence(w, computation)),
      w.paragraph("Shown", shownSentence(w, state, computation)),
      w.paragraph(
        "Reproducibility",
        reproduceSentence(w, {
          stateFile: options.stateFile,
          writtenBy: state.quietframe,
          fingerprint: computation.fingerprint,
          hashes: "the stored times, the measurement records and every series of every followed variable",
        }),
      ),
    ],
    options,
  );
}

function simulationSentence(w: Writer, computation: TrajectoryComputation): string {
  const s = computation.result.settings;
  const r = computation.result;
  const start =
    s.initial === "ground" ? "every mode in its ground state (covariance I/2)" : "the unconditional stationary state (the solution of the Lyapunov equation), with conditioning starting at t = 0";
  const stop = r.stopped
    ? `The run was stopped by its user after ${r.stepsTaken} of ${r.stepsPlanned} planned steps, at t = ${w.qty(r.stepsTaken * s.step, "time")}; the state records this stop point and a replay ends there.`
    : `The run took all ${r.stepsPlanned} planned steps.`;
  return (
    `Step ${w.math("h", "h")} = ${w.qty(s.step, "time")}, duration ${w.qty(s.duration, "time")} (a whole number of steps), ${s.samples} stored time points (the records averaged over each stored interval), seed ${s.seed}; the run starts from ${start}. ${stop} ` +
    `The hidden state and the integrated homodyne records are advanced by the exact discretization of the joint linear stochastic differential equation (no Euler error at any step): ${w.math("z_{k+1} = Φ z_k + ξ_k", "z_{k+1} = \\Phi z_k + \\xi_k")}, ${w.math("Δy_k = Γ z_k + η_k", "\\Delta y_k = \\Gamma z_k + \\eta_k")} with ${w.math("Φ = e^{Ah}", "\\Phi = e^{Ah}")}, ${w.math("Γ = ∫₀ʰ C e^{As} ds", "\\Gamma = \\int_0^h C e^{As}\\,\\mathrm{d}s")} and the joint covariance of ${w.math("(ξ_k, η_k)", "(\\xi_k, \\eta_k)")} from one matrix exponential of a block matrix${w.cite("vanloan1978")}, ` +
    `computed for a step cut by powers of two and doubled back. Gaussian deviates come from the ${w.text("xoshiro128**")} generator${w.cite("blackman2021")} seeded through splitmix32 (32-bit integer arithmetic only) and the 128-layer ziggurat method${w.cite("marsaglia2000")}, with elementary functions evaluated in portable double arithmetic, so a seed gives the same bits on every platform.`
  );
}

function filterSentence(w: Writer, computation: TrajectoryComputation): string {
  const settled = computation.result.filterSettledAtStep;
  return (
    `The estimate is the exact conditional mean of the discretized model given the records (a discrete Kalman filter with correlated state and record noise: ${w.math("S = Γ P Γᵀ + Σ_yy", "S = \\Gamma P \\Gamma^{\\mathsf T} + \\Sigma_{yy}")}, ` +
    `${w.math("K = (Φ P Γᵀ + Σ_zy) S⁻¹", "K = (\\Phi P \\Gamma^{\\mathsf T} + \\Sigma_{zy}) S^{-1}")}, ${w.math("ẑ ← Φ ẑ + K(Δy − Γ ẑ)", "\\hat z \\leftarrow \\Phi\\hat z + K(\\Delta y - \\Gamma\\hat z)")}, ${w.math("P ← Φ P Φᵀ + Σ_zz − K S Kᵀ", "P \\leftarrow \\Phi P\\Phi^{\\mathsf T} + \\Sigma_{zz} - K S K^{\\mathsf T}")}), ` +
    `which becomes the Kalman–Bucy filter as the step goes to zero${w.cite("kalman1961")}; ${w.math("P", "P")} is the true error covariance of the estimate shown, so the band ${w.math("ẑ ± √P", "\\hat z \\pm \\sqrt{P}")} is exact at any step. ` +
    (settled === undefined
      ? "The filter's covariance was still settling when the run ended."
      : `From step ${settled} on, the covariance had reached its steady state (the doubling limit of the discrete Riccati map) and one gain was used.`)
  );
}

function shownSentence(w: Writer, state: TrajectoryState, computation: TrajectoryComputation): string {
  const joint = state.joint.map(
    (j) =>
      `${w.quote(w.text(j.label))} = ${j.terms.map((t) => `${w.qty(t.weight, "number")}·${w.math(`${t.quadrature === "x" ? "X" : "P"}`, t.quadrature === "x" ? "X" : "P")} of ${w.code(t.component)}`).join(" + ")}`,
  );
  const pair = state.pair
    ? ` The entanglement of ${w.code(state.pair[0])} and ${w.code(state.pair[1])} is followed by the Duan sum${w.cite("duan2000")} and the logarithmic negativity${w.cite("vidal2002")} of their conditional covariance (quadratures with vacuum variance 1/2).`
    : "";
  return `Followed variables (dimensionless quadratures, vacuum variance 1/2): ${joint.join("; ")}. For each, the figure shows the true value, the estimate with its one-standard-deviation band, and the conditional and unconditional variances.${pair} ${computation.result.records.length} measurement record(s) are stored.`;
}
