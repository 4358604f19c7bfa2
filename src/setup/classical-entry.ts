/**
 * Assembly of the classical noise terms: each claims one input column whose PSD is its
 * spectrum, and enters where a signal of the same kind would (a force on a body, a strain on
 * an interferometer), or where a component's own place of entry says (the force on or the
 * displacement of each test mass of an interferometer, interferometer.ts: the spectrum scaled to
 * the differential mode's). A displacement of a body enters as the force that would move the body
 * alone that much: F = x/χ₀, with χ₀ the body's own susceptibility (mass, resonance, the
 * damping of its baths; no optical spring), so the readout's dynamics act on it as on any force.
 * Laser noise enters the coupler that carries the drive (classical-laser.ts): intensity noise as
 * an input added to the light arriving at it, frequency noise into its dynamics.
 */
import type { ComponentKind, ResolvedComponent } from "../components/types";
import { QuietframeError } from "../errors";
import type { NetworkBuilder } from "../network/builder";
import { applyForceSignal, susceptibility } from "../physics/mechanics";
import type { MechanicalBody } from "../physics/mechanical-body";
import { formatQuantity } from "../units";
import type { ResolvedClassicalNoise } from "./classical-noise";
import { isLaserEntry, laserNoiseEntry } from "./classical-laser";

const LABELS: Readonly<Record<string, string>> = {
  force: "force on",
  displacement: "displacement of",
  strain: "strain on",
  "laser intensity": "laser intensity at",
  "laser frequency": "laser frequency at",
};

/** A term's column once claimed: how it enters once components are wired, and any noise it adds to light arriving at a component. */
export interface ClassicalEntry {
  readonly enter: () => void;
  readonly drive?: { readonly on: string; readonly port: string; readonly column: number };
}

/** Claims the term's column (allocation phase). `component`: the one it enters at. */
export function allocateClassicalNoise(builder: NetworkBuilder, term: ResolvedClassicalNoise, kind: ComponentKind<unknown>, component: ResolvedComponent, handle: () => unknown): ClassicalEntry {
  if (isLaserEntry(term.enters)) {
    const laser = laserNoiseEntry(term, component);
    const column = builder.addClassicalInput(term.name, label(term), laser.psdAt, (frequencies) => requireCovers(term, frequencies));
    return {
      enter: () => laser.enter?.(builder, column, handle()),
      ...(laser.drive ? { drive: { ...laser.drive, on: term.on, column } } : {}),
    };
  }
  const own = kind.noiseEntries?.[term.enters];
  if (own) {
    const scale = own.psdScale(handle());
    const column = builder.addClassicalInput(
      term.name,
      `${own.label} ${term.on} (classical)`,
      (f) => scale * term.spectrum.psdAt(f),
      (frequencies) => requireCovers(term, frequencies),
    );
    return { enter: () => builder.enterAsSignal(column, () => own.apply(builder, handle())) };
  }
  return { enter: allocateOnSignalPath(builder, term, kind, handle) };
}

function label(term: ResolvedClassicalNoise): string {
  return `${LABELS[term.enters]} ${term.on} (classical)`;
}

/** A force, displacement or strain: claims the column and returns a function that enters it where a signal of that kind would. */
function allocateOnSignalPath(builder: NetworkBuilder, term: ResolvedClassicalNoise, kind: ComponentKind<unknown>, handle: () => unknown): () => void {
  let body: MechanicalBody | undefined;
  const spectrumAt = (f: number): number => term.spectrum.psdAt(f);
  const psdAt =
    term.enters === "displacement"
      ? (f: number): number => {
          const [re, im] = susceptibility(body!, 2 * Math.PI * f);
          return spectrumAt(f) / (re * re + im * im);
        }
      : spectrumAt;
  const column = builder.addClassicalInput(term.name, label(term), psdAt, (frequencies) => requireCovers(term, frequencies));
  return () => {
    if (term.enters === "displacement") {
      body = kind.body!(handle());
      const target = body;
      builder.enterAsSignal(column, () => applyForceSignal(builder, target));
    } else {
      builder.enterAsSignal(column, () => kind.applySignal!(builder, handle(), term.enters));
    }
  };
}

/** Refuses frequencies outside a spectrum that is not extended, naming its file or table, its end point and the options. */
function requireCovers(term: ResolvedClassicalNoise, frequencies: Float64Array): void {
  const { spectrum } = term;
  let lowest = Infinity;
  let highest = -Infinity;
  for (let i = 0; i < frequencies.length; i++) {
    lowest = Math.min(lowest, frequencies[i]);
    highest = Math.max(highest, frequencies[i]);
  }
  const below = !spectrum.covers(lowest);
  if (!below && spectrum.covers(highest)) return;
  const hz = (f: number): string => formatQuantity(f, "frequency");
  throw new QuietframeError({
    path: below ? term.firstPoint : term.lastPoint,
    value: hz(below ? lowest : highest),
    problem:
      `the spectrum of classical noise '${term.name}' (${term.path}) covers ${hz(spectrum.lowest)} to ${hz(spectrum.highest)}, ` +
      `but the frequency grid reaches ${below ? "down" : "up"} to this frequency, ${below ? "below its first" : "above its last"} point`,
    allowed: `a grid within ${hz(spectrum.lowest)} … ${hz(spectrum.highest)}, or "beyondRange": "hold" (keep the end values) or "power-law" (continue the end segments' slopes) on ${term.path}`,
  });
}
