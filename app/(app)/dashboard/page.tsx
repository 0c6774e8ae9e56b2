import type { Metadata } from "next";
import Link from "next/link";
import type { ReactNode } from "react";
import { BuildsTableSection } from "@/components/builds-table/builds-table-section";
import { tableHref } from "@/components/builds-table/table-query";
import { AttentionList } from "@/components/dashboard/attention-list";
import { DashboardCounts } from "@/components/dashboard/dashboard-counts";
import { LatestRunsTable } from "@/components/dashboard/latest-runs-table";
import { MyBuildsList } from "@/components/dashboard/my-builds-list";
import { buttonVariants } from "@/components/ui/button";
import { EmptyState } from "@/components/ui/empty-state";
import { FormMessage } from "@/components/ui/field";
import { PageHeader } from "@/components/ui/page-header";
import { getDashboardCounts, listBuildsNeedingAttention, listLatestRuns, listMyBuilds } from "@/db/queries/dashboard";
import { requireUser } from "@/lib/auth/current-user";
import { can } from "@/lib/auth/permissions";

export const metadata: Metadata = { title: "Home" };

const welcome: Record<string, string> = {
  invited: "Your account is ready and you are signed in.",
  "password-reset": "Your new password is saved. Every other device was signed out.",
};

const roleLine: Record<string, string> = {
  viewer: "You can read every project, design, build and run.",
  technician: "You can create builds, log tweaks and upload captures.",
  engineer: "You can create projects, designs and specs, and accept or reject builds.",
  admin: "You can do everything, including inviting people and reading the audit log.",
};

// The all-builds table's keys carry a prefix so they never meet the welcome notice's parameter.
const TABLE_PREFIX = "b_";

function Section({ id, title, description, children }: { id: string; title: string; description?: string; children: ReactNode }) {
  return (
    <section aria-labelledby={`${id}-heading`} id={id} className="min-w-0 scroll-mt-4 space-y-2">
      <div>
        <h2 id={`${id}-heading`} className="text-base font-semibold text-ink">
          {title}
        </h2>
        {description ? <p className="text-xs text-ink-soft">{description}</p> : null}
      </div>
      {children}
    </section>
  );
}

export default async function DashboardPage({ searchParams }: { searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  const user = await requireUser("/dashboard");
  const params = await searchParams;
  const notice = typeof params.welcome === "string" ? welcome[params.welcome] : undefined;
  const firstName = user.name.split(" ")[0];
  const [counts, attention, latestRuns, mine] = await Promise.all([
    getDashboardCounts(),
    listBuildsNeedingAttention({ limit: 8 }),
    listLatestRuns({ limit: 10 }),
    listMyBuilds(user.id, { limit: 10 }),
  ]);
  const totalBuilds = Object.values(counts.buildsByState).reduce((s, n) => s + n, 0);
  const canProject = can(user.role, "project:write");
  const canUpload = can(user.role, "run:upload");
  // The table keeps the page's other parameters in its links; a one-time notice is not one of them.
  const { welcome: _notice, ...tableSearch } = params;

  const header = (
    <>
      {notice ? (
        <div className="mb-4">
          <FormMessage tone="success" message={notice} />
        </div>
      ) : null}
      <PageHeader
        title={`Hello, ${firstName}`}
        description={
          <>
            Signed in as <span className="font-medium text-ink">{user.role}</span>. {roleLine[user.role]}
          </>
        }
      />
    </>
  );

  if (totalBuilds === 0) {
    return (
      <>
        {header}
        <EmptyState
          title="No builds yet"
          action={
            <Link href="/projects" className={buttonVariants({ variant: canProject ? "primary" : "secondary" })}>
              Go to projects
            </Link>
          }
        >
          Builds needing attention, the latest runs and your own builds appear here once your team logs them.
          {canProject
            ? " Start with a project and a design, then a build of it."
            : can(user.role, "build:create")
              ? " Open a project's design and start a build of it."
              : " Open a project to find its designs and builds."}
        </EmptyState>
      </>
    );
  }

  return (
    <>
      {header}
      <div className="space-y-8">
        <DashboardCounts
          buildsByState={counts.buildsByState}
          needingAttention={counts.needingAttention}
          runsLast7Days={counts.runsLast7Days}
          stateHref={(states) => `${tableHref("/dashboard", {}, { state: states }, {}, TABLE_PREFIX)}#all-builds`}
        />

        <Section id="attention" title="Builds needing attention" description="Open builds whose latest analysed run is flagged, or measured outside the worst-case band of its prediction.">
          <AttentionList builds={attention} total={counts.needingAttention} />
        </Section>

        <div className="grid gap-8 xl:grid-cols-[minmax(0,3fr)_minmax(0,2fr)]">
          <Section id="latest-runs" title="Latest runs" description="Across every project, newest first; captures still analysing show too.">
            <LatestRunsTable
              runs={latestRuns}
              emptyHint={canUpload ? "Open a build and upload a capture: export the scope's record as CSV." : "Technicians upload captures from a build's page."}
            />
          </Section>
          <Section id="my-builds" title="My builds" description="Builds you made, built or follow.">
            {mine.length > 0 ? (
              <MyBuildsList builds={mine} />
            ) : (
              <EmptyState title="None of yours yet">
                Builds you start or build are yours; follow any other build or project from its page to see it here and get its flag e-mails.
              </EmptyState>
            )}
          </Section>
        </div>

        <Section id="all-builds" title="All builds" description="Every build with its state and latest numbers; sort by any column, filter by state.">
          <BuildsTableSection basePath="/dashboard" searchParams={tableSearch} prefix={TABLE_PREFIX} showProject caption="All builds" />
        </Section>
      </div>
    </>
  );
}
