import type { WarningRow } from "./run-results";

const look: Record<string, { title: string; icon: string }> = {
  clipping: { title: "Clipped", icon: "⊓" },
  "not-steady": { title: "Not steady", icon: "∿" },
  "few-cycles": { title: "Few cycles in the record", icon: "⋯" },
  "low-oversampling": { title: "Few samples per cycle", icon: "⋮" },
  "in-record-drift": { title: "Frequency moved during the record", icon: "↗" },
  "no-dominant-tone": { title: "No dominant tone", icon: "≈" },
  "second-mode": { title: "Second mode", icon: "⋈" },
  "sub-harmonic": { title: "Sub-harmonic", icon: "½" },
};

/** Why the figures may not be trusted, each with a word-title, an icon and the engine's sentence. */
export function TrustWarnings({ warnings }: { warnings: WarningRow[] }) {
  if (warnings.length === 0) {
    return (
      <p className="flex items-center gap-2 text-sm text-ink-soft">
        <span aria-hidden="true" className="font-semibold text-verdict-pass">✓</span>
        No trust warnings: one steady, unclipped tone, long enough for these figures.
      </p>
    );
  }
  return (
    <ul className="space-y-2" aria-label="Trust warnings">
      {warnings.map((w) => {
        const l = look[w.code] ?? { title: w.code, icon: "!" };
        return (
          <li key={w.code} className="flex gap-2.5 rounded-md border border-verdict-warn/40 bg-verdict-warnBg px-3 py-2 text-sm">
            <span aria-hidden="true" className="mt-0.5 w-4 shrink-0 text-center font-semibold text-verdict-warn">
              {l.icon}
            </span>
            <span>
              <strong className="font-semibold text-ink">{l.title}.</strong> <span className="text-ink-soft">{w.message}</span>
            </span>
          </li>
        );
      })}
    </ul>
  );
}
