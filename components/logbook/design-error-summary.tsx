"use client";

import { forwardRef } from "react";

/** One problem in the summary: the message and the id of the input it belongs to. */
export interface SummaryItem {
  fieldId: string;
  label: string;
  message: string;
}

/** The input id a dotted problem path belongs to, matching the ids the design form gives its inputs. */
export function designFieldId(path: string, firstPartRef: string): string {
  const part = /^parts\.([^.]+)\.(value|tolerance|tempco)$/.exec(path);
  if (part) return `part-${part[1]}-${part[2] === "tolerance" ? "tol" : part[2]}`;
  if (path.startsWith("parts")) return `part-${firstPartRef}-value`;
  if (path.startsWith("spec.")) return `spec-${path.slice(5)}`;
  if (path === "extraCapacitance") return "design-extra";
  return `design-${path === "changeNote" ? "note" : path}`;
}

/** A short name for a field, so each line of the summary says where the problem is. */
export function designFieldLabel(path: string): string {
  const part = /^parts\.([^.]+)\.(value|tolerance|tempco)$/.exec(path);
  if (part) return `${part[1]} ${part[2]}`;
  if (path.startsWith("parts")) return "Parts";
  const names: Record<string, string> = {
    name: "Name",
    topology: "Topology",
    windings: "Windings",
    extraCapacitance: "Extra capacitance",
    changeNote: "Note",
    "spec.targetHz": "Target frequency",
    "spec.toleranceValue": "Frequency tolerance",
    "spec.maxThdPercent": "Maximum THD",
    "spec.maxHarmonicDbc": "Maximum single harmonic",
    "spec.minFundamentalVpk": "Minimum amplitude",
    "spec.maxDriftPpm": "Maximum drift",
    "spec.maxRmsJitterS": "Maximum rms jitter",
    "spec.maxPushingPpmPerV": "Maximum pushing",
    "spec.maxTempcoPpmPerK": "Maximum temperature coefficient",
    "spec.phaseNoiseOffsetHz": "Phase-noise offset",
    "spec.maxPhaseNoiseDbcPerHz": "Maximum phase noise",
    "spec.maxStartUpS": "Longest start-up time",
  };
  return names[path] ?? path;
}

/**
 * Every problem of a submitted form at once, each a link that moves focus to its field. The form focuses this box
 * when a submit is refused, so a keyboard or screen-reader user starts from the list.
 */
export const DesignErrorSummary = forwardRef<HTMLDivElement, { items: SummaryItem[] }>(function DesignErrorSummary({ items }, ref) {
  if (items.length === 0) return null;
  return (
    <div
      ref={ref}
      tabIndex={-1}
      role="alert"
      aria-labelledby="design-error-summary-title"
      className="rounded-md border-2 border-verdict-fail bg-verdict-failBg px-4 py-3 focus:outline-none focus-visible:ring-2 focus-visible:ring-copper"
    >
      <h2 id="design-error-summary-title" className="text-sm font-semibold text-ink">
        {items.length === 1 ? "One thing to fix before saving" : `${items.length} things to fix before saving`}
      </h2>
      <ul className="mt-1 space-y-0.5 text-sm">
        {items.map((item, i) => (
          <li key={`${item.fieldId}-${i}`}>
            <a
              href={`#${item.fieldId}`}
              className="text-verdict-fail underline underline-offset-2"
              onClick={(event) => {
                const target = document.getElementById(item.fieldId);
                if (!target) return;
                event.preventDefault();
                target.focus();
                target.scrollIntoView({ block: "center" });
              }}
            >
              <span className="font-medium">{item.label}:</span> {item.message}
            </a>
          </li>
        ))}
      </ul>
    </div>
  );
});
