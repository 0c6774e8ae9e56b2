"use client";

import { useMutation, useQuery, useQueryClient } from "@tanstack/react-query";
import Link from "next/link";
import { useMemo, useState } from "react";
import { SpectrumChart } from "@/components/charts/spectrum-chart";
import { ResultsJsonLink } from "@/components/review/export-links";
import { WaveformChart } from "@/components/charts/waveform-chart";
import { fetchJson } from "@/components/providers/query-provider";
import { buttonVariants, Button } from "@/components/ui/button";
import { Card, CardBody, CardHeader } from "@/components/ui/card";
import { Table, Td, Th, Tr } from "@/components/ui/data-table";
import { FormMessage } from "@/components/ui/field";
import { VerdictBadge, type Verdict } from "@/components/ui/verdict-badge";
import { formatBytes } from "@/lib/format/bytes";
import { formatDateTime } from "@/lib/format/dates";
import {
  DASH,
  formatDecibels,
  formatDriftLeading,
  formatPartValue,
  formatPercent,
  formatPpm,
  formatQuantity,
  formatRange,
  formatSignedCapacitance,
  formatThd,
  formatWithUncertainty,
} from "@/lib/format/numbers";
import { analyseDrift, type DriftAnalysis } from "@/lib/oscillator/drift";
import type { OscillatorDesign } from "@/lib/oscillator/design";
import { partUnitOrBlank } from "@/components/logbook/part-unit";
import { evaluateSpec } from "@/lib/spec/evaluate";
import type { SpecEvaluation } from "@/lib/spec/types";
import { MetricTile } from "./metric-tile";
import { MetricsSkeleton } from "./skeletons";
import { runFigures, specMeasurements, type RunFigures } from "./run-results";
import type { RunContext, RunData, RunPlot } from "./run-types";
import { SpecVerdictList } from "./spec-verdict-list";
import { TrustWarnings } from "./trust-warnings";

export interface RunViewProps {
  initialRun: RunData;
  context: RunContext;
  canReanalyse: boolean;
  /** Server action that re-queues the analysis; resolves to a message on refusal. */
  reanalyse?: (runId: string) => Promise<{ ok?: boolean; message?: string | null }>;
}

/** How often the page asks again while the analysis is queued or running. */
const POLL_MS = 1500;

function isFinished(status: RunData["status"]): boolean {
  return status === "done" || status === "failed";
}

/**
 * The API's run JSON over what the page already holds: it leaves out internal fields (attempts, object key) and
 * names the stored spec checks `checks`.
 */
function mergeRun(previous: RunData, body: unknown): RunData {
  const obj = (body && typeof body === "object" && "run" in body ? (body as { run: unknown }).run : body) as Partial<RunData> & {
    checks?: RunData["specChecks"];
  };
  return { ...previous, ...obj, specChecks: obj.specChecks ?? obj.checks ?? previous.specChecks ?? null } as RunData;
}

function unwrapPlot(body: unknown): RunPlot | null {
  const obj = body as { plot?: RunPlot | null };
  const plot = (obj && typeof obj === "object" && "plot" in obj ? obj.plot : body) as RunPlot | null;
  return plot && plot.waveform && plot.spectrum ? plot : null;
}

function badgeFor(run: RunData): Verdict {
  if (run.status === "failed") return "failed-analysis";
  if (run.status !== "done") return "pending";
  if (run.verdict === "pass") return "pass";
  if (run.verdict === "fail") return "fail";
  return "none";
}

function designOf(run: RunData): OscillatorDesign {
  const s = run.snapshot;
  return {
    topology: s.topology,
    parts: s.parts,
    ...(s.extraCapacitanceF ? { extraCapacitanceF: s.extraCapacitanceF } : {}),
    ...(s.windings ? { windings: s.windings } : {}),
  };
}

