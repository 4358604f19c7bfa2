import { combineFields, type Field } from "../network/linear-form";
import { num, type ComponentKind } from "./types";

/**
 * Passive optics act identically on both quadratures (real coefficients), so a
 * lossless network of them maps vacuum to vacuum: unit output spectra.
 */

/** out1 = t·in1 + r·in2, out2 = t·in2 − r·in1 with t = √T, r = √(1−T). */
export const beamSplitter: ComponentKind<null> = {
  type: "beam-splitter",
  summary: "Lossless beam splitter with power transmission T.",
  params: [{ name: "transmission", kind: "fraction", doc: "Power transmission T (0…1).", min: 0, max: 1 }],
  ports: [
    { name: "in1", kind: "optical-in", doc: "First input." },
    { name: "in2", kind: "optical-in", doc: "Second input." },
    { name: "out1", kind: "optical-out", doc: "Transmitted in1 plus reflected in2." },
    { name: "out2", kind: "optical-out", doc: "Transmitted in2 minus reflected in1." },
  ],
  allocate: () => null,
  wire: ({ component, inputs }) => {
    const T = num(component, "transmission");
    const t = Math.sqrt(T);
    const r = Math.sqrt(1 - T);
    return {
      out1: combineFields(t, inputs.in1, r, inputs.in2),
      out2: combineFields(t, inputs.in2, -r, inputs.in1),
    };
  },
};

interface LossHandle {
  column: number;
}

/** Power transmission η; the lost fraction is replaced by vacuum (a budget term of its own). */
export const loss: ComponentKind<LossHandle> = {
  type: "loss",
  summary: "Optical loss: power transmission η, vacuum enters in the lost fraction.",
  params: [{ name: "transmission", kind: "fraction", doc: "Power transmission η (0…1).", min: 0, max: 1 }],
  ports: [
    { name: "in", kind: "optical-in", doc: "Incoming light." },
    { name: "out", kind: "optical-out", doc: "Transmitted light." },
  ],
  allocate: (b, c) => ({
    column: b.addInputs(c.name, ["vacuum (amplitude)", "vacuum (phase)"], [1, 0, 0, 1], "loss", `${c.name}: loss vacuum`),
  }),
  wire: ({ builder, component, handle, inputs }) => {
    const eta = num(component, "transmission");
    const vac: Field = builder.inputField(handle.column);
    return { out: combineFields(Math.sqrt(eta), inputs.in, Math.sqrt(1 - eta), vac) };
  },
};

/** Absorbs light that nobody reads (an unused beam-splitter output). */
export const dump: ComponentKind<null> = {
  type: "dump",
  summary: "Beam dump: terminates light that is not detected.",
  params: [],
  ports: [{ name: "in", kind: "optical-in", doc: "Light to discard." }],
  allocate: () => null,
  wire: () => ({}),
};
