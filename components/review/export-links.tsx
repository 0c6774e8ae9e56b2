import { buttonVariants } from "@/components/ui/button";
import { cn } from "@/lib/utils";

/** The runs table's filters the CSV export takes (same names as the table's query string). */
export interface RunsCsvFilters {
  verdict?: string;
  status?: string;
  from?: string;
  to?: string;
}

/** GET /api/v1/builds/{id}/runs.csv with the table's current filters. */
export function runsCsvHref(buildId: string, filters: RunsCsvFilters = {}): string {
  const q = new URLSearchParams();
  for (const [k, v] of Object.entries(filters)) if (typeof v === "string" && v !== "") q.set(k, v);
  const s = q.toString();
  return `/api/v1/builds/${buildId}/runs.csv${s ? `?${s}` : ""}`;
}

/** Download link for a build's runs table as CSV, with the filters now applied. */
export function RunsCsvLink({ buildId, filters, className }: { buildId: string; filters?: RunsCsvFilters; className?: string }) {
  const filtered = Object.values(filters ?? {}).some((v) => v);
  return (
    <a href={runsCsvHref(buildId, filters)} download className={cn(buttonVariants({ variant: "secondary", size: "sm" }), className)}>
      <span aria-hidden="true">↓</span> {filtered ? "CSV of the filtered runs" : "Runs as CSV"}
    </a>
  );
}

/** Download link for a run's full results as JSON (the server answers 409 until the analysis is done). */
export function ResultsJsonLink({ runId, className }: { runId: string; className?: string }) {
  return (
    <a href={`/api/v1/runs/${runId}/results.json`} download className={cn(buttonVariants({ variant: "secondary", size: "sm" }), className)}>
      <span aria-hidden="true">↓</span> Results as JSON
    </a>
  );
}
