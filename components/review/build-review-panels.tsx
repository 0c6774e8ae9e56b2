import Link from "next/link";
import { BuildTimelineChart } from "@/components/charts/build-timeline-chart";
import { HarmonicsTrendChart } from "@/components/charts/harmonics-trend-chart";
import { buttonVariants } from "@/components/ui/button";
import { Card, CardBody, CardHeader } from "@/components/ui/card";
import { EmptyState } from "@/components/ui/empty-state";
import type { Build } from "@/db/queries/builds";
import type { CurrentUser } from "@/lib/auth/current-user-type";
import { can } from "@/lib/auth/permissions";
import { E_SERIES_NAMES, type ESeriesName } from "@/lib/oscillator/e-series";
import { formatDateTime } from "@/lib/format/dates";
import {
  acknowledgeFlagAction,
  followBuildAction,
  followProjectAction,
  planRetuneTweakAction,
  signOffBuildAction,
} from "@/app/(app)/builds/[buildId]/review-actions";
import { chooseRetuneAimAction } from "@/app/(app)/layouts/actions";
import type { BuildReviewData } from "./build-review-data";
import { RunsCsvLink, type RunsCsvFilters } from "./export-links";
import { FlagsList } from "./flags-list";
import { FollowButton } from "./follow-button";
import { ImpliedCapacitancePanel } from "./implied-capacitance-panel";
import { RetuneCard } from "./retune-card";
import { SignOffForm } from "./sign-off-form";

// The build page's issue-7 panels, each a card the page places in its grid; the report reuses the charts and lists.

const FOLLOW_REASON = { build: "you follow it", project: "you follow its project", maker: "you created or built it" } as const;

/** The drift story: the timeline chart and the distortion chart, or what to do when there is nothing to plot. */
export function DriftStoryCard({ data, canUpload }: { data: BuildReviewData; canUpload: boolean }) {
  const measured = data.series.runs.filter((r) => r.measuredHz !== null).length;
  return (
    <Card>
      <CardHeader
        title="Drift over tweaks"
        description="Each analysed run against its prediction and bands; T markers are the tweaks (hover or focus them to read what changed)."
      />
      <CardBody className="space-y-6">
        {measured === 0 ? (
          <EmptyState title="Nothing to plot yet">
            {canUpload
              ? "Upload a capture of this build: its measured frequency appears here against the prediction, and every later tweak shows where it moved."
              : "Once a technician uploads a capture, its measured frequency appears here against the prediction."}
          </EmptyState>
        ) : (
          <>
            <BuildTimelineChart series={data.series} />
            <div>
              <h3 className="mb-1 text-sm font-semibold text-ink">Distortion per run</h3>
              <HarmonicsTrendChart series={data.series} />
            </div>
            {data.runsLeftOut ? <p className="text-xs text-ink-faint">The charts show the newest {data.series.runs.length} analysed runs.</p> : null}
          </>
        )}
      </CardBody>
    </Card>
  );
}

export function ImpliedCapacitanceCard({ data, limit = 8 }: { data: BuildReviewData; limit?: number }) {
  return (
    <Card>
      <CardHeader title="Implied extra capacitance" description="The capacitance across the tank that would move the prediction onto each measurement." />
      <CardBody>
        <ImpliedCapacitancePanel rows={data.implied} trend={data.trend} latestExplanation={data.latestExplanation} latestSignPhrase={data.latestSignPhrase} limit={limit} />
      </CardBody>
    </Card>
  );
}

/** The retune suggestion with its series links (the page passes its own path so the links keep the other filters). */
export function RetuneSuggestionCard({
  data,
  user,
  buildId,
  series,
  hrefForSeries,
}: {
  data: BuildReviewData;
  user: CurrentUser;
  buildId: string;
  series: ESeriesName;
  hrefForSeries: (series: ESeriesName) => string;
}) {
  const r = data.retune;
  const view = r ? (({ design: _design, ...rest }) => rest)(r.suggestion) : null;
  const links = (["E6", "E12", "E24", "E48", "E96"] as ESeriesName[])
    .filter((s) => E_SERIES_NAMES.includes(s))
    .map((s) => ({ series: s, href: hrefForSeries(s), current: s === series }));
  return (
    <Card>
      <CardHeader title="Next tweak" description="The single standard-value change that lands nearest the target." />
      <CardBody>
        <RetuneCard
          suggestion={view}
          run={r ? { ...r.run, createdAt: new Date(r.run.createdAt).toISOString() } : null}
          error={data.retuneError}
          plan={can(user.role, "tweak:create") ? planRetuneTweakAction.bind(null, buildId) : undefined}
          seriesLinks={links}
          trustWarnings={r?.trustWarnings ?? []}
          aim={{
            value: data.retuneAim.aim,
            constructionName: data.retuneAim.constructionName,
            fallbackReason: data.retuneAim.fallbackReason,
            choose: chooseRetuneAimAction.bind(null, buildId),
          }}
        />
      </CardBody>
    </Card>
  );
}

