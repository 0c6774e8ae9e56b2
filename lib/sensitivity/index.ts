export { analyseSensitivity, predictTempco, repeatSetStability, DEFAULT_SENSITIVITY_SETTINGS, FREQUENCY_UNJUDGEABLE_WARNINGS } from "./analyse";
export { chiSquareSurvival } from "./chi-square";
export { groupRunsByTweaks, repeatRuns } from "./groups";
export { weightedLinearFit, type WeightedFit, type WeightedPoint } from "./weighted-fit";
export type * from "./types";