/** The run page body: fetches the run (and its plot data) in the client and follows it until the analysis ends. */
export function RunView({ initialRun, context, canReanalyse, reanalyse }: RunViewProps) {
  const runId = initialRun.id;
  const queryClient = useQueryClient();
  const runQuery = useQuery({
    queryKey: ["run", runId],
    queryFn: async ({ signal }) =>
      mergeRun(queryClient.getQueryData<RunData>(["run", runId]) ?? initialRun, await fetchJson<unknown>(`/api/v1/runs/${runId}`, signal)),
    initialData: initialRun,
    refetchInterval: (query) => (query.state.data && isFinished(query.state.data.status) ? false : POLL_MS),
  });
  const run = runQuery.data;
  const done = run.status === "done";
  const plotQuery = useQuery({
    queryKey: ["run-plot", runId, run.finishedAt ? String(run.finishedAt) : null],
    queryFn: async ({ signal }) => unwrapPlot(await fetchJson<unknown>(`/api/v1/runs/${runId}/plot`, signal)),
    enabled: done,
    staleTime: Infinity,
  });

  const [actionMessage, setActionMessage] = useState<{ text: string; ok: boolean } | null>(null);
  const reanalyseMutation = useMutation({
    mutationFn: async () => {
      if (!reanalyse) throw new Error("Re-analysis is not available here.");
      return reanalyse(runId);
    },
    onSuccess: (result) => {
      if (result && result.ok) setActionMessage({ text: result.message ?? "Queued for analysis again.", ok: true });
      else setActionMessage({ text: result?.message ?? "The run could not be re-queued.", ok: false });
      void queryClient.invalidateQueries({ queryKey: ["run", runId] });
    },
    onError: () => setActionMessage({ text: "The server could not re-queue the analysis. Try again.", ok: false }),
  });

  const figures = useMemo(() => runFigures(run), [run]);
  const drift = useMemo<DriftAnalysis | null>(() => {
    if (figures.frequencyHz === null || run.snapshot.predictedHz === null) return null;
    try {
      return analyseDrift(designOf(run), figures.frequencyHz);
    } catch {
      return null;
    }
  }, [run, figures.frequencyHz]);
  const evaluation = useMemo<SpecEvaluation | null>(() => {
    // The worker's stored checks are the record; evaluating here only covers runs analysed before they were kept.
    if (run.specChecks && run.specChecks.length > 0) {
      return { verdict: run.verdict, checks: run.specChecks };
    }
    const m = specMeasurements(figures);
    if (!m) return null;
    try {
      return evaluateSpec(run.snapshot.spec ?? {}, m);
    } catch {
      return null;
    }
  }, [figures, run.snapshot.spec, run.specChecks, run.verdict]);

  const plot = plotQuery.data ?? null;
  const fundamentalDbv = plot?.harmonicMarkers.find((m) => m.order === 1)?.dBV ?? null;
  const limitDbc = run.snapshot.spec?.maxHarmonicDbc ?? null;
  const limitDbv = fundamentalDbv !== null && typeof limitDbc === "number" ? fundamentalDbv + limitDbc : null;

  return (
    <div className="space-y-5">
      <div className="flex flex-wrap items-center gap-2">
        <VerdictBadge verdict={badgeFor(run)} label={run.status === "queued" ? "Queued" : undefined} className="text-sm" />
        {figures.warnings.some((w) => w.code === "not-steady") ? <VerdictBadge verdict="not-steady" /> : null}
        <span className="text-sm text-ink-soft">
          Captured {formatDateTime(run.createdAt)} by {run.createdByName}
          {context.tweakLabel ? <> · after tweak: {context.tweakLabel}</> : null}
        </span>
        <div className="ml-auto flex flex-wrap gap-2">
          <a href={`/api/v1/runs/${runId}/capture`} download={run.originalFilename} className={buttonVariants({ variant: "secondary", size: "sm" })}>
            <span aria-hidden="true">↓</span> Raw capture
          </a>
          {done ? <ResultsJsonLink runId={runId} /> : null}
          {canReanalyse && isFinished(run.status) && reanalyse ? (
            <Button size="sm" variant="secondary" onClick={() => reanalyseMutation.mutate()} disabled={reanalyseMutation.isPending}>
              <span aria-hidden="true">↻</span> {reanalyseMutation.isPending ? "Re-queueing…" : "Re-analyse"}
            </Button>
          ) : null}
        </div>
      </div>
      <FormMessage message={actionMessage?.text} tone={actionMessage?.ok ? "success" : "error"} />

      <StatusBanner run={run} refreshError={runQuery.isError ? (runQuery.error as Error).message : null} canReanalyse={canReanalyse} />

      {run.status === "queued" || run.status === "running" ? <MetricsSkeleton /> : null}

      {done ? (
        <>
          <HeadlineMetrics run={run} figures={figures} drift={drift} />
          <Card>
            <CardHeader title="Can these figures be trusted?" />
            <CardBody>
              <TrustWarnings warnings={figures.warnings} />
            </CardBody>
          </Card>
          <div className="grid gap-5 lg:grid-cols-2">
            <Card>
              <CardHeader title="Waveform" description="Min/max envelope of the analysed channel." />
              <CardBody>
                {plot ? (
                  <WaveformChart timeS={plot.waveform.timeS} minV={plot.waveform.minV} maxV={plot.waveform.maxV} channel={run.channel ?? undefined} />
                ) : (
                  <ChartPlaceholder loading={plotQuery.isLoading} error={plotQuery.isError} />
                )}
              </CardBody>
            </Card>
            <Card>
              <CardHeader
                title="Spectrum"
                description={plot ? `dBV (re 1 V rms), ${plot.spectrum.window} window, bin ${formatQuantity(plot.spectrum.binHz, "Hz", 3)}.` : "dBV (re 1 V rms)."}
              />
              <CardBody>
                {plot ? (
                  <SpectrumChart
                    frequenciesHz={plot.spectrum.frequencyHz}
                    levelsDbv={plot.spectrum.dBV}
                    markers={plot.harmonicMarkers.map((m) => ({ order: m.order, frequencyHz: m.frequencyHz, levelDbv: m.dBV }))}
                    limitDbv={limitDbv}
                    limitDbc={limitDbc}
                  />
                ) : (
                  <ChartPlaceholder loading={plotQuery.isLoading} error={plotQuery.isError} />
                )}
              </CardBody>
            </Card>
          </div>
          <div className="grid gap-5 lg:grid-cols-2">
            <Card>
              <CardHeader
                title="Spec verdict"
                description={
                  run.snapshot.specRevision === undefined
                    ? `Against the spec of design revision ${run.snapshot.designRevision}, as it was when the capture was logged.`
                    : `Against the spec of design revision ${run.snapshot.specRevision}, as it was at the last re-analysis; the parts and prediction are those logged with the capture (revision ${run.snapshot.designRevision}).`
                }
              />
              <CardBody>
                {evaluation && evaluation.checks.length > 0 ? (
                  <SpecVerdictList checks={evaluation.checks} />
                ) : (
                  <p className="text-sm text-ink-soft">
                    The design sets no spec limits, so there is nothing to pass or fail.{" "}
                    <Link className="text-copper underline underline-offset-2" href={`/projects/${context.projectId}/designs/${context.designId}`}>
                      Add a spec to the design
                    </Link>{" "}
                    to judge runs against it.
                  </p>
                )}
              </CardBody>
            </Card>
            <MeasuredVsPredicted run={run} drift={drift} />
          </div>
          <HarmonicsTable figures={figures} limitDbc={limitDbc} />
        </>
      ) : null}

      <Metadata run={run} figures={figures} context={context} />
    </div>
  );
}

