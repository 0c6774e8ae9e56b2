import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { cache, type ReactNode } from "react";
import { BUILD_KIND_NAMES } from "@/components/logbook/build-status";
import { designOfRevision, specPhrases, TOPOLOGY_NAMES } from "@/components/logbook/design-model";
import { PartsTable } from "@/components/logbook/parts-table";
import { PredictionPanel } from "@/components/logbook/prediction-panel";
import { isRowId } from "@/components/logbook/route-ids";
import { TweakText, tweakLabel } from "@/components/logbook/tweak-label";
import { BuildTimelineChart } from "@/components/charts/build-timeline-chart";
import { HarmonicsTrendChart } from "@/components/charts/harmonics-trend-chart";
import { loadBuildReview } from "@/components/review/build-review-data";
import { SignOffStatus } from "@/components/review/build-review-panels";
import { BuildStateBadge } from "@/components/review/build-state-badge";
import { FlagsList } from "@/components/review/flags-list";
import { ImpliedCapacitancePanel } from "@/components/review/implied-capacitance-panel";
import { PrintButton } from "@/components/review/print-button";
import { ReportRunsTable } from "@/components/review/report-runs-table";
import { SensitivityReportSection } from "@/components/logbook/sensitivity/sensitivity-report-section";
import { getBuild } from "@/db/queries/builds";
import { getDesign, getDesignRevision } from "@/db/queries/designs";
import { listRuns } from "@/db/queries/runs";
import { requireUser } from "@/lib/auth/current-user";
import { formatDateTime } from "@/lib/format/dates";
import { buildDesignReport, type DesignReport } from "@/lib/oscillator/report";

type Props = { params: Promise<{ buildId: string }> };

// The title and the page read the same build: one query per request, not two.
const loadBuild = cache(getBuild);

export async function generateMetadata({ params }: Props): Promise<Metadata> {
  const { buildId } = await params;
  const build = isRowId(buildId) ? await loadBuild(buildId) : null;
  return { title: build ? `Report — build ${build.label}` : "Build report" };
}

/** A numbered section that keeps its heading with its first lines on paper. */
function Section({ n, title, children, description }: { n: number; title: string; description?: ReactNode; children: ReactNode }) {
  return (
    <section aria-labelledby={`report-s${n}`} className="space-y-2 border-t border-rule pt-4 print:break-inside-auto">
      <div className="break-after-avoid">
        <h2 id={`report-s${n}`} className="text-base font-semibold text-ink">
          <span className="num mr-2 font-mono text-ink-faint">{n}</span>
          {title}
        </h2>
        {description ? <p className="text-xs text-ink-soft">{description}</p> : null}
      </div>
      {children}
    </section>
  );
}

// A4 portrait with narrow margins; the page column is as wide as the printable area, so the charts need no scaling.
const PRINT_CSS = `@page { size: A4 portrait; margin: 12mm; }
@media print {
  main#main { max-width: none; padding: 0; }
  footer { margin-top: 1.5rem; }
  a { color: inherit; text-decoration: none; }
}`;

