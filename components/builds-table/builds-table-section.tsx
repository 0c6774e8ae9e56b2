import type { ReactNode } from "react";
import { listBuildTable } from "@/db/queries/dashboard";
import { BuildsTable } from "./builds-table";
import { firstDirection, otherParams, parseTableQuery, type SearchParams } from "./table-query";

export interface BuildsTableSectionProps {
  /** Scope: a project's builds or a design's. */
  projectId?: string;
  designId?: string;
  basePath: string;
  searchParams: SearchParams;
  /** Key prefix when the page has other lists with their own parameters (e.g. "b_"). */
  prefix?: string;
  showDesign?: boolean;
  /** Across projects: show each build's project and design. */
  showProject?: boolean;
  caption: string;
  emptyAction?: ReactNode;
  emptyText?: string;
}

/** Reads the table's query from the URL, asks the database for that page, and renders the table. */
export async function BuildsTableSection({ projectId, designId, basePath, searchParams, prefix = "", showDesign, showProject, caption, emptyAction, emptyText }: BuildsTableSectionProps) {
  const { query, error } = parseTableQuery(searchParams, prefix);
  const sort = query.sort ?? "created";
  const page = await listBuildTable({
    projectId,
    designId,
    q: query.q,
    state: query.state,
    kind: query.kind,
    sort,
    direction: query.dir ?? firstDirection(sort),
    page: query.page,
    pageSize: query.pageSize,
  });
  return (
    <BuildsTable
      page={page}
      query={query}
      basePath={basePath}
      keep={otherParams(searchParams, prefix)}
      prefix={prefix}
      showDesign={showDesign}
      showProject={showProject}
      caption={caption}
      queryError={error}
      emptyAction={emptyAction}
      emptyText={emptyText}
    />
  );
}
