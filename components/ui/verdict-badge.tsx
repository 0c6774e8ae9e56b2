import { cn } from "@/lib/utils";

export type Verdict = "pass" | "fail" | "inconclusive" | "flagged" | "not-steady" | "pending" | "failed-analysis" | "accepted" | "rejected" | "none";

const look: Record<Verdict, { label: string; icon: string; className: string }> = {
  pass: { label: "Pass", icon: "✓", className: "border-verdict-pass/50 bg-verdict-passBg text-verdict-pass" },
  accepted: { label: "Accepted", icon: "✓", className: "border-verdict-pass/50 bg-verdict-passBg text-verdict-pass" },
  fail: { label: "Fail", icon: "✕", className: "border-verdict-fail/50 bg-verdict-failBg text-verdict-fail" },
  rejected: { label: "Rejected", icon: "✕", className: "border-verdict-fail/50 bg-verdict-failBg text-verdict-fail" },
  // Not a pass and not a fail: the capture could not decide a rule (shown in the warning colour, with its own word and icon).
  inconclusive: { label: "Cannot judge", icon: "?", className: "border-verdict-warn/50 bg-verdict-warnBg text-verdict-warn" },
  flagged: { label: "Flagged", icon: "⚑", className: "border-verdict-fail/50 bg-verdict-failBg text-verdict-fail" },
  "not-steady": { label: "Not steady", icon: "∿", className: "border-verdict-warn/50 bg-verdict-warnBg text-verdict-warn" },
  "failed-analysis": { label: "Analysis failed", icon: "!", className: "border-verdict-warn/50 bg-verdict-warnBg text-verdict-warn" },
  pending: { label: "Analysing", icon: "…", className: "border-verdict-idle/40 bg-verdict-idleBg text-verdict-idle" },
  none: { label: "No verdict", icon: "–", className: "border-verdict-idle/40 bg-verdict-idleBg text-verdict-idle" },
};

/** A verdict always shows its word and its icon; the colour only reinforces them. */
export function VerdictBadge({ verdict, label, className }: { verdict: Verdict; label?: string; className?: string }) {
  const v = look[verdict];
  return (
    <span
      className={cn("inline-flex items-center gap-1 rounded border px-1.5 py-0.5 text-xs font-semibold", v.className, className)}
    >
      <span aria-hidden="true">{v.icon}</span>
      {label ?? v.label}
    </span>
  );
}
