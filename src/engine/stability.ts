/**
 * The stability report of an assembled set-up: eigenmodes of A classified as growing,
 * undamped or decaying, each critical mode placed in the components it lives in, with a
 * plain-language summary and the error a growing mode raises. The bare numerical test
 * "does every mode decay" behind the Lyapunov solver is linalg/non-decaying-mode.ts.
 */
import { QuietframeError } from "../errors";
import { eigenvectorFor, realEigenvalues } from "../linalg";
import type { AssembledSetup } from "../setup/assemble";
import { hypot } from "../numeric/portable-math";

/** One eigenmode of the dynamics matrix A. */
export interface Eigenmode {
  /** Growth rate Re λ in 1/s (negative: decays). */
  readonly rate: number;
  /** Oscillation frequency |Im λ|/2π in Hz. */
  readonly frequency: number;
  /** Share of the mode in each component (sums to 1). */
  readonly participation: Readonly<Record<string, number>>;
}

export interface StabilityReport {
  /** Every mode decays: a stationary state exists. */
  readonly stable: boolean;
  /** Modes that grow: spectra of such a set-up mean nothing. */
  readonly growing: readonly Eigenmode[];
  /**
   * Modes that grow but live only in components whose declared control loop holds them (an
   * interferometer's arm-length servo): spectra referred to the signal are defined, a
   * stationary covariance without the loop is not.
   */
  readonly held: readonly Eigenmode[];
  /** Modes that neither grow nor decay (a free mass): spectra at f > 0 exist, a stationary covariance does not. */
  readonly undamped: readonly Eigenmode[];
  /** Plain-language summary. */
  readonly summary: string;
}

/** Relative size of Re λ that we can tell apart from zero after rounding. */
const RELATIVE_RESOLUTION = 1e-9;

/** Eigenvalues of A, classified, with the components each critical mode lives in. */
export function analyzeStability(assembled: AssembledSetup): StabilityReport {
  const { model } = assembled;
  const n = model.nStates;
  const { re, im } = realEigenvalues(model.A, n);
  let scale = 0;
  for (let i = 0; i < n; i++) scale = Math.max(scale, hypot(re[i], im[i]));
  const growing: Eigenmode[] = [];
  const held: Eigenmode[] = [];
  const undamped: Eigenmode[] = [];
  const controlled = heldComponents(assembled);
  for (let i = 0; i < n; i++) {
    if (im[i] < 0) continue; // report each complex pair once
    const resolution = RELATIVE_RESOLUTION * hypot(re[i], im[i]) + 1e-14 * scale;
    if (re[i] > resolution) {
      const mode = describeMode(assembled, re[i], im[i]);
      (controlled.size > 0 && mainOwners(mode).every((o) => controlled.has(o)) ? held : growing).push(mode);
    } else if (re[i] >= -resolution) undamped.push(new ModeDescribedWhenRead(assembled, re[i], im[i]));
  }
  if (growing.length === 0 && held.length === 0 && undamped.length > 0 && everyModeDissipates(assembled)) {
    // A high-Q mode (Q ≳ 1e9) or a slow one beside a fast cavity decays more slowly than the
    // eigenvalues resolve. When every mode has damping of its own, no exactly undamped normal
    // mode can form, so such a mode is weakly damped, not undamped: the stationary state exists.
    const slowest = undamped.reduce((a, b) => (b.frequency < a.frequency ? b : a));
    const summary = `stable: every mode decays (each has damping of its own; the slowest decay, near ${slowest.frequency.toPrecision(4)} Hz, ` + `is below what the eigenvalues resolve)`;
    return { stable: true, growing, held, undamped: [], summary };
  }
  const stable = growing.length === 0 && undamped.length === 0 && held.length === 0;
  return new Report(assembled, stable, growing, held, undamped);
}

/**
 * A stability report whose summary is written when read (an error, a warning shown): it names
 * where undamped modes live, which takes their eigenvectors, and a search that only grades
 * set-ups never reads it (classes here and below: see docs/performance.md on getters).
 */
class Report implements StabilityReport {
  // Private slots, not properties: a report's properties are its findings alone.
  readonly #assembled: AssembledSetup;
  #summary: string | undefined;

  constructor(
    assembled: AssembledSetup,
    readonly stable: boolean,
    readonly growing: readonly Eigenmode[],
    readonly held: readonly Eigenmode[],
    readonly undamped: readonly Eigenmode[],
  ) {
    this.#assembled = assembled;
  }

  get summary(): string {
    return (this.#summary ??= this.#written());
  }

  /** In JSON as a plain object would be: its findings and its summary. */
  toJSON(): StabilityReport {
    const { stable, growing, held, undamped, summary } = this;
    return { stable, growing, held, undamped, summary };
  }

  #written(): string {
    const { growing, held, undamped } = this;
    const assembled = this.#assembled;
    const text = summarize(assembled, growing, undamped);
    if (held.length === 0) return text;
    return growing.length === 0 && undamped.length === 0 ? heldSummary(assembled, held) : `${text}; ${heldSummary(assembled, held)}`;
  }
}

/** An undamped mode whose participation (an eigenvector by inverse iteration) is computed when first read. */
class ModeDescribedWhenRead implements Eigenmode {
  readonly frequency: number;
  readonly #assembled: AssembledSetup;
  readonly #imag: number;
  #participation: Readonly<Record<string, number>> | undefined;

  constructor(
    assembled: AssembledSetup,
    readonly rate: number,
    imag: number,
  ) {
    this.frequency = Math.abs(imag) / (2 * Math.PI);
    this.#assembled = assembled;
    this.#imag = imag;
  }

