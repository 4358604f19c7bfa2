/**
 * Laser intensity and frequency noise as classical terms. Light sources carry no power in
 * this model (fluctuations only, vacuum PSD = 1), so laser noise is attached to the coupler
 * that carries the drive and knows its power and wavelength: a cavity (intensity and
 * frequency) or a position probe given its power (intensity). Here: which components take
 * which laser entry, the refusals in words for the others, and each term's column.
 */
import { HBAR } from "../constants";
import { cavityDrivePower, cavityPhotons, driveDetuningNoise, type CavityHandle } from "../components/cavity";
import type { ComponentKind, ResolvedComponent } from "../components/types";
import { QuietframeError } from "../errors";
import type { NetworkBuilder } from "../network/builder";
import { combine, type Field } from "../network/linear-form";
import { opticalAngularFrequency } from "../physics/optomechanics";
import type { ResolvedClassicalNoise } from "./classical-noise";

export const LASER_INTENSITY = "laser intensity";
export const LASER_FREQUENCY = "laser frequency";

/** The laser entries each coupler type takes. */
const COUPLER_ENTRIES: Readonly<Record<string, readonly string[]>> = {
  cavity: [LASER_INTENSITY, LASER_FREQUENCY],
  "position-probe": [LASER_INTENSITY],
};

export function isLaserEntry(entry: unknown): boolean {
  return entry === LASER_INTENSITY || entry === LASER_FREQUENCY;
}

/** The laser entries a component type takes (none for most). */
export function laserEntriesOf(type: string): readonly string[] {
  return COUPLER_ENTRIES[type] ?? [];
}

/** An optical connection, as validation resolves it. */
interface Link {
  readonly from: { readonly component: string; readonly port: string };
  readonly to: { readonly component: string; readonly port: string };
}

/**
 * The refusal, in words, of a laser entry on a component that cannot carry it (undefined
 * where the ordinary "not a place where noise enters" message says enough). Depends on
 * component types and connections only, never on parameter values.
 */
export function laserEntryRefusal(
  path: string,
  entry: string,
  on: string,
  kind: ComponentKind<unknown>,
  kinds: ReadonlyMap<string, ComponentKind<unknown>>,
  links: readonly Link[],
): QuietframeError | undefined {
  if (kind.type === "interferometer") {
    return new QuietframeError({
      path: `${path}.enters`,
      value: entry,
      problem:
        `cannot enter interferometer '${on}': its model carries the dark port's field only, and ${entry} noise of the bright port ` +
        "reaches the readout only through an imbalance of the arms, which is not modelled",
      allowed: '"strain" with a spectrum of the laser noise already projected to strain (measured or from a model of the imbalance)',
    });
  }
  if (kind.type === "position-probe" && entry === LASER_FREQUENCY) {
    return new QuietframeError({
      path: `${path}.enters`,
      value: entry,
      problem: `cannot enter position probe '${on}': it has no resonator that turns a change of laser frequency into a change of the readout (with a reference from the same laser it cancels, up to path differences that are not modelled)`,
      allowed: `"${LASER_INTENSITY}" on '${on}', or "${LASER_FREQUENCY}" on a cavity`,
    });
  }
  const isSource = kind.ports.some((p) => p.kind === "optical-out") && !kind.ports.some((p) => p.kind === "optical-in");
  if (!isSource) return undefined;
  const couplers = driveCouplersOf(on, entry, kinds, links);
  return new QuietframeError({
    path: `${path}.on`,
    value: on,
    problem:
      `'${on}' is a light source, which in this model emits fluctuations only and carries no power, so ${entry} noise cannot be attached to it: ` +
      `attach it to the component that carries the drive (its power and wavelength)${couplers.length ? `, here ${couplers.map((c) => `'${c}'`).join(" or ")}, which '${on}' drives` : ""}`,
    allowed: couplers.length ? couplers.map((c) => `"on": "${c}"`).join(" or ") : `a cavity${entry === LASER_INTENSITY ? " or a position probe given its power" : ""} that '${on}' drives`,
    ...(couplers.length ? { choices: couplers } : {}),
  });
}

