import type { ReactNode } from "react";
import { cn } from "@/lib/utils";

export interface MetricTileProps {
  label: string;
  value: ReactNode;
  /** Beside or under the value: uncertainty, the same figure in another unit. */
  detail?: ReactNode;
  /** A line of plain words under the figures. */
  note?: ReactNode;
  className?: string;
}

/** One headline number: label, value in tabular mono digits, its detail and a note. */
export function MetricTile({ label, value, detail, note, className }: MetricTileProps) {
  return (
    <div className={cn("min-w-0 rounded-lg border border-rule bg-paper-raised px-3 py-2.5", className)}>
      <dt className="text-xs font-medium text-ink-soft">{label}</dt>
      <dd className="mt-0.5">
        <span className="num block whitespace-nowrap font-mono text-lg font-semibold leading-tight text-ink sm:text-xl">
          {value}
        </span>
        {detail ? <span className="num block whitespace-nowrap font-mono text-xs text-ink-soft">{detail}</span> : null}
        {note ? <span className="mt-1 block text-xs leading-snug text-ink-faint">{note}</span> : null}
      </dd>
    </div>
  );
}
