import { QuietframeError, QuietframeErrors } from "../../src/errors";

/**
 * Set-ups for the input tests, kept here rather than read from examples/ so that editing an
 * example cannot silently change what a bad-input test exercises.
 */

/** A 1 kg free mirror read by reflected light and a homodyne detector on the phase quadrature. */
export function freeMassSetup(): any {
  return {
    format: "quietframe.setup",
    version: 1,
    name: "free mirror",
    components: [
      { name: "laser", type: "coherent" },
      { name: "mirror", type: "free-mass", params: { mass: "1 kg" } },
      { name: "probe", type: "position-probe", params: { power: "2 W", wavelength: "1064 nm" } },
      { name: "detector", type: "homodyne", params: { angle: "90 deg", efficiency: 0.95 } },
    ],
    connections: [
      ["laser.out", "probe.in"],
      ["probe.out", "detector.in"],
      ["probe.mechanics", "mirror.body"],
    ],
    readout: ["detector"],
    signal: { kind: "force", on: "mirror", referTo: "displacement" },
    grid: { from: "1 Hz", to: "10 kHz", points: 50 },
  };
}

/** An oscillator in a cavity read on resonance. */
export function cavitySetup(): any {
  return {
    format: "quietframe.setup",
    version: 1,
    name: "membrane in a cavity",
    components: [
      { name: "laser", type: "coherent" },
      { name: "membrane", type: "oscillator", params: { mass: "5 ng", frequency: "1.2 MHz", Q: 1e8, temperature: "6 K" } },
      { name: "cavity", type: "cavity", params: { linewidth: "8 MHz", inputCoupling: 0.9, g0: "150 Hz", photons: 2e8 } },
      { name: "detector", type: "homodyne", params: { angle: "90 deg", efficiency: 0.9 } },
    ],
    connections: [
      ["laser.out", "cavity.in"],
      ["cavity.out", "detector.in"],
      ["cavity.mechanics", "membrane.body"],
    ],
    readout: ["detector"],
    signal: { kind: "force", on: "membrane", referTo: "displacement" },
    grid: { from: "1.1 MHz", to: "1.3 MHz", points: 50 },
  };
}

export function component(setup: any, name: string): any {
  const c = setup.components.find((x: any) => x.name === name);
  if (!c) throw new Error(`fixture has no component '${name}'`);
  return c;
}

/** A copy of `base()` changed by `edit`, as JSON text (the form users hand in). */
export function edited(base: () => any, edit: (s: any) => void): string {
  const s = base();
  edit(s);
  return JSON.stringify(s, null, 2);
}

/** The error `fn` throws; fails the test if it returns normally. */
export function thrownBy(fn: () => unknown): unknown {
  try {
    fn();
  } catch (e) {
    return e;
  }
  throw new Error("expected an error, but none was thrown");
}

/** The single user-facing problem `fn` reports; anything else (a crash, several problems) fails. */
export function singleProblem(fn: () => unknown): QuietframeError {
  const e = thrownBy(fn);
  if (e instanceof QuietframeError) return e;
  if (e instanceof QuietframeErrors) throw new Error(`expected one problem, got ${e.problems.length}:\n${e.message}`);
  throw new Error(`expected a QuietframeError, got ${String(e)}`);
}

/**
 * One bad set-up per product requirement, with what the message must contain. `stage` says
 * whether validation (load) or evaluation (the detector's view of the signal) rejects it.
 */
export interface BadCase {
  readonly label: string;
  readonly text: string;
  readonly stage: "load" | "evaluate";
  /** Field path the error names. */
  readonly path: string;
  /** Exact substrings of the message: component, field, value as written, allowed range. */
  readonly contains: readonly string[];
}

