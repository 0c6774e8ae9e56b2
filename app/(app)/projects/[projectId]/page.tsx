import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { cache } from "react";
import { Breadcrumbs } from "@/components/logbook/breadcrumbs";
import { designOfRevision, predictedHzOf, specPhrases, TOPOLOGY_NAMES } from "@/components/logbook/design-model";
import { PageNav } from "@/components/logbook/page-nav";
import { isRowId } from "@/components/logbook/route-ids";
import { SearchForm } from "@/components/logbook/search-form";
import { SortableTable, type SortableRow } from "@/components/logbook/sortable-table";
import { buttonVariants } from "@/components/ui/button";
import { EmptyState } from "@/components/ui/empty-state";
import { TopologyFilterSelect } from "@/components/logbook/topology-filter-select";
import { PageHeader } from "@/components/ui/page-header";
import { listDesigns, type DesignSummary } from "@/db/queries/designs";
import type { Page } from "@/db/queries/pagination";
import { getProject } from "@/db/queries/projects";
import { requireUser } from "@/lib/auth/current-user";
import { can } from "@/lib/auth/permissions";
import { BadRequestError } from "@/lib/errors";
import { formatDate, formatDateTime } from "@/lib/format/dates";
import { formatQuantity } from "@/lib/format/numbers";
import { TOPOLOGIES, type Topology } from "@/lib/oscillator/design";
import { BuildsTableSection } from "@/components/builds-table/builds-table-section";
import { FollowButton } from "@/components/review/follow-button";
import { isFollowingProject } from "@/db/queries/follows";
import { followProjectAction } from "@/app/(app)/builds/[buildId]/review-actions";

type Props = {
  params: Promise<{ projectId: string }>;
  searchParams: Promise<Record<string, string | string[] | undefined>>;
};

function one(value: string | string[] | undefined): string | undefined {
  const v = Array.isArray(value) ? value[0] : value;
  return v && v.trim() !== "" ? v.trim() : undefined;
}

// The title and the page read the same project: one query per request, not two.
const loadProject = cache(getProject);

export async function generateMetadata({ params }: Props): Promise<Metadata> {
  const { projectId } = await params;
  const project = isRowId(projectId) ? await loadProject(projectId) : null;
  return { title: project?.name ?? "Project" };
}

