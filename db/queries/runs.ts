// Every run query, by concern: row types and mapping (run-rows), one run (run-detail), a build's runs
// (runs-list), the pipeline's writes (run-lifecycle). Callers import from here.
export {
  RUN_STATUSES,
  type RunStatus,
  type Verdict,
  type RunSnapshot,
  type RunSummary,
  type Run,
} from "./run-rows";
export * from "./run-detail";
export * from "./runs-list";
export * from "./run-lifecycle";