export function FlagsCard({ data, user, buildId, runNames }: { data: BuildReviewData; user: CurrentUser; buildId: string; runNames: Record<string, string> }) {
  const open = data.flags.filter((f) => f.acknowledgedAt === null).length;
  return (
    <Card>
      <CardHeader
        title={`Flags${data.flags.length > 0 ? ` (${open} open of ${data.flags.length})` : ""}`}
        description="Each broken spec rule of each run: measured, limit and margin."
      />
      <CardBody>
        <FlagsList flags={data.flags} runNames={runNames} limit={4} acknowledge={can(user.role, "flag:acknowledge") ? acknowledgeFlagAction.bind(null, buildId) : undefined} />
      </CardBody>
    </Card>
  );
}

/** The sign-off as it stands, and the form for engineers and admins. */
export function SignOffCard({ data, user, build }: { data: BuildReviewData; user: CurrentUser; build: Build }) {
  const latest = data.row?.latestRun ?? null;
  const latestName = latest ? (data.series.runs.find((r) => r.id === latest.id)?.originalFilename ?? null) : null;
  return (
    <Card>
      <CardHeader title="Sign-off" />
      <CardBody className="space-y-3">
        <SignOffStatus build={build} reason={data.signOff?.reason ?? null} />
        {can(user.role, "build:review") ? (
          <SignOffForm action={signOffBuildAction.bind(null, build.id)} status={build.status} flaggedRules={data.latestFlaggedRules} latestRunName={latestName} />
        ) : (
          <p className="text-xs text-ink-faint">Engineers and admins accept or reject builds.</p>
        )}
      </CardBody>
    </Card>
  );
}

/** Who signed the build off, when, with the comment and the reason for a flagged acceptance. */
export function SignOffStatus({ build, reason }: { build: Build; reason: string | null }) {
  if (build.status === "open") {
    return <p className="text-sm text-ink-soft">Open: not signed off yet.</p>;
  }
  const accepted = build.status === "accepted";
  return (
    <div className="space-y-1 text-sm">
      <p className="font-medium text-ink">
        <span aria-hidden="true" className={accepted ? "text-verdict-pass" : "text-verdict-fail"}>
          {accepted ? "✓ " : "✕ "}
        </span>
        {accepted ? "Accepted" : "Rejected"}
        {build.reviewedByName ? ` by ${build.reviewedByName}` : ""}
        {build.reviewedAt ? `, ${formatDateTime(build.reviewedAt)}` : ""}
      </p>
      {build.reviewComment ? <p className="text-ink-soft">“{build.reviewComment}”</p> : null}
      {reason ? (
        <p className="rounded-md border border-verdict-warn/40 bg-verdict-warnBg px-2.5 py-1.5 text-ink">
          <strong className="font-semibold">Accepted with its latest run flagged.</strong> Reason: {reason}
        </p>
      ) : null}
    </div>
  );
}

/** Follow buttons and the links to the comparison, the report and the CSV export. */
export function BuildToolsBar({
  data,
  build,
  csvFilters,
}: {
  data: BuildReviewData;
  build: Build;
  csvFilters?: RunsCsvFilters;
}) {
  const analysed = data.series.runs;
  const compareHref =
    analysed.length >= 2 ? `/runs/compare?a=${analysed[analysed.length - 2].id}&b=${analysed[analysed.length - 1].id}` : null;
  const via = data.follow.via ? FOLLOW_REASON[data.follow.via] : null;
  return (
    <div className="flex flex-wrap items-start gap-x-4 gap-y-3">
      <FollowButton action={followBuildAction.bind(null, build.id)} target="build" following={data.follow.following} reason={via} />
      <FollowButton action={followProjectAction.bind(null, build.projectId)} target="project" following={data.followsProject} />
      <div className="flex flex-wrap gap-2">
        {compareHref ? (
          <Link href={compareHref} className={buttonVariants({ variant: "secondary", size: "sm" })}>
            Compare the last two runs
          </Link>
        ) : null}
        <Link href={`/builds/${build.id}/report`} className={buttonVariants({ variant: "secondary", size: "sm" })}>
          Printable report
        </Link>
        <RunsCsvLink buildId={build.id} filters={csvFilters} />
      </div>
    </div>
  );
}
