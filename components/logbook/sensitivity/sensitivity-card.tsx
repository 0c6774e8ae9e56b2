import { SensitivityScatterChart } from "@/components/charts/sensitivity-scatter-chart";
import { Card, CardBody, CardHeader } from "@/components/ui/card";
import { EmptyState } from "@/components/ui/empty-state";
import { formatDateTime } from "@/lib/format/dates";
import type { SensitivityReport } from "@/lib/sensitivity/types";
import { RunToRunTable } from "./run-to-run-table";
import { scatterSeries } from "./scatter-data";
import { SensitivityFigures } from "./sensitivity-figures";
import { ppmSlopeText, tempcoSentence } from "./sensitivity-text";

export interface SensitivityCardProps {
  report: SensitivityReport;
  /** The build can take uploads from this person (the empty state then says what to upload). */
  canUpload: boolean;
}

/** How the figures were made, in one sentence under the card. */
export function sensitivityMethodText(report: SensitivityReport): string {
  const s = report.settings;
  return (
    `Weighted least squares per build state (a tweak that changed a part starts a new one); at least ${s.minRuns} runs and a spread in the variable. ` +
    `Repeated runs: no tweak between them, supply within ±${s.supplyBandV} V and temperature within ±${s.temperatureBandK} K; ` +
    `χ² test of their scatter against their own 1σ at the ${s.testLevel * 100} % level (one scope: its timebase error is common to every run).` +
    (s.timebasePpm !== null ? ` The ±${s.timebasePpm} ppm timebase enters the absolute frequencies only; a scale error leaves ppm slopes alone.` : "")
  );
}

/** The build page's Sensitivity card: pushing and tempco of the build as it stands, with scatter charts, and run-to-run stability. */
export function SensitivityCard({ report, canUpload }: SensitivityCardProps) {
  const current = report.currentGroupIndex !== null ? report.groups[report.currentGroupIndex] : null;
  const earlier = report.groups.filter((g) => g !== current).reverse();
  const supplyChart = current ? scatterSeries(current, "supply") : null;
  const temperatureChart = current ? scatterSeries(current, "temperature") : null;
  return (
    <Card aria-labelledby="sensitivity-heading" id="sensitivity">
      <CardHeader
        title={<span id="sensitivity-heading">Sensitivity</span>}
        description="How the frequency moves with supply voltage and temperature, and how well repeated runs agree."
      />
      <CardBody className="space-y-4">
        {!current ? (
          <EmptyState title="No analysed run to characterise yet">
            {canUpload
              ? "Upload captures at three or more supply voltages and temperatures (enter both with each upload) to measure pushing and the temperature coefficient; repeat one condition three times for run-to-run stability."
              : "Technicians upload captures at several supply voltages and temperatures; pushing, the temperature coefficient and run-to-run stability appear here."}
          </EmptyState>
        ) : (
          <>
            <div className="space-y-1">
              <h3 className="text-sm font-semibold text-ink">
                The build as it stands{report.groups.length > 1 ? ` (state ${current.index + 1}, since ${formatDateTime(current.firstRunAt)})` : ""}
              </h3>
              <p className="text-xs text-ink-soft">
                {current.runIds.length} {current.runIds.length === 1 ? "run" : "runs"} with no part changed between them. Temperature coefficient: {tempcoSentence(current.tempco, current.predictedTempco)}.
              </p>
            </div>
            <SensitivityFigures group={current} />
            {supplyChart || temperatureChart ? (
              <div className="grid gap-4 xl:grid-cols-2">
                {supplyChart ? <SensitivityScatterChart series={supplyChart} /> : null}
                {temperatureChart ? <SensitivityScatterChart series={temperatureChart} /> : null}
              </div>
            ) : null}
          </>
        )}

        {report.repeatSets.length > 0 ? (
          <section aria-labelledby="run-to-run-heading" className="space-y-1.5">
            <h3 id="run-to-run-heading" className="text-sm font-semibold text-ink">
              Run-to-run stability
            </h3>
            <p className="text-xs text-ink-soft">
              Allan deviation σ<sub>y</sub> of repeated runs&apos; fractional frequencies in upload order (τ is the typical time between them), beside what
              their own 1σ alone would give.
            </p>
            <RunToRunTable sets={report.repeatSets} testLevel={report.settings.testLevel} showState={report.groups.length > 1} />
          </section>
        ) : current ? (
          <p className="text-xs text-ink-soft">Run-to-run stability: no condition has been repeated without a tweak in between yet.</p>
        ) : null}

        {earlier.length > 0 ? (
          <details className="text-sm">
            <summary className="cursor-pointer text-ink-soft">Earlier build states ({earlier.length})</summary>
            <ul className="mt-1.5 space-y-1 text-xs text-ink-soft">
              {earlier.map((g) => (
                <li key={g.index}>
                  <strong className="font-medium text-ink">State {g.index + 1}</strong> ({g.runIds.length} runs, {formatDateTime(g.firstRunAt)}): pushing{" "}
                  {ppmSlopeText(g.pushing, "ppm/V") ?? `not measured (${(g.pushing as { reason: string }).reason})`}; temperature coefficient {tempcoSentence(g.tempco, g.predictedTempco)}.
                </li>
              ))}
            </ul>
          </details>
        ) : null}

        {report.excluded.length > 0 ? (
          <details className="text-sm">
            <summary className="cursor-pointer text-ink-soft">Runs left out ({report.excluded.length})</summary>
            <ul className="mt-1.5 space-y-0.5 text-xs text-ink-soft">
              {report.excluded.map((e) => (
                <li key={e.runId}>
                  <span className="font-mono text-ink">{e.originalFilename}</span>: {e.reason}
                </li>
              ))}
            </ul>
          </details>
        ) : null}
        <p className="text-xs text-ink-faint">{sensitivityMethodText(report)}</p>
      </CardBody>
    </Card>
  );
}
