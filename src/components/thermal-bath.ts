import { addViscousBath, THERMAL_TERM_NAME } from "../physics/mechanics";
import { cryogenicCautions } from "../safety/cautions";
import { num, type ComponentKind, type ThermalBathInfo } from "./types";

interface BathHandle {
  column: number;
}

/** An extra viscous bath on a body (gas damping, a warm clamp): damping plus thermal force. */
export const thermalBath: ComponentKind<BathHandle> = {
  type: "thermal-bath",
  summary: "Extra viscous damping with its thermal force, linked to a mass or oscillator.",
  params: [
    { name: "temperature", kind: "temperature", doc: 'Bath temperature, e.g. "300 K".', min: 0 },
    {
      name: "dampingRate",
      kind: "frequency",
      doc: "Viscous damping rate γ/2π in Hz (for an oscillator, f_m/Q of this bath alone).",
      min: 0,
      minExclusive: true,
    },
  ],
  ports: [{ name: "mechanics", kind: "mechanical-probe", doc: "The body this bath acts on." }],
  allocate: (builder, c) => ({
    column: builder.addInputs(c.name, ["thermal force"], [1], "thermal", `${c.name}: thermal force`, false, `${c.name}: ${THERMAL_TERM_NAME}`),
  }),
  wire: ({ builder, component, handle, bodies }) => {
    const body = bodies.mechanics;
    if (!body) throw new Error(`internal: ${component.path}.mechanics is unlinked`);
    const bath: ThermalBathInfo = {
      owner: component.name,
      kind: "viscous",
      gamma: 2 * Math.PI * num(component, "dampingRate"),
      temperature: num(component, "temperature"),
    };
    body.baths.push(bath);
    addViscousBath(builder, body, bath, handle.column);
    return {};
  },
  cautions: (c) => cryogenicCautions(c.name, num(c, "temperature")),
};
