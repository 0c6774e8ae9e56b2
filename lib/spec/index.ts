export { evaluateSpec, hasAnyLimit, FAILING_WARNINGS } from "./evaluate";
export type { DesignSpec, SpecCheck, SpecEvaluation, SpecMeasurements, ToleranceUnit } from "./types";