function StatusBanner({ run, refreshError, canReanalyse }: { run: RunData; refreshError: string | null; canReanalyse: boolean }) {
  if (run.status === "queued" || run.status === "running") {
    return (
      <div role="status" className="flex items-start gap-3 rounded-lg border border-rule bg-paper-raised px-4 py-3">
        <span aria-hidden="true" className="mt-1 inline-block h-3 w-3 shrink-0 animate-pulse rounded-full bg-copper" />
        <div className="text-sm">
          <p className="font-medium text-ink">
            {run.status === "queued" ? "Queued: waiting for an analysis worker." : "Analysing the capture…"}
          </p>
          <p className="text-ink-soft">This page updates by itself when the figures are ready.</p>
          {refreshError ? <p className="mt-1 text-verdict-fail">Could not check for news: {refreshError}</p> : null}
        </div>
      </div>
    );
  }
  if (run.status === "failed") {
    return (
      <div role="alert" className="rounded-lg border border-verdict-warn/50 bg-verdict-warnBg px-4 py-3 text-sm">
        <p className="font-semibold text-ink">
          <span aria-hidden="true" className="mr-1 text-verdict-warn">!</span>
          The analysis could not read this capture.
        </p>
        <p className="num mt-1 break-words font-mono text-[13px] text-ink">{run.error ?? "No message was recorded."}</p>
        <p className="mt-2 text-ink-soft">
          The raw file is kept unchanged. Fix the export on the scope and upload it again
          {canReanalyse ? ", or re-analyse it after the engine has been updated" : ""}.
        </p>
      </div>
    );
  }
  return null;
}