export default async function ProjectPage({ params, searchParams }: Props) {
  const { projectId } = await params;
  const user = await requireUser(`/projects/${projectId}`);
  if (!isRowId(projectId)) notFound();
  const search = await searchParams;
  const q = one(search.q);
  const topologyParam = one(search.topology);
  const topology = TOPOLOGIES.includes(topologyParam as Topology) ? (topologyParam as Topology) : undefined;
  const cursor = one(search.cursor);

  const project = await loadProject(projectId);
  if (!project) notFound();
  let page: Page<DesignSummary>;
  try {
    page = await listDesigns(projectId, { q, topology, cursor, limit: 25 });
  } catch (err) {
    if (!(err instanceof BadRequestError)) throw err;
    page = await listDesigns(projectId, { q, topology, limit: 25 });
  }
  const canDesign = can(user.role, "design:write");
  const followsProject = await isFollowingProject(user.id, projectId);
  const base = `/projects/${projectId}`;

  const rows: SortableRow[] = page.items.map((d) => {
    const predictedHz = predictedHzOf(designOfRevision(d.topology, d.revision));
    const targetHz = d.revision.spec?.targetHz ?? null;
    return {
      key: d.id,
      cells: {
        name: (
          <Link href={`${base}/designs/${d.id}`} className="font-medium text-ink underline-offset-2 hover:text-copper hover:underline">
            {d.name}
          </Link>
        ),
        topology: TOPOLOGY_NAMES[d.topology],
        revision: `r${d.currentRevision}`,
        predicted: formatQuantity(predictedHz, "Hz", 5),
        target: <span title={specPhrases(d.revision.spec).join(" · ")}>{formatQuantity(targetHz, "Hz", 6, { trimZeros: true })}</span>,
        builds: d.buildCount,
        runs: d.runCount,
        updated: formatDate(d.updatedAt),
      },
      sort: {
        name: d.name,
        topology: d.topology,
        revision: d.currentRevision,
        predicted: predictedHz,
        target: targetHz,
        builds: d.buildCount,
        runs: d.runCount,
        updated: new Date(d.updatedAt).getTime(),
      },
    };
  });

  return (
    <>
      <PageHeader
        eyebrow={<Breadcrumbs items={[{ label: "Projects", href: "/projects" }, { label: project.name }]} />}
        title={project.name}
        description={
          <>
            {project.purpose ? <span className="block">{project.purpose}</span> : null}
            <span className="text-xs text-ink-faint">
              Owner {project.ownerName} · created {formatDateTime(project.createdAt)}
            </span>
          </>
        }
        actions={
          canDesign ? (
            <Link href={`${base}/designs/new`} className={buttonVariants({ variant: "primary" })}>
              + New design
            </Link>
          ) : null
        }
      />
      <h2 className="mb-2 text-sm font-semibold text-ink">Designs</h2>
      <SearchForm action={base} q={q} label="Filter designs" placeholder="Search design name">
        <div className="w-40">
          <label htmlFor="topology-filter" className="sr-only">
            Topology
          </label>
          <TopologyFilterSelect id="topology-filter" value={topology} anyLabel="All topologies" />
        </div>
      </SearchForm>
      {page.items.length === 0 ? (
        q || topology ? (
          <EmptyState title="No design matches these filters">
            <Link className="text-copper underline" href={base}>
              Show every design
            </Link>{" "}
            of this project.
          </EmptyState>
        ) : (
          <EmptyState
            title="No designs yet"
            action={
              canDesign ? (
                <Link href={`${base}/designs/new`} className={buttonVariants({ variant: "primary" })}>
                  Create the first design
                </Link>
              ) : undefined
            }
          >
            {canDesign
              ? "A design is a topology with its part values, tolerances and spec. The prediction updates as you type."
              : "An engineer adds designs here; builds and captures follow from them."}
          </EmptyState>
        )
      ) : (
        <>
          <SortableTable
            caption={`Designs of ${project.name}`}
            columns={[
              { key: "name", label: "Design" },
              { key: "topology", label: "Topology" },
              { key: "revision", label: "Rev", numeric: true, className: "hidden sm:table-cell" },
              { key: "predicted", label: "Predicted f0", numeric: true },
              { key: "target", label: "Target", numeric: true, className: "hidden md:table-cell" },
              { key: "builds", label: "Builds", numeric: true },
              { key: "runs", label: "Runs", numeric: true, className: "hidden sm:table-cell" },
              { key: "updated", label: "Updated", numeric: true, className: "hidden md:table-cell" },
            ]}
            rows={rows}
          />
          <PageNav basePath={base} params={{ q, topology }} nextCursor={page.nextCursor} hasCursor={Boolean(cursor)} shown={page.items.length} noun="designs" />
        </>
      )}

      <section id="builds" aria-labelledby="project-builds-heading" className="mt-8 scroll-mt-4 space-y-2">
        <div className="flex flex-wrap items-start justify-between gap-3">
          <div>
            <h2 id="project-builds-heading" className="text-base font-semibold text-ink">
              Builds
            </h2>
            <p className="text-xs text-ink-soft">Every build of every design here: state, latest measured frequency, drift and THD.</p>
          </div>
          <FollowButton action={followProjectAction.bind(null, projectId)} target="project" following={followsProject} />
        </div>
        <BuildsTableSection
          projectId={projectId}
          basePath={base}
          searchParams={search}
          prefix="b_"
          showDesign
          caption={`Builds of ${project.name}`}
          emptyText="Builds appear here once someone starts one from a design's page."
        />
      </section>
    </>
  );
}
