/**
 * The set-up's classical noise terms (a measured or modelled spectrum entering at a named
 * place: a force on a body, a displacement of a body, either of them on each test mass of an
 * interferometer, a strain on an interferometer, the intensity or frequency noise of the laser
 * that drives a cavity or a probe), checked and resolved into spectra in SI. Assembly turns each
 * into an input of its own, so each is a budget term of its own.
 */
import type { ComponentKind, ResolvedComponent } from "../components/types";
import { QuietframeError } from "../errors";
import { SPECTRUM_EXTENSIONS, type LogLogSpectrum, type SpectrumExtension } from "../numeric/log-log-spectrum";
import { COMPONENT_NAME_PATTERN } from "./schema";
import { AMPLITUDE_BASE_UNITS, amplitudeWords } from "./spectrum-units";
import { isLaserEntry, laserEntriesOf, laserEntryRefusal } from "./classical-laser";
import type { OpticalLink } from "./validate";
import { checkSpectrum, type SpectrumDescription } from "./spectrum-table";

/** A classical noise term as a set-up writes it. */
export interface ClassicalNoiseDescription {
  /** The term's name in budgets (a name as components have). */
  name: string;
  /** Where it enters: "force" or "displacement" on a body or on each test mass of an interferometer, "strain" on an interferometer, "laser intensity" or "laser frequency" on the cavity or probe the laser drives. */
  enters: string;
  /** The component it enters at. */
  on: string;
  spectrum: SpectrumDescription;
  /** Outside the spectrum's frequencies: "refuse" (default), "hold" the end values, or continue the end segments as "power-law"s. */
  beyondRange?: SpectrumExtension;
}

/** The rule for component names, which the terms' names share. */
const NAME = new RegExp(COMPONENT_NAME_PATTERN);

export const CLASSICAL_NOISE_KEYS = ["name", "enters", "on", "spectrum", "beyondRange"] as const;
export const SPECTRUM_KEYS = ["file", "frequencyUnit", "unit", "points", "lines"] as const;

export interface ResolvedClassicalNoise {
  readonly name: string;
  /** Path prefix for messages, e.g. `classicalNoise[0]`. */
  readonly path: string;
  readonly enters: string;
  readonly on: string;
  /** ASD in SI (base unit/√Hz) against frequency in Hz. */
  readonly spectrum: LogLogSpectrum;
  /** How the spectrum is named in messages: its file or its path in the set-up. */
  readonly origin: string;
  /** Where the first and last point are, for messages. */
  readonly firstPoint: string;
  readonly lastPoint: string;
}

/** The places a classical noise can enter a component of this kind. */
export function entriesOf(kind: ComponentKind<unknown>): string[] {
  const entries = (kind.signals ?? []).filter((s) => s in AMPLITUDE_BASE_UNITS);
  if (kind.body && !entries.includes("displacement")) entries.push("displacement");
  for (const own of Object.keys(kind.noiseEntries ?? {})) if (!entries.includes(own)) entries.push(own);
  return [...entries, ...laserEntriesOf(kind.type)];
}

/**
 * Checks the `classicalNoise` list against the resolved components; names must not repeat those
 * of components. `optical`: the connections, to name the coupler a light source drives.
 */
export function resolveClassicalNoise(
  input: unknown,
  components: readonly ResolvedComponent[],
  kinds: ReadonlyMap<string, ComponentKind<unknown>>,
  optical: readonly OpticalLink[] = [],
): ResolvedClassicalNoise[] {
  if (!Array.isArray(input)) throw new QuietframeError({ path: "classicalNoise", value: input, problem: "must be an array", allowed: "[ { name, enters, on, spectrum }, ... ]" });
  const names = new Set(components.map((c) => c.name));
  return input.map((entry, i) => {
    const path = `classicalNoise[${i}]`;
    const term = resolveTerm(entry, path, kinds, optical);
    if (names.has(term.name)) {
      throw new QuietframeError({
        path: `${path}.name`,
        value: term.name,
        problem: "is already the name of a component or another classical term",
        allowed: "a name of its own, so that its budget term can be told apart",
      });
    }
    names.add(term.name);
    return term;
  });
}

