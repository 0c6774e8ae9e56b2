import type { Metadata } from "next";
import Link from "next/link";
import { CreatePanel } from "@/components/logbook/create-panel";
import { PageNav } from "@/components/logbook/page-nav";
import { ProjectForm } from "@/components/logbook/project-form";
import { SearchForm } from "@/components/logbook/search-form";
import { SortableTable, type SortableRow } from "@/components/logbook/sortable-table";
import { EmptyState } from "@/components/ui/empty-state";
import { PageHeader } from "@/components/ui/page-header";
import { listProjects, type ProjectSummary } from "@/db/queries/projects";
import type { Page } from "@/db/queries/pagination";
import { requireUser } from "@/lib/auth/current-user";
import { can } from "@/lib/auth/permissions";
import { BadRequestError } from "@/lib/errors";
import { formatDateTime } from "@/lib/format/dates";
import { createProjectAction } from "./actions";

export const metadata: Metadata = { title: "Projects" };

type Search = { searchParams: Promise<Record<string, string | string[] | undefined>> };

function one(value: string | string[] | undefined): string | undefined {
  const v = Array.isArray(value) ? value[0] : value;
  return v && v.trim() !== "" ? v.trim() : undefined;
}

export default async function ProjectsPage({ searchParams }: Search) {
  const user = await requireUser("/projects");
  const params = await searchParams;
  const q = one(params.q);
  const cursor = one(params.cursor);
  let page: Page<ProjectSummary>;
  try {
    page = await listProjects({ q, cursor, limit: 25 });
  } catch (err) {
    // A stale or edited cursor: show the first page rather than an error.
    if (!(err instanceof BadRequestError)) throw err;
    page = await listProjects({ q, limit: 25 });
  }
  const canWrite = can(user.role, "project:write");

  const rows: SortableRow[] = page.items.map((p) => ({
    key: p.id,
    cells: {
      name: (
        <Link href={`/projects/${p.id}`} className="font-medium text-ink underline-offset-2 hover:text-copper hover:underline">
          {p.name}
        </Link>
      ),
      purpose: <span className="line-clamp-2 text-ink-soft">{p.purpose || "—"}</span>,
      owner: p.ownerName,
      designs: p.designCount,
      builds: p.buildCount,
      runs: p.runCount,
      lastRun: formatDateTime(p.lastRunAt),
    },
    sort: {
      name: p.name,
      owner: p.ownerName,
      designs: p.designCount,
      builds: p.buildCount,
      runs: p.runCount,
      lastRun: p.lastRunAt ? new Date(p.lastRunAt).getTime() : null,
    },
  }));

  return (
    <>
      <PageHeader
        title="Projects"
        description="Each project holds the designs of one product or study, their builds and every capture logged on them."
      />
      {canWrite ? (
        <CreatePanel title="New project" startOpen={page.items.length === 0 && !q && !cursor}>
          <ProjectForm action={createProjectAction} />
        </CreatePanel>
      ) : null}
      <SearchForm action="/projects" q={q} label="Filter projects" placeholder="Search name or purpose" />
      {page.items.length === 0 ? (
        q ? (
          <EmptyState title={`No project matches “${q}”`}>
            Try a shorter search, or <Link className="text-copper underline" href="/projects">show every project</Link>.
          </EmptyState>
        ) : (
          <EmptyState title="No projects yet">
            {canWrite
              ? "Create the first project above: give it a name and say what its oscillators are for. Designs, builds and captures go inside it."
              : "An engineer creates projects. Once there is one, its designs, builds and runs show up here."}
          </EmptyState>
        )
      ) : (
        <>
          <SortableTable
            caption="Projects"
            columns={[
              { key: "name", label: "Project" },
              { key: "purpose", label: "Purpose", sortable: false, className: "hidden md:table-cell" },
              { key: "owner", label: "Owner", className: "hidden sm:table-cell" },
              { key: "designs", label: "Designs", numeric: true },
              { key: "builds", label: "Builds", numeric: true },
              { key: "runs", label: "Runs", numeric: true },
              { key: "lastRun", label: "Last run", numeric: true, className: "hidden sm:table-cell" },
            ]}
            rows={rows}
          />
          <PageNav basePath="/projects" params={{ q }} nextCursor={page.nextCursor} hasCursor={Boolean(cursor)} shown={page.items.length} noun="projects" />
        </>
      )}
    </>
  );
}
