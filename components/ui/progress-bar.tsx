import { cn } from "@/lib/utils";

export interface ProgressBarProps {
  /** 0 to 1, or null for "working, amount unknown". */
  value: number | null;
  label: string;
  className?: string;
}

/** A plain progress bar with its value announced to assistive technology. */
export function ProgressBar({ value, label, className }: ProgressBarProps) {
  const percent = value === null ? null : Math.round(Math.min(1, Math.max(0, value)) * 1000) / 10;
  return (
    <div
      role="progressbar"
      aria-label={label}
      aria-valuemin={0}
      aria-valuemax={100}
      aria-valuenow={percent ?? undefined}
      className={cn("h-2.5 w-full overflow-hidden rounded-full border border-rule bg-paper-sunk", className)}
    >
      <div
        className={cn("h-full rounded-full bg-copper transition-[width] duration-200", percent === null && "w-1/3 animate-pulse")}
        style={percent === null ? undefined : { width: `${percent}%` }}
      />
    </div>
  );
}
