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
import { FormMessage } from "@/components/ui/field";
import { VerdictBadge, type Verdict } from "@/components/ui/verdict-badge";
import { formatDateTime } from "@/lib/format/dates";
import { formatQuantity } from "@/lib/format/numbers";
import { analyseDrift, type DriftAnalysis } from "@/lib/oscillator/drift";
import type { OscillatorDesign } from "@/lib/oscillator/design";
import { evaluateSpec } from "@/lib/spec/evaluate";
import type { SpecEvaluation } from "@/lib/spec/types";
import { MetricsSkeleton } from "./skeletons";
import { CaptureDetails } from "./run-capture-details";
import { HeadlineMetrics, MeasuredVsPredicted } from "./run-figure-cards";
import { HarmonicsTable, SpursTable } from "./run-harmonics";
import { runFigures, specMeasurements } from "./run-results";
import type { RunContext, RunData, RunPlot } from "./run-types";
import { SpecVerdictList } from "./spec-verdict-list";
import { StabilityCard } from "./stability/stability-card";
import { readStability, waveformEnvelopeOf } from "./stability/read-stability";
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
  if (run.verdict === "inconclusive") return "inconclusive";
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
  const stability = useMemo(() => readStability(run.results), [run.results]);
  const waveformEnvelope = useMemo(() => waveformEnvelopeOf(stability, run.results), [stability, run.results]);
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
          <HeadlineMetrics run={run} figures={figures} drift={drift} timebasePpm={context.timebasePpm} />
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
                  <WaveformChart
                    timeS={plot.waveform.timeS}
                    minV={plot.waveform.minV}
                    maxV={plot.waveform.maxV}
                    channel={run.channel ?? undefined}
                    sampleRateHz={figures.sampleRateHz}
                    excerptUrl={`/api/v1/runs/${runId}/excerpt`}
                    envelope={waveformEnvelope}
                  />
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
          <div className="grid gap-5 lg:grid-cols-2">
            <HarmonicsTable figures={figures} limitDbc={limitDbc} />
            <SpursTable spurs={figures.spurs} />
          </div>
          <StabilityCard reading={stability} />
        </>
      ) : null}

      <CaptureDetails run={run} figures={figures} context={context} />
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

