import { allocateBody, applyForceSignal, forceSignalReference, wireBody } from "../physics/mechanics";
import { num, type ComponentKind, type MechanicalBody } from "./types";

/** A free test mass: no restoring force, no damping unless a thermal bath is linked. */
export const freeMass: ComponentKind<MechanicalBody> = {
  type: "free-mass",
  summary: "Free test mass (susceptibility −1/(mΩ²)).",
  params: [{ name: "mass", kind: "mass", doc: 'Mass, e.g. "40 kg".', min: 0, minExclusive: true }],
  ports: [{ name: "body", kind: "mechanical-body", doc: "Where probes and baths act on the mass." }],
  allocate: (builder, c) => allocateBody(builder, c.name, num(c, "mass"), 1, 0),
  wire: ({ builder, handle }) => {
    wireBody(builder, handle);
    return {};
  },
  body: (h) => h,
  signals: ["force"],
  applySignal: (builder, h) => applyForceSignal(builder, h),
  signalReference: (h) => forceSignalReference(h),
};
