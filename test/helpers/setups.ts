import type { ComponentDescription, SetupDescription } from "../../src/setup/format";

/** Small set-up builders for tests; parameters are written as a user would write them. */

export function setup(components: ComponentDescription[], connections: [string, string][], extra: Partial<SetupDescription> = {}): SetupDescription {
  return {
    format: "quietframe.setup",
    version: 1,
    components,
    connections,
    readout: ["detector"],
    signal: { kind: "force", on: "body", referTo: "displacement" },
    ...extra,
  };
}

export interface ProbeOptions {
  body: ComponentDescription["params"] & object;
  bodyType?: "free-mass" | "oscillator";
  probe: Record<string, string | number>;
  efficiency?: number;
  angle?: string;
  light?: ComponentDescription;
  referTo?: "displacement" | "force";
}

/** A body read by a direct QND position probe and a homodyne detector. */
export function probedBody(o: ProbeOptions): SetupDescription {
  return setup(
    [
      o.light ?? { name: "light", type: "coherent" },
      { name: "body", type: o.bodyType ?? "free-mass", params: o.body },
      { name: "probe", type: "position-probe", params: o.probe },
      { name: "detector", type: "homodyne", params: { angle: o.angle ?? "90 deg", efficiency: o.efficiency ?? 1 } },
    ],
    [
      ["light.out", "probe.in"],
      ["probe.out", "detector.in"],
      ["probe.mechanics", "body.body"],
    ],
    { signal: { kind: "force", on: "body", referTo: o.referTo ?? "displacement" } },
  );
}

export interface CavityOptions {
  body: Record<string, string | number>;
  bodyType?: "free-mass" | "oscillator";
  cavity: Record<string, string | number>;
  efficiency?: number;
  angle?: string;
  referTo?: "displacement" | "force";
  light?: ComponentDescription;
}

/** A body coupled to a cavity mode driven by (fluctuations of) a laser, read in reflection. */
export function cavityReadout(o: CavityOptions): SetupDescription {
  return setup(
    [
      o.light ?? { name: "light", type: "coherent" },
      { name: "body", type: o.bodyType ?? "oscillator", params: o.body },
      { name: "cavity", type: "cavity", params: o.cavity },
      { name: "detector", type: "homodyne", params: { angle: o.angle ?? "90 deg", efficiency: o.efficiency ?? 1 } },
    ],
    [
      ["light.out", "cavity.in"],
      ["cavity.out", "detector.in"],
      ["cavity.mechanics", "body.body"],
    ],
    { signal: { kind: "force", on: "body", referTo: o.referTo ?? "displacement" } },
  );
}

/** Sum of the budget terms whose label contains any of the given fragments. */
export function sumTerms(terms: readonly { label: string; psd: Float64Array }[], ...fragments: string[]): Float64Array {
  const picked = terms.filter((t) => fragments.some((f) => t.label.includes(f)));
  if (picked.length === 0) throw new Error(`no budget term matches ${fragments.join(", ")}; have ${terms.map((t) => t.label).join(" | ")}`);
  const out = new Float64Array(picked[0].psd.length);
  for (const t of picked) for (let i = 0; i < out.length; i++) out[i] += t.psd[i];
  return out;
}