export const BAD_CASES: readonly BadCase[] = [
  {
    label: "efficiency above 1",
    text: edited(freeMassSetup, (s) => (component(s, "detector").params.efficiency = 1.2)),
    stage: "load",
    path: "components.detector.efficiency",
    contains: ["components.detector.efficiency = 1.2", "between 0 and 1"],
  },
  {
    label: "efficiency below 0 (as a percentage)",
    text: edited(freeMassSetup, (s) => (component(s, "detector").params.efficiency = "-5 %")),
    stage: "load",
    path: "components.detector.efficiency",
    contains: ['components.detector.efficiency = "-5 %"', "between 0 and 1"],
  },
  {
    label: "zero mass",
    text: edited(freeMassSetup, (s) => (component(s, "mirror").params.mass = "0 kg")),
    stage: "load",
    path: "components.mirror.mass",
    contains: ['components.mirror.mass = "0 kg"', "is out of range", "allowed: 0 kg < mass"],
  },
  {
    label: "negative mass",
    text: edited(cavitySetup, (s) => (component(s, "membrane").params.mass = "-5 ng")),
    stage: "load",
    path: "components.membrane.mass",
    contains: ['components.membrane.mass = "-5 ng"', "allowed: 0 kg < mass"],
  },
  {
    label: "zero Q",
    text: edited(cavitySetup, (s) => (component(s, "membrane").params.Q = 0)),
    stage: "load",
    path: "components.membrane.Q",
    contains: ["components.membrane.Q = 0", "allowed: 0 < Q"],
  },
  {
    label: "negative Q",
    text: edited(cavitySetup, (s) => (component(s, "membrane").params.Q = "-1e6")),
    stage: "load",
    path: "components.membrane.Q",
    contains: ['components.membrane.Q = "-1e6"', "allowed: 0 < Q"],
  },
  {
    label: "zero linewidth",
    text: edited(cavitySetup, (s) => (component(s, "cavity").params.linewidth = "0 MHz")),
    stage: "load",
    path: "components.cavity.linewidth",
    contains: ['components.cavity.linewidth = "0 MHz"', "allowed: 0 Hz < linewidth"],
  },
  {
    label: "temperature below 0 K",
    text: edited(cavitySetup, (s) => (component(s, "membrane").params.temperature = "-20 mK")),
    stage: "load",
    path: "components.membrane.temperature",
    contains: ['components.membrane.temperature = "-20 mK"', "allowed: 0 K ≤ temperature"],
  },
  {
    label: "frequency unit for a mass",
    text: edited(freeMassSetup, (s) => (component(s, "mirror").params.mass = "40 Hz")),
    stage: "load",
    path: "components.mirror.mass",
    contains: ['components.mirror.mass = "40 Hz"', 'unit "Hz" is a frequency, but this field is a mass', 'a mass such as "40 kg"'],
  },
  {
    label: "unknown component type",
    text: edited(freeMassSetup, (s) => (component(s, "mirror").type = "black-hole")),
    stage: "load",
    path: "components.mirror.type",
    contains: ['components.mirror.type = "black-hole"', "is not a known component type", "allowed: free-mass, oscillator"],
  },
  {
    label: "unknown port",
    text: edited(freeMassSetup, (s) => (s.connections[0] = ["laser.out", "probe.input"])),
    stage: "load",
    path: "connections[0][1]",
    contains: ['connections[0][1] = "probe.input"', "'probe' (position-probe) has no port 'input'", "allowed: probe.in, probe.out, probe.mechanics"],
  },
  {
    label: "input port connected twice",
    text: edited(freeMassSetup, (s) => {
      s.components.push({ name: "spare", type: "vacuum" });
      s.connections.push(["spare.out", "probe.in"]);
    }),
    stage: "load",
    path: "connections[3][1]",
    contains: ['connections[3][1] = "probe.in"', "port is already connected in connections[0]", "each port connected once"],
  },
  {
    label: "dangling output port",
    text: edited(freeMassSetup, (s) => {
      s.components.push({ name: "splitter", type: "beam-splitter", params: { transmission: 0.5 } }, { name: "spare", type: "vacuum" });
      s.connections[1] = ["probe.out", "splitter.in1"];
      s.connections.push(["spare.out", "splitter.in2"], ["splitter.out1", "detector.in"]);
    }),
    stage: "load",
    path: "connections",
    contains: ['connections = "splitter.out2"', "port is left unconnected", "connect it to a detector, another component or a dump"],
  },
  {
    label: "non-positive grid bound",
    text: edited(freeMassSetup, (s) => (s.grid.from = "0 Hz")),
    stage: "load",
    path: "grid.from",
    contains: ['grid.from = "0 Hz"', "must be a positive frequency", "allowed: from > 0 Hz"],
  },
  {
    label: "reversed grid",
    text: edited(freeMassSetup, (s) => Object.assign(s.grid, { from: "10 kHz", to: "1 Hz" })),
    stage: "load",
    path: "grid.to",
    contains: ['grid.to = "1 Hz"', "must be above from (10000 Hz)", "allowed: to > from"],
  },
  {
    label: "homodyne on the amplitude quadrature of a position probe",
    text: edited(freeMassSetup, (s) => (component(s, "detector").params.angle = "0 deg")),
    stage: "evaluate",
    path: "readout",
    contains: ['readout = ["detector"]', "the detector sees no signal", "the force on 'mirror' does not reach it"],
  },
  {
    // Same quadrature as 0 deg with the sign flipped; cos/sin of π are not exactly −1/0 in floating point.
    label: "homodyne at 180 deg, the amplitude quadrature again",
    text: edited(freeMassSetup, (s) => (component(s, "detector").params.angle = "180 deg")),
    stage: "evaluate",
    path: "readout",
    contains: ['readout = ["detector"]', "the detector sees no signal", "the force on 'mirror' does not reach it"],
  },
  {
    label: "detector whose light never touched the body",
    text: edited(freeMassSetup, (s) => {
      s.components.push({ name: "dark", type: "vacuum" }, { name: "bystander", type: "homodyne" });
      s.connections.push(["dark.out", "bystander.in"]);
      s.readout = ["bystander"];
    }),
    stage: "evaluate",
    path: "readout",
    contains: ['readout = ["bystander"]', "the detector sees no signal", "the force on 'mirror' does not reach it"],
  },
  {
    label: "newer format version",
    text: edited(freeMassSetup, (s) => (s.version = 2)),
    stage: "load",
    path: "version",
    contains: ["version = 2", "was written by a newer quietframe than this one", "versions up to 1"],
  },
  {
    label: "markup in a component name",
    text: edited(freeMassSetup, (s) => (component(s, "mirror").name = "<b>mirror</b>")),
    stage: "load",
    path: "components[1].name",
    contains: ['components[1].name = "<b>mirror</b>"', "is not a valid component name"],
  },
  {
    label: "__proto__ at top level",
    text: edited(freeMassSetup, () => undefined).replace(/^\{/, '{\n  "__proto__": { "polluted": "yes" },'),
    stage: "load",
    path: "__proto__",
    contains: ["__proto__: is not a field of a set-up"],
  },
  {
    label: "__proto__ in params",
    text: edited(freeMassSetup, () => undefined).replace('"mass": "1 kg"', '"mass": "1 kg", "__proto__": { "polluted": "yes" }'),
    stage: "load",
    path: "components.mirror.__proto__",
    contains: ["components.mirror.__proto__", "'free-mass' has no parameter '__proto__'", "allowed: mass"],
  },
];

/** Malformed JSON with the 1-based line and column of the offending character, counted by hand. */
export interface MalformedCase {
  readonly label: string;
  readonly text: string;
  readonly line: number;
  readonly column: number;
}

export const MALFORMED_CASES: readonly MalformedCase[] = [
  {
    label: "missing comma between fields",
    text: '{\n  "format": "quietframe.setup",\n  "version": 1\n  "components": []\n}\n',
    line: 4,
    column: 3,
  },
  {
    label: "trailing comma in an object",
    text: '{\n  "format": "quietframe.setup",\n  "signal": { "kind": "force", }\n}\n',
    line: 3,
    column: 32,
  },
  {
    label: "trailing comma in an array",
    text: '{\n  "format": "quietframe.setup",\n  "readout": ["detector",]\n}\n',
    line: 3,
    column: 26,
  },
  {
    label: "document cut short",
    text: '{\n  "format": "quietframe.setup",\n  "version": 1',
    line: 3,
    column: 15,
  },
];