  get participation(): Readonly<Record<string, number>> {
    return (this.#participation ??= describeMode(this.#assembled, this.rate, this.#imag).participation);
  }

  /** In JSON as a plain object would be, participation included. */
  toJSON(): Eigenmode {
    const { rate, frequency, participation } = this;
    return { rate, frequency, participation };
  }
}

/** Names of the components whose declared control loop holds their growing modes. */
function heldComponents(assembled: AssembledSetup): Set<string> {
  const { components, kinds } = assembled.setup;
  return new Set(components.filter((c) => kinds.get(c.name)!.heldByControl?.(c) === true).map((c) => c.name));
}

function heldSummary(assembled: AssembledSetup, held: readonly Eigenmode[]): string {
  const modes = held.map(
    (m) =>
      `${describeGrowth(m)} in ${mainOwners(m)
        .map((o) => `'${o}'`)
        .join(", ")}`,
  );
  return (
    `controlled: growing modes held by the declared control loop: ${modes.join("; ")} (spectra referred to the signal do not depend on the loop; ` +
    `a stationary state needs it)${likelyCause(assembled, held)}`
  );
}

function describeGrowth(m: Eigenmode): string {
  const kind = m.frequency > 0 ? `a mode at ${m.frequency.toPrecision(4)} Hz` : "a non-oscillating mode";
  return `${kind} grows at ${m.rate.toPrecision(3)} /s (e-folding time ${(1 / m.rate).toPrecision(3)} s)`;
}

/**
 * Whether every mode's own 2×2 block of A is stable (trace < 0 and determinant > 0: it decays
 * even when uncoupled). A free mass fails the determinant even with friction: its position
 * does not return, so its zero eigenvalue is real, not a rounding artefact.
 */
function everyModeDissipates(assembled: AssembledSetup): boolean {
  const { model } = assembled;
  const n = model.nStates;
  if (model.modes.length * 2 !== n) return false;
  return model.modes.every((m) => {
    const xx = model.A[m.x * n + m.x];
    const pp = model.A[m.p * n + m.p];
    const xp = model.A[m.x * n + m.p];
    const px = model.A[m.p * n + m.x];
    return xx + pp < 0 && xx * pp - xp * px > 0;
  });
}

/**
 * A set-up with a growing mode. Its own class so that callers that grade set-ups (tolerance
 * cells: "unstable" rather than "invalid") can tell it apart; name and message are those of
 * any QuietframeError, so users see the same text everywhere.
 */
export class UnstableSetupError extends QuietframeError {
  readonly report: StabilityReport;
  constructor(report: StabilityReport) {
    super({ path: "setup", problem: report.summary, allowed: "a set-up whose modes all decay" });
    this.report = report;
  }
}

/** Throws an UnstableSetupError that says which mode grows, where it lives and why, if any does. */
export function requireNoGrowingModes(assembled: AssembledSetup, report: StabilityReport = analyzeStability(assembled)): StabilityReport {
  if (report.growing.length > 0) throw new UnstableSetupError(report);
  return report;
}

function describeMode(assembled: AssembledSetup, rate: number, imag: number): Eigenmode {
  const { model } = assembled;
  const v = eigenvectorFor(model.A, model.nStates, rate, imag);
  const weight: Record<string, number> = {};
  let total = 0;
  for (const mode of model.modes) {
    const w = v.re[mode.x] * v.re[mode.x] + v.im[mode.x] * v.im[mode.x] + v.re[mode.p] * v.re[mode.p] + v.im[mode.p] * v.im[mode.p];
    weight[mode.owner] = (weight[mode.owner] ?? 0) + w;
    total += w;
  }
  for (const k of Object.keys(weight)) weight[k] = total > 0 ? weight[k] / total : 0;
  return { rate, frequency: Math.abs(imag) / (2 * Math.PI), participation: weight };
}

function summarize(assembled: AssembledSetup, growing: readonly Eigenmode[], undamped: readonly Eigenmode[]): string {
  if (growing.length === 0 && undamped.length === 0) return "stable: every mode decays";
  if (growing.length === 0) {
    const owners = [...new Set(undamped.flatMap((m) => mainOwners(m)))];
    return `marginal: undamped motion in ${owners.map((o) => `'${o}'`).join(", ")} (e.g. a free mass); spectra above 0 Hz are defined, a stationary covariance is not`;
  }
  const parts = growing.map((m) => {
    const where = Object.entries(m.participation)
      .filter(([, w]) => w >= 0.05)
      .sort((a, b) => b[1] - a[1])
      .map(([o, w]) => `'${o}' ${(100 * w).toFixed(0)}%`)
      .join(", ");
    return `${describeGrowth(m)}, living in ${where}`;
  });
  return `unstable: ${parts.join("; ")}${likelyCause(assembled, growing)}`;
}

/** "; likely cause: …" from the instability hints of the components the modes live in (or probe). */
function likelyCause(assembled: AssembledSetup, modes: readonly Eigenmode[]): string {
  const involved = new Set(modes.flatMap((m) => mainOwners(m)));
  const hints = assembled.setup.components
    .filter((c) => involved.has(c.name) || assembled.setup.mechanical.some((l) => l.probe.component === c.name && involved.has(l.body)))
    .map((c) => assembled.setup.kinds.get(c.name)!.instabilityHint?.(c))
    .filter((h): h is string => h !== undefined);
  return hints.length ? `; likely cause: ${hints.join("; ")}` : "";
}

function mainOwners(m: Eigenmode): string[] {
  return Object.entries(m.participation)
    .filter(([, w]) => w >= 0.05)
    .map(([o]) => o);
}
