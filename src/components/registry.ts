import { beamSplitter, dump, loss } from "./passive-optics";
import { cavity } from "./cavity";
import { filterCavity } from "./filter-cavity";
import { coherent, squeezed, vacuum } from "./light-sources";
import { entangledSource } from "./entangled-source";
import { freeMass } from "./free-mass";
import { homodyne } from "./homodyne";
import { interferometer } from "./interferometer";
import { oscillator } from "./oscillator";
import { positionProbe } from "./position-probe";
import { spinEnsemble } from "./spin-ensemble";
import { thermalBath } from "./thermal-bath";
import type { ComponentKind } from "./types";

/** Every component kind the set-up format knows, by its `type` word. */
export const COMPONENT_KINDS: ReadonlyMap<string, ComponentKind<any>> = new Map(
  [freeMass, oscillator, thermalBath, cavity, filterCavity, positionProbe, vacuum, coherent, squeezed, beamSplitter, loss, dump, homodyne, interferometer, spinEnsemble, entangledSource].map(
    (k) => [k.type, k] as const,
  ),
);

export function componentKind(type: string): ComponentKind<any> | undefined {
  return COMPONENT_KINDS.get(type);
}
