import { cn } from "@/lib/utils";

function Bar({ className }: { className?: string }) {
  return <div className={cn("animate-pulse rounded bg-paper-sunk", className)} />;
}

/** The page header while a page loads. */
export function HeaderSkeleton() {
  return (
    <div className="mb-6 space-y-2" aria-hidden="true">
      <Bar className="h-3 w-40" />
      <Bar className="h-7 w-72 max-w-full" />
      <Bar className="h-4 w-96 max-w-full" />
    </div>
  );
}

/** Headline metric tiles while they load. */
export function MetricsSkeleton({ count = 4 }: { count?: number }) {
  return (
    <div className="grid grid-cols-2 gap-3 lg:grid-cols-4" aria-hidden="true">
      {Array.from({ length: count }, (_, i) => (
        <div key={i} className="space-y-2 rounded-lg border border-rule bg-paper-raised px-3 py-3">
          <Bar className="h-3 w-24" />
          <Bar className="h-6 w-32" />
        </div>
      ))}
    </div>
  );
}

/** A card-sized block (a chart, a form). */
export function BlockSkeleton({ height = 260 }: { height?: number }) {
  return (
    <div className="rounded-lg border border-rule bg-paper-raised p-4" aria-hidden="true">
      <Bar className="mb-3 h-4 w-40" />
      <div className="animate-pulse rounded bg-paper-sunk" style={{ height }} />
    </div>
  );
}

/** A table while it loads. */
export function TableSkeleton({ rows = 5 }: { rows?: number }) {
  return (
    <div className="space-y-2 rounded-lg border border-rule bg-paper-raised p-3" aria-hidden="true">
      {Array.from({ length: rows }, (_, i) => (
        <Bar key={i} className="h-6 w-full" />
      ))}
    </div>
  );
}

/** The whole page's skeleton, announced once to screen readers. */
export function PageSkeleton({ children }: { children?: React.ReactNode }) {
  return (
    <div role="status" aria-live="polite">
      <span className="sr-only">Loading…</span>
      <HeaderSkeleton />
      <div className="space-y-5">{children}</div>
    </div>
  );
}
