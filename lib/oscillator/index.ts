/**
 * Oscillator design math: the public surface for design pages, the upload snapshot, the API and the CLI.
 * Pure functions only; no I/O.
 */

export {
  TOPOLOGIES,
  TOPOLOGY_PARTS,
  assertValidDesign,
  nominalValues,
  parallelCapacitanceF,
  partUnit,
  validateDesign,
  type OscillatorDesign,
  type PartKind,
  type PartRole,
  type PartSpec,
  type Topology,
  type WindingSense,
} from "./design";
export {
  TOPOLOGY_ASSUMPTIONS,
  frequencyFromValues,
  predictOscillator,
  resonantFrequencyHz,
  tankModel,
  type OscillatorPrediction,
  type TankModel,
} from "./topologies";
export {
  formatEngineering,
  parseTempco,
  parseTolerance,
  parseValue,
  type FormatOptions,
  type QuantityUnit,
  type Tempco,
} from "./units";
export {
  E_SERIES_NAMES,
  eSeriesMantissas,
  isPreferred,
  nearestPreferred,
  nextAbove,
  nextBelow,
  preferredValuesBetween,
  type ESeriesName,
} from "./e-series";
export {
  frequencySensitivities,
  invalidCornersText,
  rssBand,
  seededRandom,
  statisticalBand,
  worstCaseBand,
  type FrequencyBand,
  type RssBand,
  type StatisticalBand,
  type StatisticalOptions,
  type WorstCaseBand,
} from "./tolerance";
export { frequencyShiftForPartChanges, temperatureShift, type FrequencyShift, type TemperatureShift } from "./tempco";
export {
  analyseDrift,
  impliedExtraCapacitanceF,
  impliedInductanceErrorH,
  type DriftAnalysis,
  type DriftDirection,
} from "./drift";
export { retunableParts, solvePartValue, suggestRetune, type RetuneOptions, type RetuneSuggestion } from "./retune";
export { buildDesignReport, type DesignReport, type ReportOptions } from "./report";
export {
  LIMITS,
  REFERENCE_TEMPERATURE_C,
  assertWithinLimit,
  describeLimit,
  formatLimitValue,
  limitProblem,
  type LimitName,
  type QuantityLimit,
} from "./limits";
