"use client";

import { EMISSIONS_SAFETY_NOTE, SPEC_PRESETS, matchingPresetIds, type SpecPreset } from "@/lib/spec/presets";
import type { DesignSpec } from "@/lib/spec/types";
import { cn } from "@/lib/utils";

export interface SpecPresetPickerProps {
  /** The spec as it is now, to mark the presets it already matches. */
  spec: DesignSpec;
  /** Called with the chosen preset; the form writes it into its fields (see applyPresetToText). */
  onApply: (preset: SpecPreset) => void;
  className?: string;
}

function Basis({ preset }: { preset: SpecPreset }) {
  if (preset.basis === "law") {
    return (
      <span className="block text-ink-faint">
        Basis: law —{" "}
        {preset.sourceUrl ? (
          <a href={preset.sourceUrl} target="_blank" rel="noreferrer noopener" className="underline underline-offset-2 hover:text-copper">
            {preset.basisNote}
            <span className="sr-only"> (opens in a new tab)</span>
          </a>
        ) : (
          preset.basisNote
        )}
        {preset.scope ? <span className="block">{preset.scope}.</span> : null}
      </span>
    );
  }
  return <span className="block text-ink-faint">Basis: {preset.basisNote}</span>;
}

/**
 * Example spec limits an engineer starts from and then adapts. Each is marked as an example with its basis (a
 * law with its citation, or common practice), and the picker carries the note that local regulations and codes
 * govern radiated emission limits.
 */
export function SpecPresetPicker({ spec, onApply, className }: SpecPresetPickerProps) {
  const matching = new Set(matchingPresetIds(spec));
  return (
    <div className={cn("rounded-md border border-rule bg-paper px-3 py-3", className)}>
      <p id="spec-presets-heading" className="text-xs font-semibold text-ink">
        Example limits — pick one as a starting point, then adapt it
      </p>
      <ul className="mt-2 grid gap-2 sm:grid-cols-2" aria-labelledby="spec-presets-heading">
        {SPEC_PRESETS.map((p) => {
          const inUse = matching.has(p.id);
          return (
            <li key={p.id} className={cn("flex flex-col gap-1.5 rounded-md border bg-paper-raised px-2.5 py-2 text-xs", inUse ? "border-copper" : "border-rule-strong")}>
              <span className="flex flex-wrap items-center gap-1.5 font-semibold text-ink">
                {p.label}
                <span className="rounded bg-paper-sunk px-1 py-px text-[10px] font-medium uppercase tracking-wide text-ink-soft">Example</span>
                {inUse ? (
                  <span className="text-[10px] font-medium text-copper-dark">
                    <span aria-hidden="true">✓ </span>in use
                  </span>
                ) : null}
              </span>
              <span className="block text-ink-soft">{p.summary}</span>
              <Basis preset={p} />
              <button
                type="button"
                onClick={() => onApply(p)}
                aria-pressed={inUse}
                className="mt-auto self-start rounded border border-rule-strong px-2 py-0.5 font-medium text-ink hover:border-copper hover:bg-paper-sunk"
              >
                <span className="sr-only">Use the example “{p.label}”</span>
                <span aria-hidden="true">{inUse ? "Applied" : "Use this example"}</span>
              </button>
            </li>
          );
        })}
      </ul>
      <p role="note" className="mt-3 text-xs leading-relaxed text-ink-soft">
        <strong className="font-semibold text-ink">Safety.</strong> {EMISSIONS_SAFETY_NOTE}
      </p>
    </div>
  );
}
