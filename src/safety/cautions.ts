/**
 * Safety cautions as sentences, one per hazard: the component, the value (written or implied
 * by other parameters) with its unit, the threshold, and a pointer to local rules. Components
 * call these from their `cautions`, so a power written directly and a power implied by a
 * photon number, a measurement rate or an arm power read alike.
 */
import { formatQuantity } from "../units";
import { CLASS_3B_POWER, CLASS_4_POWER, CRYOGENIC_TEMPERATURE, ELECTRON_GYROMAGNETIC_RATIO, STATIC_FIELD } from "./limits";

const FOLLOW_RULES = "follow your institution's laser-safety programme and local rules, and licensed practice";

/**
 * The laser-power caution for `power` watts, or nothing below Class 3B.
 * @param lead what the component does, up to the power: "'probe' uses"
 * @param what the words after the power: "of probe light", "of input light (implied by …)"
 */
export function laserPowerCautions(lead: string, power: number, what: string): string[] {
  const shown = `${lead} ${watts(power)} ${what}`;
  if (power > CLASS_4_POWER) {
    return [
      `${shown}: hazardous laser power, above the Class 4 threshold of ${CLASS_4_POWER} W (the Class 3B limit for continuous beams in IEC 60825-1) where eyes, skin and materials are at risk even from diffuse reflections; ${FOLLOW_RULES}.`,
    ];
  }
  if (power > CLASS_3B_POWER) {
    return [
      `${shown}: within Class 3B (above ${CLASS_3B_POWER * 1e3} mW and up to ${CLASS_4_POWER} W for continuous visible and near-infrared beams in IEC 60825-1) where the direct beam and its specular reflections can injure eyes; ${FOLLOW_RULES}.`,
    ];
  }
  return [];
}

/** The cryogenic caution for a bath or body at `temperature` kelvin, or nothing above it. */
export function cryogenicCautions(component: string, temperature: number): string[] {
  if (!(temperature <= CRYOGENIC_TEMPERATURE)) return [];
  return [
    `'${component}' is at ${formatQuantity(temperature, "temperature", 3)}, at or below ${CRYOGENIC_TEMPERATURE} K (liquid-helium temperatures), which usually takes a liquid-helium cryostat, a closed-cycle cryocooler or a dilution refrigerator whose cryogens can displace oxygen, cause cold burns and build up pressure in closed volumes; follow your institution's cryogenic-safety rules and licensed practice.`,
  ];
}

/** The caution for a static field of `field` tesla given directly, or nothing below the threshold. */
export function magneticFieldCautions(component: string, field: number): string[] {
  return fieldCaution(`'${component}' uses a static magnetic field of ${tesla(field)}`, field);
}

/**
 * The caution for the least static field a Larmor frequency implies for spins of electronic
 * origin (f_L / (28.02 GHz/T)); spins with a smaller gyromagnetic ratio need a stronger field.
 */
export function larmorFieldCautions(component: string, larmorFrequency: number): string[] {
  const field = larmorFrequency / ELECTRON_GYROMAGNETIC_RATIO;
  return fieldCaution(
    `'${component}' precesses at a Larmor frequency of ${formatQuantity(larmorFrequency, "frequency")}, which implies a static magnetic field of at least ${tesla(field)} (at the free electron's gyromagnetic ratio, ${formatQuantity(ELECTRON_GYROMAGNETIC_RATIO, "gyromagneticRatio")}; spins with a smaller ratio need more)`,
    field,
  );
}

function fieldCaution(shown: string, field: number): string[] {
  if (!(field >= STATIC_FIELD)) return [];
  return [
    `${shown}, at or above ${STATIC_FIELD * 1e3} mT (5 G) where fields can disturb pacemakers and other implanted devices and strong fields pull on ferromagnetic objects; mark the area and follow your institution's magnetic-field safety rules and licensed practice.`,
  ];
}

function watts(p: number): string {
  return formatQuantity(p, "power", 3);
}

function tesla(b: number): string {
  return formatQuantity(b, "magneticField", 3);
}