function resolveTerm(entry: unknown, path: string, kinds: ReadonlyMap<string, ComponentKind<unknown>>, optical: readonly OpticalLink[]): ResolvedClassicalNoise {
  const o = plainObject(entry, path, "{ name, enters, on, spectrum }");
  unknownKeys(o, path, CLASSICAL_NOISE_KEYS, "a classical noise term");
  const name = o.name;
  if (typeof name !== "string" || !NAME.test(name)) {
    throw new QuietframeError({ path: `${path}.name`, value: name, problem: "is not a valid name", allowed: "a letter or _, then letters, digits, _ or - (at most 64 characters)" });
  }
  const on = o.on;
  const kind = typeof on === "string" ? kinds.get(on) : undefined;
  if (typeof on !== "string" || kind === undefined) {
    throw new QuietframeError({ path: `${path}.on`, value: on, problem: "names no component of the set-up", allowed: "the name of a component", choices: [...kinds.keys()] });
  }
  const entries = entriesOf(kind);
  const enters = o.enters;
  if (typeof enters !== "string" || !entries.includes(enters)) {
    const refusal = isLaserEntry(enters) ? laserEntryRefusal(path, enters as string, on, kind, kinds, optical) : undefined;
    if (refusal) throw refusal;
    throw new QuietframeError({
      path: `${path}.enters`,
      value: enters,
      problem: entries.length
        ? `is not a place where noise enters '${on}'`
        : `'${on}' takes no classical noise (it is neither a body, an interferometer, nor a cavity or probe that carries a laser's drive)`,
      allowed: entries.length
        ? entries.map((e) => `"${e}"`).join(" or ")
        : "a component with a body (free mass, oscillator), an interferometer, or a cavity or position probe for the noise of the laser that drives it",
      choices: entries,
    });
  }
  const beyondRange = o.beyondRange ?? "refuse";
  if (typeof beyondRange !== "string" || !(SPECTRUM_EXTENSIONS as readonly string[]).includes(beyondRange)) {
    throw new QuietframeError({
      path: `${path}.beyondRange`,
      value: beyondRange,
      problem: "is not a way to read a spectrum beyond its ends",
      allowed: SPECTRUM_EXTENSIONS.map((e) => `"${e}"`).join(", "),
      choices: SPECTRUM_EXTENSIONS,
    });
  }
  const spectrumPath = `${path}.spectrum`;
  const description = plainObject(o.spectrum, spectrumPath, "{ unit, points } or { file }") as SpectrumDescription;
  unknownKeys(description as Record<string, unknown>, spectrumPath, SPECTRUM_KEYS, "a spectrum");
  if (description.points === undefined && description.file !== undefined) {
    throw new QuietframeError({
      path: `${spectrumPath}.file`,
      value: description.file,
      problem: "has not been read: spectrum files are read when a set-up file is loaded in Node (loadSetupFile, the quietframe command), never in a browser",
      allowed: "load the set-up from its file in Node, or give the spectrum inline as { unit, points }",
    });
  }
  const checked = checkSpectrum(description, spectrumPath, AMPLITUDE_BASE_UNITS[enters], beyondRange as SpectrumExtension, amplitudeWords(enters));
  const last = checked.spectrum.frequencies.length - 1;
  return { name, path, enters, on, spectrum: checked.spectrum, origin: checked.origin, firstPoint: checked.where(0), lastPoint: checked.where(last) };
}

function plainObject(v: unknown, path: string, allowed: string): Record<string, unknown> {
  if (typeof v !== "object" || v === null || Array.isArray(v)) throw new QuietframeError({ path, value: v, problem: "must be a JSON object", allowed });
  return v as Record<string, unknown>;
}

function unknownKeys(o: Record<string, unknown>, path: string, keys: readonly string[], what: string): void {
  for (const key of Object.keys(o)) {
    if (!keys.includes(key)) throw new QuietframeError({ path: `${path}.${key}`, problem: `is not a field of ${what}`, allowed: keys.join(", "), value: key, choices: keys });
  }
}
