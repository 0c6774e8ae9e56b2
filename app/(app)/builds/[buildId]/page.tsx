import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { AutoRefresh } from "@/components/logbook/auto-refresh";
import { Breadcrumbs, trailCrumbs } from "@/components/logbook/breadcrumbs";
import { BUILD_KIND_NAMES, buildBadge } from "@/components/logbook/build-status";
import { BuildTimeline, mergeTimeline } from "@/components/logbook/build-timeline";
import { designOfRevision, specPhrases, TOPOLOGY_NAMES } from "@/components/logbook/design-model";
import { PageNav } from "@/components/logbook/page-nav";
import { PartsTable } from "@/components/logbook/parts-table";
import { PredictionPanel } from "@/components/logbook/prediction-panel";
import { isRowId } from "@/components/logbook/route-ids";
import { tweakLabel } from "@/components/logbook/tweak-label";
import { Card, CardBody, CardHeader } from "@/components/ui/card";
import { EmptyState } from "@/components/ui/empty-state";
import { Select } from "@/components/ui/field";
import { PageHeader } from "@/components/ui/page-header";
import { VerdictBadge } from "@/components/ui/verdict-badge";
import { buttonVariants } from "@/components/ui/button";
import { getDesign, getDesignRevision } from "@/db/queries/designs";
import type { Page } from "@/db/queries/pagination";
import { listRuns, type RunSummary } from "@/db/queries/runs";
import { requireUser } from "@/lib/auth/current-user";
import { can } from "@/lib/auth/permissions";
import { BadRequestError } from "@/lib/errors";
import { formatDateTime } from "@/lib/format/dates";
import { buildDesignReport, type DesignReport } from "@/lib/oscillator/report";
import { loadBuildReview } from "@/components/review/build-review-data";
import { BuildToolsBar, DriftStoryCard, FlagsCard, ImpliedCapacitanceCard, RetuneSuggestionCard, SignOffCard } from "@/components/review/build-review-panels";
import { E_SERIES_NAMES, type ESeriesName } from "@/lib/oscillator/e-series";
import { CalibratedPredictionPanel } from "@/components/layouts/calibrated-prediction-panel";
import { buildCalibration } from "@/lib/logbook/layouts";
import { BrokenRulesNotice, groupFlagsByRule } from "@/components/review/broken-rules-notice";
import { applyPlannedTweakAction, setTimebaseAction } from "./actions";
import { TimebaseForm } from "@/components/logbook/timebase-form";
import { SensitivityCard } from "@/components/logbook/sensitivity/sensitivity-card";
import { BuildActions } from "./build-actions";
import { loadBuild } from "./load-build";

type Props = {
  params: Promise<{ buildId: string }>;
  searchParams: Promise<Record<string, string | string[] | undefined>>;
};

function one(value: string | string[] | undefined): string | undefined {
  const v = Array.isArray(value) ? value[0] : value;
  return v && v.trim() !== "" ? v.trim() : undefined;
}

const VERDICTS = ["pass", "fail", "inconclusive", "none"] as const;
const STATUSES = ["queued", "running", "done", "failed"] as const;


export async function generateMetadata({ params }: Props): Promise<Metadata> {
  const { buildId } = await params;
  const build = isRowId(buildId) ? await loadBuild(buildId) : null;
  return { title: build ? `Build ${build.label}` : "Build" };
}

