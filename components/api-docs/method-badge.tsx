import { cn } from "@/lib/utils";

const look: Record<string, string> = {
  get: "border-trace-a/40 text-trace-a",
  post: "border-copper/50 text-copper-dark",
  put: "border-trace-d/40 text-trace-d",
  patch: "border-trace-d/40 text-trace-d",
  delete: "border-verdict-fail/50 text-verdict-fail",
};

export interface MethodBadgeProps {
  method: string;
  className?: string;
}

/** The HTTP method in words; the colour only tells reads from writes at a glance. */
export function MethodBadge({ method, className }: MethodBadgeProps) {
  return (
    <span className={cn("inline-block min-w-[3.75rem] rounded border bg-paper-raised px-1.5 py-0.5 text-center font-mono text-xs font-semibold", look[method], className)}>
      {method.toUpperCase()}
    </span>
  );
}
