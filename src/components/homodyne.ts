import { combine, unitPhasor } from "../network/linear-form";
import { num, type ComponentKind } from "./types";

interface HomodyneHandle {
  column: number;
}

/**
 * Balanced homodyne detection of the quadrature cosθ·q1 + sinθ·q2 with efficiency η:
 * y = √η (cosθ q1 + sinθ q2) + √(1−η) v, normalized so that vacuum gives a unit spectrum.
 */
export const homodyne: ComponentKind<HomodyneHandle> = {
  type: "homodyne",
  summary: "Homodyne detector (readout angle, quantum efficiency).",
  params: [
    {
      name: "angle",
      kind: "angle",
      doc: "Readout angle from the amplitude quadrature (0 = amplitude, 90 deg = phase).",
      default: "90 deg",
    },
    { name: "efficiency", kind: "fraction", doc: "Quantum efficiency η (0…1).", default: 1, min: 0, max: 1 },
  ],
  ports: [{ name: "in", kind: "optical-in", doc: "Light to detect." }],
  allocate: (b, c) => ({ column: b.addInputs(c.name, ["detection vacuum"], [1], "loss", `${c.name}: detection loss`) }),
  wire: ({ builder, component, handle, inputs }) => {
    const [cos, sin] = unitPhasor(num(component, "angle"));
    const eta = num(component, "efficiency");
    const field = inputs.in;
    const quadrature = combine(cos, field.amplitude, sin, field.phase);
    const y = combine(Math.sqrt(eta), quadrature, Math.sqrt(1 - eta), builder.input(handle.column));
    builder.addOutput({ owner: component.name, label: `${component.name} homodyne output` }, y);
    return {};
  },
};
