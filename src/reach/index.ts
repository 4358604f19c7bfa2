/** Astrophysical reach of a strain sensitivity: inspiral horizon, range and surveyed volume. */
export {
  HORIZON_TO_RANGE,
  chirpMass,
  iscoFrequency,
  inspiralAmplitude,
  inspiralHorizon,
  inspiralRange,
  volumeGain,
  strainCurve,
  type InspiralOptions,
  type InspiralDistance,
  type StrainCurve,
} from "./inspiral";
export { ASTRONOMICAL_UNIT, PARSEC, MEGAPARSEC } from "./astronomy";
