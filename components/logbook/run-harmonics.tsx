import { Table, Td, Th, Tr } from "@/components/ui/data-table";
import { VerdictBadge } from "@/components/ui/verdict-badge";
import { DASH, formatDecibels, formatQuantity } from "@/lib/format/numbers";
import type { HarmonicRow, RunFigures, SpurRow } from "./run-results";

const SPUR_KIND_NAMES: Record<string, string> = {
  "sub-harmonic": "Sub-harmonic",
  "second-mode": "Second mode",
  mains: "Mains",
  intermodulation: "Intermodulation",
  harmonic: "Harmonic",
  other: "Other",
};

function levelText(h: HarmonicRow): string {
  if (h.status === "not-separable") return "not measured";
  if (h.status === "below-detection") return h.detectionLimitDbc === null ? "under the noise" : `< ${formatDecibels(h.detectionLimitDbc, "dBc")}`;
  return formatDecibels(h.dBc, "dBc");
}

function againstLimit(h: HarmonicRow, limitDbc: number) {
  if (h.status === "not-separable") return <VerdictBadge className="whitespace-nowrap" verdict="inconclusive" />;
  if (h.status === "below-detection") {
    if (h.detectionLimitDbc === null) return DASH;
    return h.detectionLimitDbc <= limitDbc ? (
      <VerdictBadge className="whitespace-nowrap" verdict="pass" label={`Under by ≥ ${(limitDbc - h.detectionLimitDbc).toFixed(1)} dB`} />
    ) : (
      <VerdictBadge className="whitespace-nowrap" verdict="inconclusive" />
    );
  }
  if (h.dBc === null) return DASH;
  const over = h.dBc > limitDbc;
  return <VerdictBadge className="whitespace-nowrap" verdict={over ? "fail" : "pass"} label={`${over ? "Over" : "Under"} by ${Math.abs(h.dBc - limitDbc).toFixed(1)} dB`} />;
}

/**
 * Each harmonic as the engine found it: a level, "< limit" under the noise, or not measured (its fold
 * lands on another component), with where a folded order shows in the spectrum.
 */
export function HarmonicsTable({ figures, limitDbc }: { figures: RunFigures; limitDbc: number | null | undefined }) {
  if (figures.harmonics.length === 0) return null;
  const notes = figures.harmonics.filter((h) => h.status === "not-separable" && h.note);
  const anyFolded = figures.harmonics.some((h) => h.folded);
  return (
    <section aria-labelledby="harmonics-heading" className="min-w-0 space-y-2">
      <h2 id="harmonics-heading" className="text-sm font-semibold text-ink">
        Harmonics
      </h2>
      <Table caption="Harmonic levels of this run">
        <thead>
          <tr>
            <Th>Order</Th>
            <Th className="text-right">Frequency</Th>
            <Th className="hidden text-right sm:table-cell">Amplitude (peak)</Th>
            <Th className="text-right">Level</Th>
            {typeof limitDbc === "number" ? <Th>Against the limit</Th> : null}
          </tr>
        </thead>
        <tbody>
          {figures.harmonics.map((h) => (
            <Tr key={h.order}>
              <Td>{h.order}</Td>
              <Td numeric className="whitespace-nowrap">
                {formatQuantity(h.frequencyHz, "Hz", 5)}
                {h.folded ? <span className="block text-xs text-ink-faint">seen at {formatQuantity(h.seenAtHz, "Hz", 4)} (folded)</span> : null}
              </Td>
              <Td numeric className="hidden whitespace-nowrap sm:table-cell">{formatQuantity(h.amplitudeVpk, "V", 3)}</Td>
              <Td numeric className="whitespace-nowrap">{levelText(h)}</Td>
              {typeof limitDbc === "number" ? <Td>{againstLimit(h, limitDbc)}</Td> : null}
            </Tr>
          ))}
        </tbody>
      </Table>
      {anyFolded ? (
        <p className="text-xs text-ink-soft">
          Folded: above half the sample rate, so the record shows the order at |n·f − k·fs|; its level is fitted there.
        </p>
      ) : null}
      {notes.length > 0 ? (
        <ul className="text-xs text-ink-soft">
          {notes.map((h) => (
            <li key={h.order}>
              Harmonic {h.order}: {h.note}.
            </li>
          ))}
        </ul>
      ) : null}
    </section>
  );
}

/** The largest components that are not harmonics, each named by what it most likely is. */
export function SpursTable({ spurs }: { spurs: SpurRow[] }) {
  return (
    <section aria-labelledby="spurs-heading" className="min-w-0 space-y-2">
      <h2 id="spurs-heading" className="text-sm font-semibold text-ink">
        Other components
      </h2>
      {spurs.length === 0 ? (
        <p className="text-sm text-ink-soft">No tone other than the fundamental and its harmonics stands above the noise.</p>
      ) : (
        <Table caption="Components that are not harmonics">
          <thead>
            <tr>
              <Th>Kind</Th>
              <Th>What</Th>
              <Th className="text-right">Frequency</Th>
              <Th className="text-right">Level</Th>
            </tr>
          </thead>
          <tbody>
            {spurs.map((s) => (
              <Tr key={`${s.frequencyHz}-${s.label}`}>
                <Td>{SPUR_KIND_NAMES[s.kind] ?? s.kind}</Td>
                <Td>{s.label}</Td>
                <Td numeric className="whitespace-nowrap">{formatQuantity(s.frequencyHz, "Hz", 5)}</Td>
                <Td numeric className="whitespace-nowrap">{formatDecibels(s.dBc, "dBc")}</Td>
              </Tr>
            ))}
          </tbody>
        </Table>
      )}
    </section>
  );
}
