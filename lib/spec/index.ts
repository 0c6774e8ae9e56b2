export { evaluateSpec, hasAnyLimit, FAILING_WARNINGS, UNJUDGEABLE_WARNINGS, verdictOf } from "./evaluate";
export { needsBuildSensitivity } from "./stability-rules";
export type { BuildSensitivityMeasurements, CheckOutcome, DesignSpec, RunVerdict, SpecCheck, SpecEvaluation, SpecMeasurements, StabilityMeasurements, ToleranceUnit } from "./types";
