import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { Breadcrumbs, buildPlace, trailCrumbs } from "@/components/logbook/breadcrumbs";
import { isRowId } from "@/components/logbook/route-ids";
import { RunView } from "@/components/logbook/run-view";
import { RunWithdrawalCard } from "@/components/logbook/run-withdrawal";
import type { RunContext } from "@/components/logbook/run-types";
import { tweakLabel } from "@/components/logbook/tweak-label";
import { QueryProvider } from "@/components/providers/query-provider";
import { PageHeader } from "@/components/ui/page-header";
import { getBuild } from "@/db/queries/builds";
import { getTweak } from "@/db/queries/tweaks";
import { requireUser } from "@/lib/auth/current-user";
import { can } from "@/lib/auth/permissions";
import { formatDateTime } from "@/lib/format/dates";
import { getRunWithdrawal } from "@/lib/logbook/run-withdrawal";
import { reanalyseRunAction, restoreRunAction, withdrawRunAction } from "./actions";
import { loadRun } from "./load-run";

type Params = { params: Promise<{ runId: string }> };

// The title and the page read the same run: one query per request, not two.

export async function generateMetadata({ params }: Params): Promise<Metadata> {
  const { runId } = await params;
  const run = isRowId(runId) ? await loadRun(runId) : null;
  return { title: run ? `Run ${run.originalFilename}` : "Run" };
}

export default async function RunPage({ params }: Params) {
  const { runId } = await params;
  const user = await requireUser(`/runs/${runId}`);
  if (!isRowId(runId)) notFound();
  const run = await loadRun(runId);
  if (!run) notFound();
  const [build, tweak, withdrawal] = await Promise.all([
    getBuild(run.buildId),
    run.tweakId ? getTweak(run.tweakId) : null,
    run.withdrawnAt ? getRunWithdrawal(run.id) : null,
  ]);
  if (!build) notFound();

  const context: RunContext = {
    projectId: build.projectId,
    projectName: build.projectName,
    designId: build.designId,
    designName: build.designName,
    buildId: build.id,
    buildLabel: build.label,
    tweakLabel: tweak ? tweakLabel(tweak, run.snapshot.topology) : null,
    timebasePpm: build.timebasePpm,
  };

  // A withdrawn run says so above everything else; the control to withdraw one sits below the figures.
  const withdrawalCard = (
    <RunWithdrawalCard
      filename={run.originalFilename}
      withdrawal={withdrawal}
      canWithdraw={can(user.role, "run:withdraw")}
      withdraw={withdrawRunAction.bind(null, run.id)}
      restore={restoreRunAction.bind(null, run.id)}
    />
  );

  return (
    <>
      <PageHeader
        eyebrow={
          <Breadcrumbs
            items={trailCrumbs(buildPlace(build), "Run")}
          />
        }
        title={<span className="break-all">{run.originalFilename}</span>}
        description={`Run on build ${build.label}, logged ${formatDateTime(run.createdAt)}.`}
      />
      {withdrawal ? <div className="mb-6">{withdrawalCard}</div> : null}
      <QueryProvider>
        <RunView initialRun={run} context={context} canReanalyse={can(user.role, "run:reanalyse")} reanalyse={reanalyseRunAction} />
      </QueryProvider>
      {withdrawal ? null : <div className="mt-6">{withdrawalCard}</div>}
    </>
  );
}