export default async function BuildReportPage({ params }: Props) {
  const { buildId } = await params;
  const user = await requireUser(`/builds/${buildId}/report`);
  if (!isRowId(buildId)) notFound();
  const build = await loadBuild(buildId);
  if (!build) notFound();
  const [design, builtFrom, runsPage] = await Promise.all([getDesign(build.designId), getDesignRevision(build.designRevisionId), listRuns(buildId, { limit: 200 })]);
  if (!design) notFound();
  const topology = design.topology;
  const data = await loadBuildReview(user, build, topology);
  const rev = builtFrom ?? design.revision;

  let report: DesignReport | null = null;
  let predictionError: string | null = null;
  try {
    report = buildDesignReport(designOfRevision(topology, { parts: build.asBuilt, extraCapacitanceF: design.revision.extraCapacitanceF, windings: design.revision.windings }));
  } catch (err) {
    predictionError = err instanceof Error ? err.message : "The model refused these values.";
  }

  const runs = [...runsPage.items].reverse();
  const appliedTweaks = data.tweaks.filter((t) => !t.planned).length;
  const tweakText = Object.fromEntries(data.tweaks.map((t) => [t.id, tweakLabel(t, topology)]));
  const chartIndex = Object.fromEntries(data.series.runs.map((r) => [r.id, r.index]));
  const runNames = Object.fromEntries(runs.map((r) => [r.id, r.originalFilename]));
  const spec = specPhrases(rev.spec);
  const measured = data.series.runs.some((r) => r.measuredHz !== null);

  return (
    <article className="mx-auto max-w-[44rem] space-y-5 print:max-w-none" style={{ printColorAdjust: "exact", WebkitPrintColorAdjust: "exact" }}>
      <style>{PRINT_CSS}</style>
      <div className="no-print flex flex-wrap items-center justify-between gap-3">
        <Link href={`/builds/${buildId}`} className="text-sm font-medium text-ink-soft underline underline-offset-2 hover:text-ink">
          ← Back to the build
        </Link>
        <PrintButton />
      </div>

      <header className="space-y-1">
        <p className="text-xs font-medium uppercase tracking-wide text-ink-faint">Build report</p>
        <h1 className="flex flex-wrap items-center gap-3 text-2xl font-semibold tracking-tight">
          {build.label}
          {data.row ? <BuildStateBadge state={data.row.state} className="text-sm" /> : null}
        </h1>
        <p className="text-sm text-ink-soft">
          {BUILD_KIND_NAMES[build.kind] ?? build.kind}
          {build.kindRevision ? ` ${build.kindRevision}` : ""} of <strong className="font-medium text-ink">{build.designName}</strong> ({TOPOLOGY_NAMES[topology]}, built from
          revision {rev.revision}) in {build.projectName} · built by {build.builtByName}, {formatDateTime(build.createdAt)}
        </p>
        <p className="text-xs text-ink-faint">
          {runs.length} {runs.length === 1 ? "run" : "runs"} · {appliedTweaks} {appliedTweaks === 1 ? "tweak" : "tweaks"} · printed from Tankbook{" "}
          <span className="num font-mono">{formatDateTime(new Date())}</span> by {user.name}
        </p>
      </header>

      <Section n={1} title="Design and spec" description={`Revision ${rev.revision}${rev.changeNote ? `: ${rev.changeNote}` : ""}`}>
        {spec.length > 0 ? (
          <ul className="flex flex-wrap gap-x-4 gap-y-0.5 text-sm text-ink">
            {spec.map((p) => (
              <li key={p} className="num font-mono text-[13px]">
                {p}
              </li>
            ))}
          </ul>
        ) : (
          <p className="text-sm text-ink-soft">The design sets no spec limits, so no run can pass or fail.</p>
        )}
      </Section>

      <Section n={2} title="As built" description="The design's values changed by every applied tweak; ● marks a part that differs from the design.">
        <PartsTable topology={topology} parts={build.asBuilt} compareWith={rev.parts} caption={`As-built parts of ${build.label}`} />
      </Section>

      <Section n={3} title="Prediction and bands" description="For the as-built values, from the tolerance of every part.">
        {report ? <PredictionPanel report={report} /> : <p className="text-sm text-verdict-fail">{predictionError}</p>}
      </Section>

      <Section n={4} title="Drift over tweaks" description="Measured against predicted at each analysed run, with the bands, the spec and the tweaks (T).">
        {measured ? (
          <div className="space-y-5">
            <div className="print:break-inside-avoid">
              <BuildTimelineChart series={data.series} height={280} />
            </div>
            <div className="print:break-inside-avoid">
              <HarmonicsTrendChart series={data.series} height={200} />
            </div>
          </div>
        ) : (
          <p className="text-sm text-ink-soft">No analysed run with a measured frequency yet.</p>
        )}
      </Section>

      <Section n={5} title="Implied extra capacitance">
        <ImpliedCapacitancePanel rows={data.implied} trend={data.trend} latestExplanation={data.latestExplanation} latestSignPhrase={data.latestSignPhrase} />
      </Section>

      <Section n={6} title="Sensitivity" description="Pushing and temperature coefficient of the build as it stands, and how well repeated runs agree.">
        <SensitivityReportSection report={data.sensitivity} />
      </Section>

      <Section n={7} title="Runs" description={runsPage.nextCursor ? "The newest 200 runs; the CSV export has them all." : undefined}>
        {runs.length > 0 ? <ReportRunsTable runs={runs} tweakText={tweakText} chartIndex={chartIndex} /> : <p className="text-sm text-ink-soft">No captures uploaded.</p>}
      </Section>

      <Section n={8} title="Tweaks">
        {data.tweaks.length > 0 ? (
          <ol className="space-y-1 text-sm">
            {data.tweaks.map((t) => (
              <li key={t.id} className="flex flex-wrap gap-x-2">
                <span className="num font-mono text-[12px] text-ink-soft">{formatDateTime(t.createdAt)}</span>
                {t.planned ? <span className="text-xs font-semibold text-ink-soft">planned</span> : null}
                <TweakText tweak={t} topology={topology} />
                <span className="text-ink-faint">· {t.createdByName}</span>
              </li>
            ))}
          </ol>
        ) : (
          <p className="text-sm text-ink-soft">No tweaks logged: every run is of the build as first made.</p>
        )}
      </Section>

      <Section n={9} title="Flags">
        <FlagsList flags={data.flags} runNames={runNames} compact />
      </Section>

      <Section n={10} title="Sign-off">
        <SignOffStatus build={build} reason={data.signOff?.reason ?? null} />
      </Section>
    </article>
  );
}
