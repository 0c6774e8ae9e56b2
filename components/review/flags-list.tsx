"use client";

import Link from "next/link";
import { useActionState } from "react";
import { Button } from "@/components/ui/button";
import type { FormState } from "@/lib/auth/action-state";
import { formatDateTime } from "@/lib/format/dates";
import { cn } from "@/lib/utils";
import { flagFigure, ruleName } from "./rule-name";

/** A flag as the list shows it (dates may arrive as strings). */
export interface FlagItem {
  id: string;
  runId: string;
  rule: string;
  measured: number | null;
  limit: number | null;
  margin: number | null;
  unit: string;
  message: string;
  acknowledgedByName: string | null;
  acknowledgedAt: Date | string | null;
  createdAt: Date | string;
}

export interface FlagsListProps {
  flags: FlagItem[];
  /** acknowledgeFlagAction bound to the build id; absent for roles that may not acknowledge. */
  acknowledge?: (prev: FormState, formData: FormData) => Promise<FormState>;
  /** Run file names by id, for the link text. */
  runNames?: Record<string, string>;
  /** Print layout: no buttons. */
  compact?: boolean;
  /** Show this many first (open ones lead); the rest fold under "Show N more". */
  limit?: number;
}

function AcknowledgeButton({ flagId, action, label }: { flagId: string; action: NonNullable<FlagsListProps["acknowledge"]>; label: string }) {
  const [state, formAction, pending] = useActionState(action, {} as FormState);
  return (
    <form action={formAction} className="flex flex-wrap items-center gap-2">
      <input type="hidden" name="flagId" value={flagId} />
      <Button type="submit" size="sm" variant="secondary" disabled={pending || state.ok} aria-label={`Acknowledge the flag: ${label}`}>
        {pending ? "Saving…" : state.ok ? "Acknowledged" : "Acknowledge"}
      </Button>
      <span aria-live="polite" className={cn("text-xs", state.ok ? "text-verdict-pass" : "text-verdict-fail")}>
        {state.ok ? null : state.message}
      </span>
    </form>
  );
}

/**
 * The build's flags: every broken rule with what was measured, the limit and the margin, newest first. Open flags
 * come first; an engineer acknowledges one to say it has been seen (it stays in the record).
 */
export function FlagsList({ flags, acknowledge, runNames = {}, compact = false, limit }: FlagsListProps) {
  if (flags.length === 0) {
    return <p className="text-sm text-ink-soft">No flags: no run of this build has broken a spec rule.</p>;
  }
  const ordered = [...flags].sort(
    (a, b) => Number(a.acknowledgedAt !== null) - Number(b.acknowledgedAt !== null) || new Date(b.createdAt).getTime() - new Date(a.createdAt).getTime(),
  );
  const shown = limit !== undefined ? ordered.slice(0, limit) : ordered;
  const rest = limit !== undefined ? ordered.slice(limit) : [];
  const item = (f: FlagItem) => {
    const open = f.acknowledgedAt === null;
    const name = ruleName(f.rule);
    return (
      <li key={f.id} className="flex flex-col gap-1.5 py-2.5 sm:flex-row sm:items-start sm:justify-between sm:gap-4">
        <div className="min-w-0 space-y-0.5">
          <p className="flex flex-wrap items-center gap-2 text-sm">
            <span
              className={cn(
                "inline-flex items-center gap-1 rounded border px-1.5 py-0.5 text-xs font-semibold",
                open ? "border-verdict-fail/50 bg-verdict-failBg text-verdict-fail" : "border-verdict-idle/40 bg-verdict-idleBg text-verdict-idle",
              )}
            >
              <span aria-hidden="true">{open ? "⚑" : "✓"}</span>
              {open ? "Open" : "Seen"}
            </span>
            <span className="font-medium text-ink">{name}</span>
          </p>
          {f.unit ? (
            <dl className="num flex flex-wrap gap-x-4 font-mono text-xs text-ink">
              <div className="flex gap-1">
                <dt className="font-sans text-ink-faint">measured</dt>
                <dd>{flagFigure(f.measured, f.unit)}</dd>
              </div>
              <div className="flex gap-1">
                <dt className="font-sans text-ink-faint">limit</dt>
                <dd>{flagFigure(f.limit, f.unit)}</dd>
              </div>
              <div className="flex gap-1">
                <dt className="font-sans text-ink-faint">margin</dt>
                <dd className="font-semibold text-verdict-fail">{flagFigure(f.margin, f.unit, true)}</dd>
              </div>
            </dl>
          ) : null}
          <p className="text-xs text-ink-soft">{f.message}</p>
          <p className="text-xs text-ink-faint">
            <Link href={`/runs/${f.runId}`} className="underline underline-offset-2 hover:text-copper">
              {runNames[f.runId] ?? "the run"}
            </Link>{" "}
            · {formatDateTime(f.createdAt)}
            {!open ? ` · seen by ${f.acknowledgedByName ?? "someone"}, ${formatDateTime(f.acknowledgedAt)}` : ""}
          </p>
        </div>
        {open && acknowledge && !compact ? (
          <div className="shrink-0 no-print">
            <AcknowledgeButton flagId={f.id} action={acknowledge} label={`${name}, ${f.message}`} />
          </div>
        ) : null}
      </li>
    );
  };
  return (
    <div>
      <ul className="divide-y divide-rule/70" aria-label="Flags of this build">
        {shown.map(item)}
      </ul>
      {rest.length > 0 ? (
        <details className="border-t border-rule/70 pt-2">
          <summary className="cursor-pointer text-xs font-medium text-ink-soft hover:text-ink">
            Show {rest.length} more {rest.length === 1 ? "flag" : "flags"}
          </summary>
          <ul className="divide-y divide-rule/70" aria-label="More flags of this build">
            {rest.map(item)}
          </ul>
        </details>
      ) : null}
    </div>
  );
}
