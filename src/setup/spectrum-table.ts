/**
 * A noise spectrum as a set-up writes it (units, points, where they came from) checked point
 * by point and turned into a log-log interpolated spectrum in SI. Every refusal names the
 * point: its line in the file, or its index in the set-up's table.
 */
import { QuietframeError } from "../errors";
import { LogLogSpectrum, type SpectrumExtension } from "../numeric/log-log-spectrum";
import { asdUnitExamples, asdUnitScale, frequencyUnitScale } from "./spectrum-units";

/** A spectrum in a set-up: written inline, or read from a CSV file by the Node loader (which fills the points). */
export interface SpectrumDescription {
  /** The CSV file the points were read from (kept as provenance once read). */
  file?: string;
  /** Unit of the frequency column, e.g. "Hz" (default) or "kHz". */
  frequencyUnit?: string;
  /** Unit of the amplitude spectral density, e.g. "N/√Hz", "pm/√Hz", "1/√Hz". */
  unit?: string;
  /** [frequency, ASD] pairs in the two units, frequencies strictly increasing. */
  points?: [number, number][];
  /** Line of each point in the file, for messages (written by the Node loader). */
  lines?: number[];
}

/** A checked spectrum, with how to name its points in messages. */
export interface CheckedSpectrum {
  readonly spectrum: LogLogSpectrum;
  /** Where point i is, e.g. `"seismic.csv", line 7` or `classicalNoise[0].spectrum.points[3]`. */
  readonly where: (i: number) => string;
  /** The spectrum as a whole, e.g. `"seismic.csv"` or `classicalNoise[0].spectrum`. */
  readonly origin: string;
}

/** Where point i of a spectrum sits: its file line when it came from a file, else its table index. */
function pointLocator(description: SpectrumDescription, path: string): { where: (i: number) => string; origin: string } {
  const { file, lines } = description;
  if (file !== undefined && lines !== undefined) return { where: (i) => `${JSON.stringify(file)}, line ${lines[i]}`, origin: JSON.stringify(file) };
  return { where: (i) => `${path}.points[${i}]`, origin: path };
}

/**
 * Checks units and points and builds the spectrum in SI (Hz, base unit/√Hz). `base`: the
 * amplitude's SI unit at the place the noise enters ("N", "m", "1", "Hz"); `amplitude`: that
 * amplitude in words for messages ("N", "strain", "relative intensity noise (δP/P)").
 */
export function checkSpectrum(description: SpectrumDescription, path: string, base: string, extension: SpectrumExtension, amplitude = base === "1" ? "strain" : base): CheckedSpectrum {
  checkFieldTypes(description, path);
  const { where, origin } = pointLocator(description, path);
  const unitPath = description.file !== undefined && description.lines !== undefined ? `${origin}, header` : path;
  const fUnit = description.frequencyUnit ?? "Hz";
  const fScale = frequencyUnitScale(fUnit);
  if (fScale === undefined) {
    throw new QuietframeError({
      path: `${unitPath}${unitPath === path ? ".frequencyUnit" : ""}`,
      value: fUnit,
      problem: "is not a frequency unit",
      allowed: '"Hz" with an SI prefix ("mHz", "kHz", "MHz")',
    });
  }
  if (description.unit === undefined) {
    throw new QuietframeError({ path: `${unitPath}${unitPath === path ? ".unit" : ""}`, problem: "gives no unit for the amplitude spectral density", allowed: asdUnitExamples(base) });
  }
  const aScale = asdUnitScale(description.unit, base);
  if (aScale === undefined) {
    throw new QuietframeError({
      path: `${unitPath}${unitPath === path ? ".unit" : ""}`,
      value: description.unit,
      problem: `is not an amplitude spectral density in ${amplitude} per root hertz, which is what this place of entry takes`,
      allowed: asdUnitExamples(base),
    });
  }
  const points = description.points;
  if (!Array.isArray(points) || points.length < 2) {
    throw new QuietframeError({
      path: `${origin}${origin === path ? ".points" : ""}`,
      value: points,
      problem: "needs at least two (frequency, ASD) points",
      allowed: "[[frequency, ASD], ...] with two or more points",
    });
  }
  const fs = new Float64Array(points.length);
  const as = new Float64Array(points.length);
  points.forEach((point, i) => {
    if (!Array.isArray(point) || point.length !== 2 || typeof point[0] !== "number" || typeof point[1] !== "number") {
      throw new QuietframeError({ path: where(i), value: point, problem: "is not a pair of numbers", allowed: "[frequency, ASD], two numbers" });
    }
    const [f, a] = point;
    if (!Number.isFinite(f) || f <= 0) {
      throw new QuietframeError({
        path: where(i),
        value: f,
        problem: "has a frequency that is not a finite positive number",
        allowed: `a frequency > 0 in ${fUnit} (log-log interpolation needs positive frequencies)`,
      });
    }
    if (!Number.isFinite(a) || a <= 0) {
      throw new QuietframeError({
        path: where(i),
        value: a,
        problem: a === 0 ? "has an ASD of zero, which log-log interpolation cannot pass through" : "has an ASD that is negative or not a finite number",
        allowed: `a finite ASD > 0 in ${description.unit} (leave a band out instead of writing zero there)`,
      });
    }
    fs[i] = f * fScale;
    as[i] = a * aScale;
    if (i > 0 && !(fs[i] > fs[i - 1])) {
      throw new QuietframeError({
        path: where(i),
        value: f,
        problem: `has a frequency not above the one before it (${points[i - 1][0]} ${fUnit})`,
        allowed: "frequencies strictly increasing from one point to the next",
      });
    }
  });
  return { spectrum: new LogLogSpectrum(fs, as, extension), where, origin };
}

/** The text fields are text, and `lines` (written by the Node loader) is one positive line number per point. */
function checkFieldTypes(description: SpectrumDescription, path: string): void {
  for (const key of ["file", "frequencyUnit", "unit"] as const) {
    const v = description[key];
    if (v !== undefined && typeof v !== "string") throw new QuietframeError({ path: `${path}.${key}`, value: v, problem: "must be text", allowed: "a string" });
  }
  const { lines, points } = description;
  if (lines === undefined) return;
  const fits = Array.isArray(lines) && Array.isArray(points) && lines.length === points.length && lines.every((n) => Number.isInteger(n) && n > 0);
  if (!fits) {
    throw new QuietframeError({ path: `${path}.lines`, value: lines, problem: "is not one line number per point", allowed: "leave it out (the loader writes it when it reads a file)" });
  }
}
