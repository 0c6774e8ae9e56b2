export { evaluateSpec, hasAnyLimit, FAILING_WARNINGS, UNJUDGEABLE_WARNINGS, verdictOf } from "./evaluate";
export type { CheckOutcome, DesignSpec, RunVerdict, SpecCheck, SpecEvaluation, SpecMeasurements, ToleranceUnit } from "./types";