function ChartPlaceholder({ loading, error }: { loading: boolean; error: boolean }) {
  return (
    <div className="flex h-[260px] items-center justify-center rounded-md border border-dashed border-rule bg-paper text-sm text-ink-faint">
      {error ? "The plot data could not be loaded. Reload the page to try again." : loading ? "Loading the plot…" : "No plot data for this run."}
    </div>
  );
}

function HeadlineMetrics({ run, figures, drift }: { run: RunData; figures: RunFigures; drift: DriftAnalysis | null }) {
  const f = formatWithUncertainty(figures.frequencyHz, figures.frequencyUncertaintyHz, "Hz");
  const driftPpm = drift?.ppm ?? run.driftPpm;
  const d = formatDriftLeading(driftPpm);
  const thd = formatThd(figures.thdPercent === null ? null : figures.thdPercent / 100);
  const amplitudeDbv = figures.fundamentalVpk ? 20 * Math.log10(figures.fundamentalVpk / Math.SQRT2) : null;
  return (
    <dl className="grid grid-cols-2 gap-3 lg:grid-cols-4">
      <MetricTile label="Measured frequency" value={f.value} detail={f.uncertainty || "uncertainty not given"} className="col-span-2 lg:col-span-1" />
      <MetricTile
        label="Drift vs predicted"
        value={d.main}
        detail={d.detail}
        note={run.snapshot.predictedHz ? `Predicted ${formatQuantity(run.snapshot.predictedHz, "Hz", 6)}` : "No prediction for these values"}
      />
      <MetricTile label="THD" value={thd.percent} detail={thd.db} note={figures.sinadDb !== null ? `SINAD ${formatDecibels(figures.sinadDb)}` : undefined} />
      <MetricTile
        label="Fundamental amplitude"
        value={formatQuantity(figures.fundamentalVpk, "V", 4)}
        detail={amplitudeDbv === null ? "peak" : `peak · ${formatDecibels(amplitudeDbv, "dBV")}`}
        note={run.probeAttenuation !== 1 ? `Volts scaled ×${run.probeAttenuation} for the probe` : undefined}
      />
    </dl>
  );
}

