/**
 * The mechanical body and damping-bath records that mechanical components hand to the
 * couplers, baths and signal references linked to them.
 */
import type { ModeInfo } from "../network/model";

/** What a mechanical element shows to the couplers and baths linked to it. */
export interface MechanicalBody {
  readonly owner: string;
  readonly mode: ModeInfo;
  /** Metres per unit of the dimensionless position quadrature X. */
  readonly xScale: number;
  /** Newton-seconds per unit of P; xScale · pScale = ħ so that [X, P] = i. */
  readonly pScale: number;
  /** Mass in kg (positive). */
  readonly mass: number;
  /** +1 or −1: sign of the effective mass. */
  readonly massSign: 1 | -1;
  /** Angular resonance frequency in rad/s; 0 for a free mass. */
  readonly omega: number;
  /** Viscous damping baths acting on this body (intrinsic and attached). */
  readonly baths: ThermalBathInfo[];
}

export interface ThermalBathInfo {
  readonly owner: string;
  /** "viscous": m ẍ = … − m γ ẋ; "symmetric": amplitude damping of both quadratures at γ/2. */
  readonly kind: "viscous" | "symmetric";
  /** Energy damping rate γ in rad/s. */
  readonly gamma: number;
  /** Bath temperature in K. */
  readonly temperature: number;
}
