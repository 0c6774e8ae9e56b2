import { MetricTile } from "./metric-tile";
import { Card, CardBody, CardHeader } from "@/components/ui/card";
import {
  DASH,
  formatDecibels,
  formatDriftLeading,
  formatPercent,
  formatPpm,
  formatQuantity,
  formatRange,
  formatSignedCapacitance,
  formatThd,
  formatWithUncertainty,
} from "@/lib/format/numbers";
import { absoluteUncertaintyHz } from "@/lib/drift-trend/absolute-uncertainty";
import type { DriftAnalysis } from "@/lib/oscillator/drift";
import type { RunFigures } from "./run-results";
import type { RunData } from "./run-types";

/**
 * THD as the record supports it: a figure over the detected orders, "below its floor", or not measured with the
 * reason. The detail line does not wrap, so it stays short; the explanation goes in the note.
 */
function thdTile(figures: RunFigures): { value: string; detail: string; note?: string } {
  const sinad = figures.sinadDb !== null ? `SINAD ${formatDecibels(figures.sinadDb)}` : null;
  const withSinad = (text: string | null) => [text, sinad].filter(Boolean).join(" · ") || undefined;
  const t = figures.thd;
  if (t?.status === "not-measurable") return { value: "Not measured", detail: "not separable", note: withSinad(t.note) };
  if (t?.status === "below-floor") return { value: `< ${formatPercent(t.floorPercent)}`, detail: "under the noise", note: withSinad("no harmonic stands above the noise floor") };
  if (figures.thdPercent === null) return { value: "Not measured", detail: "no THD figure", note: withSinad(null) };
  const thd = formatThd(figures.thdPercent / 100);
  const floor = t && t.floorPercent > 0 ? `; the rest under a ${formatPercent(t.floorPercent)} floor` : "";
  const over = t && t.detectedOrders.length > 0 ? `over harmonic${t.detectedOrders.length > 1 ? "s" : ""} ${t.detectedOrders.join(", ")}${floor}` : null;
  return { value: thd.percent, detail: thd.db, note: withSinad(over) };
}

/**
 * The frequency's 1σ as the page states it: the statistical figure, and with the build's timebase accuracy (taken as
 * a 1σ figure, common practice for a data-sheet "± ppm") root-sum-squared in for the absolute total.
 */
function uncertaintyText(figures: RunFigures, timebasePpm: number | null): { detail: string; note: string } {
  const f = formatWithUncertainty(figures.frequencyHz, figures.frequencyUncertaintyHz, "Hz");
  const noise = figures.frequencyNoiseHz !== null && figures.frequencyNoiseHz > 0 ? `, incl. ${formatQuantity(figures.frequencyNoiseHz, "Hz", 2)} oscillator frequency noise` : "";
  if (figures.frequencyHz === null || figures.frequencyUncertaintyHz === null) return { detail: "uncertainty not given", note: "" };
  if (timebasePpm === null) {
    return { detail: `${f.uncertainty} (1σ statistical)`, note: `the scope's timebase is not in it: enter its accuracy on the build page${noise}` };
  }
  const timebaseHz = (figures.frequencyHz * timebasePpm) / 1e6;
  const totalHz = absoluteUncertaintyHz(figures.frequencyHz, figures.frequencyUncertaintyHz, timebasePpm) as number;
  return {
    detail: `± ${formatQuantity(totalHz, "Hz", 2)} total (1σ)`,
    note: `statistical ${f.uncertainty}${noise}; scope timebase ±${timebasePpm} ppm = ±${formatQuantity(timebaseHz, "Hz", 2)}`,
  };
}