function MeasuredVsPredicted({ run, drift }: { run: RunData; drift: DriftAnalysis | null }) {
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

function HarmonicsTable({ figures, limitDbc }: { figures: RunFigures; limitDbc: number | null | undefined }) {
  if (figures.harmonics.length === 0) return null;
  return (
    <section aria-labelledby="harmonics-heading" className="space-y-2">
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
          {figures.harmonics.map((h) => {
            const over = typeof limitDbc === "number" && h.dBc !== null ? h.dBc > limitDbc : null;
            return (
              <Tr key={h.order}>
                <Td>{h.order}</Td>
                <Td numeric className="whitespace-nowrap">{formatQuantity(h.frequencyHz, "Hz", 5)}</Td>
                <Td numeric className="hidden whitespace-nowrap sm:table-cell">{formatQuantity(h.amplitudeVpk, "V", 3)}</Td>
                <Td numeric className="whitespace-nowrap">{formatDecibels(h.dBc, "dBc")}</Td>
                {typeof limitDbc === "number" ? (
                  <Td>
                    {over === null ? (
                      DASH
                    ) : (
                      <VerdictBadge
                        className="whitespace-nowrap"
                        verdict={over ? "fail" : "pass"}
                        label={`${over ? "Over" : "Under"} by ${Math.abs((h.dBc as number) - limitDbc).toFixed(1)} dB`}
                      />
                    )}
                  </Td>
                ) : null}
              </Tr>
            );
          })}
        </tbody>
      </Table>
    </section>
  );
}

function Metadata({ run, figures, context }: { run: RunData; figures: RunFigures; context: RunContext }) {
  const durationS = figures.samples !== null && figures.sampleRateHz ? figures.samples / figures.sampleRateHz : null;
  const rows: Array<[string, string]> = [
    ["File", run.originalFilename],
    ["Size", formatBytes(run.sizeBytes)],
    ["SHA-256", run.sha256],
    ["Channel", run.channel ?? "first voltage column"],
    ["Probe attenuation", `×${run.probeAttenuation}`],
    ["Supply", run.supplyV === null ? DASH : formatQuantity(run.supplyV, "V", 3, { trimZeros: true })],
    ["Temperature", run.temperatureC === null ? DASH : `${run.temperatureC} °C`],
  ];
  // Figures of the record itself exist only once it has been read.
  if (run.status === "done") {
    rows.push(
      ["Sample rate", formatQuantity(figures.sampleRateHz, "Sa/s", 4, { trimZeros: true })],
      ["Samples", figures.samples === null ? DASH : figures.samples.toLocaleString("en-GB")],
      ["Record length", durationS === null ? DASH : formatQuantity(durationS, "s", 4)],
      ["In-record drift", formatPpm(run.inRecordDriftPpm ?? figures.inRecordDriftPpm)],
    );
  }
  rows.push(["Uploaded", `${formatDateTime(run.createdAt)} by ${run.createdByName}`]);
  if (run.finishedAt) rows.push([run.status === "failed" ? "Tried" : "Analysed", formatDateTime(run.finishedAt, { seconds: true })]);
  if (run.engineVersion) rows.push(["Engine version", run.engineVersion]);
  if (typeof run.attempts === "number" && run.attempts > 1) rows.push(["Analysis attempts", String(run.attempts)]);
  const parts = Object.entries(run.snapshot.parts);
  const preamble = Object.entries(figures.metadata);
  return (
    <div className="grid gap-5 lg:grid-cols-2">
      <Card>
        <CardHeader title="Capture" />
        <CardBody>
          {run.note ? <p className="mb-3 whitespace-pre-wrap text-sm text-ink">{run.note}</p> : null}
          <dl className="grid grid-cols-[auto_1fr] gap-x-4 gap-y-1 text-sm">
            {rows.map(([k, v]) => (
              <div key={k} className="contents">
                <dt className="text-ink-soft">{k}</dt>
                <dd className={`num min-w-0 text-right font-mono text-[13px] text-ink ${k === "SHA-256" || k === "File" ? "break-all" : "break-words"}`}>{v}</dd>
              </div>
            ))}
          </dl>
        </CardBody>
      </Card>
      <div className="space-y-5">
        <Card>
          <CardHeader
            title="As built at capture"
            description={
              <>
                Snapshot of <Link className="underline underline-offset-2" href={`/builds/${context.buildId}`}>{context.buildLabel}</Link>,
                design revision {run.snapshot.designRevision} ({run.snapshot.topology}).
              </>
            }
          />
          <CardBody>
            <dl className="grid grid-cols-[auto_1fr] gap-x-4 gap-y-1 text-sm">
              {parts.map(([ref, part]) => (
                <div key={ref} className="contents">
                  <dt className="font-mono text-ink-soft">{ref}</dt>
                  <dd className="num text-right font-mono text-[13px] text-ink">
                    {formatPartValue(part.valueSi, partUnitOrBlank(run.snapshot.topology, ref))}
                    {part.tolerance ? <span className="text-ink-faint"> ± {formatPercent(part.tolerance * 100, 2)}</span> : null}
                  </dd>
                </div>
              ))}
              {run.snapshot.extraCapacitanceF ? (
                <div className="contents">
                  <dt className="text-ink-soft">Extra C</dt>
                  <dd className="num text-right font-mono text-[13px] text-ink">{formatPartValue(run.snapshot.extraCapacitanceF, "F")}</dd>
                </div>
              ) : null}
            </dl>
          </CardBody>
        </Card>
        <Card>
          <CardHeader title="Preamble" description="Lines the scope wrote before the header row, as found in the file." />
          <CardBody>
            {preamble.length === 0 ? (
              <p className="text-sm text-ink-soft">{run.status === "done" ? "The file has no preamble." : "Shown once the capture is analysed."}</p>
            ) : (
              <dl className="grid grid-cols-[auto_1fr] gap-x-4 gap-y-1 text-sm">
                {preamble.map(([k, v]) => (
                  <div key={k} className="contents">
                    <dt className="break-all text-ink-soft">{k}</dt>
                    <dd className="break-all text-right font-mono text-[13px] text-ink">{v}</dd>
                  </div>
                ))}
              </dl>
            )}
          </CardBody>
        </Card>
      </div>
    </div>
  );
}