/** The components downstream of `source` (through passive optics) that take `entry`. */
function driveCouplersOf(source: string, entry: string, kinds: ReadonlyMap<string, ComponentKind<unknown>>, links: readonly Link[]): string[] {
  const found: string[] = [];
  const seen = new Set([source]);
  const queue = [source];
  while (queue.length) {
    const from = queue.shift()!;
    for (const link of links) {
      const to = link.to.component;
      if (link.from.component !== from || seen.has(to)) continue;
      seen.add(to);
      if (laserEntriesOf(kinds.get(to)?.type ?? "").includes(entry)) found.push(to);
      else queue.push(to);
    }
  }
  return found;
}

/** A laser term's column, and where it enters once allocated. */
export interface LaserNoiseEntry {
  /** The column's PSD (its spectrum converted to what the column carries). */
  readonly psdAt: (frequency: number) => number;
  /** Intensity noise: added to the amplitude quadrature (in the drive laser's frame) of the light arriving at `port` of the coupler. */
  readonly drive?: { readonly port: string };
  /** Frequency noise: written into the coupler's dynamics once it is wired. */
  readonly enter?: (builder: NetworkBuilder, column: number, handle: unknown) => void;
}

/** Resolves a laser term against its coupler's parameter values (at assembly, so value sets are checked the same way). */
export function laserNoiseEntry(term: ResolvedClassicalNoise, coupler: ResolvedComponent): LaserNoiseEntry {
  const { spectrum } = term;
  if (term.enters === LASER_INTENSITY) {
    const power = coupler.type === "cavity" ? cavityDrivePower(coupler) : coupler.values.power;
    if (typeof power !== "number") throw missingDrive(term, coupler);
    // δP = √(2ħω_L P)·δa₁ for a carrier of power P, with δa₁ of one-sided PSD 1 (vacuum): shot noise
    // is the power PSD 2ħω_L P. A relative intensity noise S_RIN = S_δP/P² is therefore an added
    // independent amplitude-quadrature input of PSD P·S_RIN/(2ħω_L) in shot-noise units.
    const shotNoiseUnit = 2 * HBAR * opticalAngularFrequency(coupler.values.wavelength as number);
    // The port's light is in the drive laser's frame; a detuned cavity turns it into its mode's frame itself.
    return { psdAt: (f) => (power * spectrum.psdAt(f)) / shotNoiseUnit, drive: { port: "in" } };
  }
  // Laser frequency noise on a cavity. With the homodyne reference taken from the same laser, a
  // change δν of the laser frequency cannot be told from a change of the cavity length
  // δL = L·δν/ν = L·λ·δν/c: both change the detuning by 2π·δν.
  const photons = cavityPhotons(coupler);
  if (photons === undefined) throw missingDrive(term, coupler);
  return { psdAt: (f) => spectrum.psdAt(f), enter: (builder, column, handle) => driveDetuningNoise(builder, handle as CavityHandle, column, photons) };
}

function missingDrive(term: ResolvedClassicalNoise, coupler: ResolvedComponent): QuietframeError {
  const cavity = coupler.type === "cavity";
  return new QuietframeError({
    path: `${coupler.path}.power`,
    value: cavity ? undefined : coupler.raw.measurementRate,
    problem:
      `classical noise '${term.name}' (${term.path}) is ${term.enters} noise of the light '${coupler.name}' carries, which needs the carrier's power, ` +
      (cavity ? "but the cavity is given neither power nor photons" : "but the probe is given a measurement rate instead of its power"),
    allowed: cavity ? 'power (e.g. "10 mW") or photons (e.g. 1e8) on the cavity' : 'power (e.g. "1 mW") on the probe instead of measurementRate',
  });
}

/** The light arriving at a coupler's port with the intensity noise of its drive added to its amplitude quadrature (the same object when there is none). */
export function withDriveNoise(builder: NetworkBuilder, inputs: Record<string, Field>, drives: readonly { readonly port: string; readonly column: number }[]): Record<string, Field> {
  if (drives.length === 0) return inputs;
  const out = { ...inputs };
  for (const d of drives) {
    const field = out[d.port];
    if (!field) throw new Error(`internal: the drive port '${d.port}' carries no light`);
    out[d.port] = { amplitude: combine(1, field.amplitude, 1, builder.input(d.column)), phase: field.phase };
  }
  return out;
}
