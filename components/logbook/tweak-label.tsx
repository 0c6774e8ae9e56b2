import type { Tweak } from "@/db/queries/tweaks";
import type { Topology } from "@/lib/oscillator/design";
import { partUnitOrBlank } from "@/components/logbook/part-unit";
import { formatPartValue } from "@/lib/format/numbers";

/**
 * A tweak in a few words: "C2 4.7 nF → 5.6 nF", with its note after a dash, or the note alone.
 *
 * @param tweak - the tweak (values in SI units).
 * @param topology - the design's topology, to know each part's unit.
 */
export function tweakLabel(tweak: Pick<Tweak, "partRef" | "fromValue" | "toValue" | "note">, topology: Topology): string {
  if (tweak.partRef) {
    const unit = partUnitOrBlank(topology, tweak.partRef);
    const change = `${tweak.partRef} ${formatPartValue(tweak.fromValue, unit)} → ${formatPartValue(tweak.toValue, unit)}`;
    return tweak.note ? `${change} — ${tweak.note}` : change;
  }
  return tweak.note || "note";
}

/** A tweak for a table row: the part change in tabular mono figures, the note in plain text. */
export function TweakText({ tweak, topology }: { tweak: Pick<Tweak, "partRef" | "fromValue" | "toValue" | "note">; topology: Topology }) {
  if (!tweak.partRef) return <span className="text-ink">{tweak.note || "note"}</span>;
  const unit = partUnitOrBlank(topology, tweak.partRef);
  return (
    <span>
      <span className="num whitespace-nowrap font-mono text-[13px] text-ink">
        {tweak.partRef} {formatPartValue(tweak.fromValue, unit)} → {formatPartValue(tweak.toValue, unit)}
      </span>
      {tweak.note ? <span className="text-ink-soft"> — {tweak.note}</span> : null}
    </span>
  );
}