export default async function BuildPage({ params, searchParams }: Props) {
  const { buildId } = await params;
  const user = await requireUser(`/builds/${buildId}`);
  if (!isRowId(buildId)) notFound();
  const search = await searchParams;
  const cursor = one(search.cursor);
  const verdictParam = one(search.verdict);
  const verdict = VERDICTS.find((v) => v === verdictParam);
  const statusParam = one(search.status);
  const status = STATUSES.find((s) => s === statusParam);
  const seriesParam = one(search.series);
  const series: ESeriesName = E_SERIES_NAMES.find((s) => s === seriesParam) ?? "E12";

  const build = await loadBuild(buildId);
  if (!build) notFound();
  const filter = { verdict, status, limit: 50 };
  let runs: Page<RunSummary>;
  const [design, builtFrom] = await Promise.all([getDesign(build.designId), getDesignRevision(build.designRevisionId)]);
  try {
    runs = await listRuns(buildId, { ...filter, cursor });
  } catch (err) {
    if (!(err instanceof BadRequestError)) throw err;
    runs = await listRuns(buildId, filter);
  }
  if (!design) notFound();

  const topology = design.topology;
  const rev = design.revision;
  const [review, calibration] = await Promise.all([loadBuildReview(user, build, topology, { series }), buildCalibration(user, build, design)]);
  const tweaks = review.tweaks;
  const flags = review.flags.filter((f) => f.acknowledgedAt === null);
  const asBuiltModel = designOfRevision(topology, { parts: build.asBuilt, extraCapacitanceF: rev.extraCapacitanceF, windings: rev.windings });
  let report: DesignReport | null = null;
  let predictionError: string | null = null;
  try {
    report = buildDesignReport(asBuiltModel);
  } catch (err) {
    predictionError = err instanceof Error ? err.message : "The model refused these values.";
  }

  // Tweaks shown beside this page of runs: those inside its time window (all of them on the newest page).
  const filtered = Boolean(verdict || status);
  const oldest = runs.items.length > 0 ? new Date(runs.items[runs.items.length - 1].createdAt).getTime() : null;
  const newest = runs.items.length > 0 ? new Date(runs.items[0].createdAt).getTime() : null;
  const windowTweaks = filtered
    ? []
    : tweaks.filter((t) => {
        const at = new Date(t.createdAt).getTime();
        return (runs.nextCursor === null || oldest === null || at >= oldest) && (!cursor || newest === null || at <= newest);
      });
  const items = mergeTimeline(runs.items, windowTweaks);
  const tweaksById = new Map(tweaks.map((t) => [t.id, t]));
  // The latest analysed run's broken rules are the build's state; older runs' open flags are history.
  const latestAnalysedId = review.latestAnalysedRun?.id ?? null;
  const currentFlags = flags.filter((f) => f.runId === latestAnalysedId);
  const olderFlagGroups = groupFlagsByRule(flags.filter((f) => f.runId !== latestAnalysedId));
  const latest = runs.items[0] ?? null;
  const badge = buildBadge(build.status, !filtered && !cursor ? latest : null);
  const analysing = runs.items.some((r) => r.status === "queued" || r.status === "running");

  const latestRunAt = latest && !filtered && !cursor ? new Date(latest.createdAt).getTime() : 0;
  const newestTweak = tweaks.filter((t) => !t.planned).at(-1);
  const defaultTweakId = newestTweak && new Date(newestTweak.createdAt).getTime() > latestRunAt ? newestTweak.id : null;
  const tweakChoices = [...tweaks]
    .filter((t) => !t.planned)
    .reverse()
    .map((t) => ({ id: t.id, label: `${formatDateTime(t.createdAt)} · ${tweakLabel(t, topology)}` }));

  const canTweak = can(user.role, "tweak:create");
  const canUpload = can(user.role, "run:upload");
  const base = `/builds/${buildId}`;

  return (
    <>
      <PageHeader
        eyebrow={
          <Breadcrumbs
            items={trailCrumbs(
              { projectId: build.projectId, projectName: build.projectName, designId: build.designId, designName: build.designName },
              build.label,
            )}
          />
        }
        title={
          <span className="flex flex-wrap items-center gap-3">
            {build.label}
            <VerdictBadge verdict={badge.verdict} label={badge.label} className="text-sm" />
          </span>
        }
        description={`${BUILD_KIND_NAMES[build.kind] ?? build.kind}${build.kindRevision ? ` ${build.kindRevision}` : ""} of ${build.designName} (${TOPOLOGY_NAMES[topology]}, built from revision ${builtFrom?.revision ?? "?"}) · built by ${build.builtByName} · ${formatDateTime(build.createdAt)}`}
      />
      {build.reviewComment ? (
        <p className="mb-4 rounded-md border border-rule bg-paper-raised px-3 py-2 text-sm text-ink-soft">
          <strong className="text-ink">{build.status === "accepted" ? "Accepted" : build.status === "rejected" ? "Rejected" : "Review"}</strong>
          {build.reviewedByName ? ` by ${build.reviewedByName}` : ""}
          {build.reviewedAt ? `, ${formatDateTime(build.reviewedAt)}` : ""}: {build.reviewComment}
        </p>
      ) : null}
      <BrokenRulesNotice current={currentFlags} older={olderFlagGroups} latestRun={review.latestAnalysedRun} />

      <div className="mb-5">
        <BuildToolsBar data={review} build={build} csvFilters={{ verdict, status }} />
      </div>

      {/* Phones read actions, then the story, then the details; wide screens put the story beside both. */}
      <div className="grid gap-5 lg:grid-cols-[minmax(0,1fr)_24rem] lg:grid-rows-[auto_1fr] lg:items-start">
        {canTweak || canUpload ? (
          <div className="min-w-0 space-y-5 lg:col-start-2 lg:row-start-1">
            <BuildActions
              buildId={buildId}
              canTweak={canTweak}
              canUpload={canUpload}
              topology={topology}
              asBuilt={build.asBuilt}
              extraCapacitanceF={rev.extraCapacitanceF}
              windings={rev.windings}
              tweaks={tweakChoices}
              defaultTweakId={defaultTweakId}
            />
          </div>
        ) : null}
        <div className="min-w-0 space-y-3 lg:col-start-1 lg:row-span-2 lg:row-start-1">
          <div className="mb-5">
            <DriftStoryCard data={review} canUpload={canUpload} />
          </div>
          <div className="flex flex-wrap items-end justify-between gap-2">
            <h2 className="text-base font-semibold text-ink">Runs and tweaks</h2>
            <form action={base} method="get" className="flex flex-wrap items-center gap-2" aria-label="Filter runs">
              <label htmlFor="run-verdict" className="sr-only">
                Verdict
              </label>
              <div className="w-36">
              <Select id="run-verdict" name="verdict" defaultValue={verdict ?? ""}>
                <option value="">Any verdict</option>
                <option value="pass">Pass</option>
                <option value="fail">Fail</option>
                <option value="inconclusive">Cannot judge</option>
                <option value="none">No verdict</option>
              </Select>
              </div>
              <label htmlFor="run-status" className="sr-only">
                Analysis status
              </label>
              <div className="w-36">
              <Select id="run-status" name="status" defaultValue={status ?? ""}>
                <option value="">Any status</option>
                <option value="done">Analysed</option>
                <option value="queued">Queued</option>
                <option value="running">Running</option>
                <option value="failed">Failed</option>
              </Select>
              </div>
              <button type="submit" className={buttonVariants({ variant: "secondary", size: "sm" })}>
                Filter
              </button>
            </form>
          </div>
          <AutoRefresh active={analysing} />
          {items.length === 0 ? (
            filtered ? (
              <EmptyState title="No run matches these filters">
                <Link className="text-copper underline" href={base}>
                  Show every run
                </Link>
                .
              </EmptyState>
            ) : (
              <EmptyState title="No captures yet">
                {canUpload
                  ? "Upload the first capture of this build: export the scope's record as CSV and drop it in the upload form."
                  : "Technicians upload a capture after each tweak; each run shows what it measured and how far it is from the prediction."}
              </EmptyState>
            )
          ) : (
            <>
              <BuildTimeline
                items={items}
                topology={topology}
                tweaksById={tweaksById}
                applyTweak={canTweak ? applyPlannedTweakAction.bind(null, build.id) : undefined}
              />
              <PageNav basePath={base} params={{ verdict, status }} nextCursor={runs.nextCursor} hasCursor={Boolean(cursor)} shown={runs.items.length} noun="runs" />
            </>
          )}
          <div className="pt-2">
            <ImpliedCapacitanceCard data={review} />
          </div>
          <div className="pt-2">
            <SensitivityCard report={review.sensitivity} canUpload={canUpload} />
          </div>
        </div>

        <div className={`min-w-0 space-y-5 lg:col-start-2 ${canTweak || canUpload ? "lg:row-start-2" : "lg:row-start-1"}`}>
          <RetuneSuggestionCard
            data={review}
            user={user}
            buildId={buildId}
            series={series}
            hrefForSeries={(s) => `${base}?${new URLSearchParams({ ...(verdict ? { verdict } : {}), ...(status ? { status } : {}), series: s })}`}
          />
          <SignOffCard data={review} user={user} build={build} />
          <div id="flags" className="scroll-mt-4">
            <FlagsCard data={review} user={user} buildId={buildId} runNames={Object.fromEntries(review.series.runs.map((r) => [r.id, r.originalFilename]))} />
          </div>
          <section aria-labelledby="as-built-heading" className="space-y-1.5">
            <h2 id="as-built-heading" className="text-sm font-semibold text-ink">
              As built now
            </h2>
            <p className="text-xs text-ink-soft">The design&apos;s values, changed by every applied tweak; ● marks a changed part.</p>
            <PartsTable compact topology={topology} parts={build.asBuilt} compareWith={builtFrom?.parts ?? rev.parts} caption={`As-built parts of ${build.label}`} />
          </section>
          <Card>
            <CardHeader title="Prediction for the as-built values" />
            <CardBody>{report ? <PredictionPanel report={report} /> : <p className="text-sm text-verdict-fail">{predictionError}</p>}</CardBody>
          </Card>
          <Card>
            <CardHeader title="As it will likely measure on this construction" description="The as-built values with the lab's figure for this kind of build." />
            <CardBody>
              <CalibratedPredictionPanel view={calibration} />
            </CardBody>
          </Card>
          {specPhrases(rev.spec).length > 0 ? (
            <p className="text-xs text-ink-soft">
              Spec (revision {rev.revision}): {specPhrases(rev.spec).join(" · ")}
            </p>
          ) : null}
          <Card>
            <CardHeader title="Scope timebase" description="Part of every absolute frequency's uncertainty that no capture can show." />
            <CardBody>
              {canUpload ? (
                <TimebaseForm action={setTimebaseAction.bind(null, buildId)} timebasePpm={build.timebasePpm} />
              ) : (
                <p className="text-sm text-ink-soft">{build.timebasePpm === null ? "Not entered." : `±${build.timebasePpm} ppm.`}</p>
              )}
            </CardBody>
          </Card>
        </div>
      </div>
    </>
  );
}