export function HeadlineMetrics({
  run,
  figures,
  drift,
  timebasePpm,
}: {
  run: RunData;
  figures: RunFigures;
  drift: DriftAnalysis | null;
  timebasePpm: number | null;
}) {
  const u = uncertaintyText(figures, timebasePpm);
  const f = formatWithUncertainty(figures.frequencyHz, figures.frequencyUncertaintyHz, "Hz");
  const driftPpm = drift?.ppm ?? run.driftPpm;
  const d = formatDriftLeading(driftPpm);
  const thd = thdTile(figures);
  const amplitudeDbv = figures.fundamentalVpk ? 20 * Math.log10(figures.fundamentalVpk / Math.SQRT2) : null;
  return (
    <dl className="grid grid-cols-2 gap-3 lg:grid-cols-4">
      <MetricTile
        label="Measured frequency"
        value={f.value}
        detail={u.detail}
        note={u.note || undefined}
        className="col-span-2 lg:col-span-1"
      />
      <MetricTile
        label="Drift vs predicted"
        value={d.main}
        detail={d.detail}
        note={run.snapshot.predictedHz ? `Predicted ${formatQuantity(run.snapshot.predictedHz, "Hz", 6)}` : "No prediction for these values"}
      />
      <MetricTile label="THD" value={thd.value} detail={thd.detail} note={thd.note} />
      <MetricTile
        label="Fundamental amplitude"
        value={formatQuantity(figures.fundamentalVpk, "V", 4)}
        detail={amplitudeDbv === null ? "peak" : `peak · ${formatDecibels(amplitudeDbv, "dBV")}`}
        note={run.probeAttenuation !== 1 ? `Volts scaled ×${run.probeAttenuation} for the probe` : undefined}
      />
    </dl>
  );
}

export function MeasuredVsPredicted({ run, drift }: { run: RunData; drift: DriftAnalysis | null }) {
  const s = run.snapshot;
  const rows: Array<[string, string]> = [
    ["Predicted f0", formatQuantity(s.predictedHz, "Hz", 6)],
    ["Measured", formatQuantity(drift?.measuredHz ?? run.measuredHz, "Hz", 7)],
    ["Difference", drift ? `${formatQuantity(drift.hz, "Hz", 4, { signed: true })} · ${formatPpm(drift.ppm)}` : DASH],
    ["Worst-case band", formatRange(s.worstCase?.minHz, s.worstCase?.maxHz, "Hz", 5)],
    ["Statistical band", formatRange(s.statistical?.minHz, s.statistical?.maxHz, "Hz", 5)],
    ["Implied extra capacitance", formatSignedCapacitance(drift?.impliedExtraCapacitanceF ?? run.impliedExtraCapacitanceF)],
  ];
  const inBand =
    drift && s.worstCase ? drift.measuredHz >= s.worstCase.minHz && drift.measuredHz <= s.worstCase.maxHz : null;
  return (
    <Card>
      <CardHeader title="Measured vs predicted" description="From the as-built values snapshotted when the capture was logged." />
      <CardBody className="space-y-3">
        {s.predictedHz === null ? (
          <p className="text-sm text-ink-soft">No prediction: {s.predictionError ?? "the as-built values could not be modelled."}</p>
        ) : (
          <>
            <dl className="grid grid-cols-[auto_1fr] gap-x-4 gap-y-1 text-sm">
              {rows.map(([k, v]) => (
                <div key={k} className="contents">
                  <dt className="text-ink-soft">{k}</dt>
                  <dd className="num text-right font-mono text-[13px] text-ink">{v}</dd>
                </div>
              ))}
            </dl>
            {inBand !== null ? (
              <p className="text-sm text-ink-soft">
                <span aria-hidden="true" className="mr-1">{inBand ? "✓" : "✕"}</span>
                {inBand
                  ? "Inside the worst-case tolerance band: part tolerances alone can explain the difference."
                  : "Outside the worst-case tolerance band: part tolerances alone cannot explain the difference."}
              </p>
            ) : null}
            {drift ? <p className="rounded-md bg-paper-sunk/60 px-3 py-2 text-sm leading-relaxed text-ink">{drift.explanation}</p> : null}
          </>
        )}
      </CardBody>
    </Card>
  );
}

