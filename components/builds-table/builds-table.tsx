import Link from "next/link";
import type { ReactNode } from "react";
import { BUILD_KIND_NAMES } from "@/components/logbook/build-status";
import { BUILD_STATE_WORDS, BuildStateBadge } from "@/components/review/build-state-badge";
import { buttonVariants } from "@/components/ui/button";
import { Table, Td, Th, Tr } from "@/components/ui/data-table";
import { EmptyState } from "@/components/ui/empty-state";
import { Input, Select } from "@/components/ui/field";
import { BUILD_KINDS } from "@/db/queries/builds";
import { BUILD_STATES, type BuildTableRow, type BuildTableSort, type NumberedPage } from "@/db/queries/dashboard";
import { formatDate, formatDateTime } from "@/lib/format/dates";
import { DASH, formatDecibels, formatDriftLeading, formatPercent, formatWithUncertainty } from "@/lib/format/numbers";
import { cn } from "@/lib/utils";
import { firstDirection, sortHref, tableHref, type BuildTableQuery } from "./table-query";

export interface BuildsTableProps {
  page: NumberedPage<BuildTableRow>;
  query: BuildTableQuery;
  /** The page the table sits on (links and the filter form point there). */
  basePath: string;
  /** The page's other query parameters, kept by every link and the form. */
  keep?: Record<string, string>;
  /** Key prefix of the table's parameters on a page with other lists. */
  prefix?: string;
  /** Show the design column (on a project page). */
  showDesign?: boolean;
  /** Show the project and design (across projects). */
  showProject?: boolean;
  caption: string;
  /** A refused part of the query, shown above the table. */
  queryError?: string | null;
  /** What to do when the scope has no builds at all. */
  emptyAction?: ReactNode;
  emptyText?: string;
}

interface Column {
  key: string;
  label: string;
  sort?: BuildTableSort;
  numeric?: boolean;
  className?: string;
}

/**
 * Builds with their state and latest analysed numbers, paged, sorted and filtered on the server; the URL's query
 * string holds the state, so the column headers and pages are plain links and the filters a GET form.
 */
export function BuildsTable({
  page,
  query,
  basePath,
  keep = {},
  prefix = "",
  showDesign = false,
  showProject = false,
  caption,
  queryError,
  emptyAction,
  emptyText,
}: BuildsTableProps) {
  const sort = query.sort ?? "created";
  const dir = query.dir ?? firstDirection(sort);
  const columns: Column[] = [
    { key: "label", label: "Build", sort: "label" },
    ...(showProject ? [{ key: "project", label: "Project · design", className: "hidden md:table-cell" }] : showDesign ? [{ key: "design", label: "Design", className: "hidden md:table-cell" }] : []),
    { key: "state", label: "State", sort: "state" },
    { key: "runs", label: "Runs", sort: "runCount", numeric: true, className: "hidden sm:table-cell" },
    { key: "measured", label: "Latest measured", sort: "measuredHz", numeric: true },
    { key: "drift", label: "Drift", sort: "absDriftPpm", numeric: true },
    { key: "thd", label: "THD", sort: "thdPercent", numeric: true, className: "hidden sm:table-cell" },
    { key: "latest", label: "Latest run", sort: "latestRunAt", numeric: true, className: "hidden lg:table-cell" },
  ];
  const filtered = Boolean(query.q || (query.state && query.state.length > 0) || query.kind);
  const formId = `${prefix || "builds"}-filter`;
  const states = new Set(query.state ?? []);
  const first = (page.page - 1) * page.pageSize + 1;
  const last = first + page.items.length - 1;

  return (
    <div className="space-y-3">
      <form action={basePath} method="get" role="search" aria-label={`Filter ${caption.toLowerCase()}`} className="flex flex-wrap items-end gap-x-3 gap-y-2">
        {Object.entries(keep).map(([k, v]) => (
          <input key={k} type="hidden" name={k} value={v} />
        ))}
        {query.sort ? <input type="hidden" name={`${prefix}sort`} value={query.sort} /> : null}
        {query.dir ? <input type="hidden" name={`${prefix}dir`} value={query.dir} /> : null}
        {query.pageSize ? <input type="hidden" name={`${prefix}pageSize`} value={query.pageSize} /> : null}
        <div className="min-w-0 flex-1 basis-40">
          <label htmlFor={`${formId}-q`} className="text-xs font-medium text-ink-soft">
            Label contains
          </label>
          <Input id={`${formId}-q`} name={`${prefix}q`} type="search" defaultValue={query.q ?? ""} placeholder="e.g. BB-" />
        </div>
        <div className="w-36">
          <label htmlFor={`${formId}-kind`} className="text-xs font-medium text-ink-soft">
            Kind
          </label>
          <Select id={`${formId}-kind`} name={`${prefix}kind`} defaultValue={query.kind ?? ""}>
            <option value="">Any kind</option>
            {BUILD_KINDS.map((k) => (
              <option key={k} value={k}>
                {BUILD_KIND_NAMES[k] ?? k}
              </option>
            ))}
          </Select>
        </div>
        <fieldset className="min-w-0">
          <legend className="text-xs font-medium text-ink-soft">State</legend>
          <div className="flex flex-wrap gap-x-3 gap-y-1 pt-1.5 text-sm">
            {BUILD_STATES.map((s) => (
              <label key={s} className="inline-flex items-center gap-1.5">
                <input type="checkbox" name={`${prefix}state`} value={s} defaultChecked={states.has(s)} className="h-4 w-4 accent-copper" />
                {BUILD_STATE_WORDS[s]}
              </label>
            ))}
          </div>
        </fieldset>
        <div className="flex gap-2">
          <button type="submit" className={buttonVariants({ variant: "secondary" })}>
            Filter
          </button>
          {filtered ? (
            <Link href={tableHref(basePath, keep, { sort: query.sort, dir: query.dir, pageSize: query.pageSize }, {}, prefix)} className={buttonVariants({ variant: "ghost" })}>
              Clear
            </Link>
          ) : null}
        </div>
      </form>
      {queryError ? (
        <p role="alert" className="text-xs text-verdict-fail">
          Part of the address was ignored: {queryError}
        </p>
      ) : null}

      {page.items.length === 0 ? (
        filtered ? (
          <EmptyState title="No build matches these filters">
            <Link className="text-copper underline" href={tableHref(basePath, keep, {}, {}, prefix)}>
              Show every build
            </Link>
            .
          </EmptyState>
        ) : page.page > 1 ? (
          <EmptyState title="This page is past the last build">
            <Link className="text-copper underline" href={tableHref(basePath, keep, query, { page: 1 }, prefix)}>
              Go to the first page
            </Link>
            .
          </EmptyState>
        ) : (
          <EmptyState title="No builds yet" action={emptyAction}>
            {emptyText ?? "Start a build of a design; its state, latest frequency, drift and THD appear here once captures are analysed."}
          </EmptyState>
        )
      ) : (
        <>
          <Table caption={`${caption}, sorted by ${columns.find((c) => c.sort === sort)?.label ?? "creation"} (${dir === "asc" ? "ascending" : "descending"})`}>
            <thead>
              <tr>
                {columns.map((c) => {
                  const active = c.sort === sort;
                  return (
                    <Th
                      key={c.key}
                      aria-sort={c.sort && c.sort === sort ? (dir === "asc" ? "ascending" : "descending") : undefined}
                      className={cn(c.numeric && "text-right", c.className)}
                    >
                      {c.sort ? (
                        <Link
                          href={sortHref(basePath, keep, query, c.sort, prefix)}
                          scroll={false}
                          className={cn("inline-flex items-center gap-1 rounded hover:text-ink", c.numeric && "flex-row-reverse")}
                        >
                          <span>{c.label}</span>
                          <span aria-hidden="true" className={cn("text-[10px]", active ? "text-copper" : "text-ink-faint/60")}>
                            {active ? (dir === "asc" ? "▲" : "▼") : "↕"}
                          </span>
                        </Link>
                      ) : (
                        c.label
                      )}
                    </Th>
                  );
                })}
              </tr>
            </thead>
            <tbody>
              {page.items.map((b) => {
                const r = b.latestRun;
                const f = formatWithUncertainty(r?.measuredHz, r?.frequencyUncertaintyHz, "Hz", 6, 8);
                const drift = formatDriftLeading(r?.driftPpm);
                return (
                  <Tr key={b.id}>
                    <Td>
                      <Link href={`/builds/${b.id}`} className="font-medium text-ink underline-offset-2 hover:text-copper hover:underline">
                        <bdi>{b.label}</bdi>
                      </Link>
                      <span className="block text-xs text-ink-faint">
                        {BUILD_KIND_NAMES[b.kind] ?? b.kind}
                        {b.kindRevision ? ` ${b.kindRevision}` : ""} · <bdi>{b.builtByName}</bdi>
                      </span>
                      {showProject || showDesign ? (
                        <span className="block max-w-[11rem] truncate text-xs text-ink-soft md:hidden">
                          {showProject ? <><bdi>{b.projectName}</bdi> › </> : ""}
                          <bdi>{b.designName}</bdi>
                        </span>
                      ) : null}
                    </Td>
                    {showProject ? (
                      <Td className="hidden text-sm md:table-cell">
                        <Link href={`/projects/${b.projectId}`} className="text-ink-soft hover:text-copper hover:underline">
                          <bdi>{b.projectName}</bdi>
                        </Link>
                        <Link href={`/projects/${b.projectId}/designs/${b.designId}`} className="block text-ink hover:text-copper hover:underline">
                          <bdi>{b.designName}</bdi>
                        </Link>
                      </Td>
                    ) : showDesign ? (
                      <Td className="hidden text-sm md:table-cell">
                        <Link href={`/projects/${b.projectId}/designs/${b.designId}`} className="text-ink hover:text-copper hover:underline">
                          <bdi>{b.designName}</bdi>
                        </Link>
                      </Td>
                    ) : null}
                    <Td>
                      <BuildStateBadge state={b.state} className="whitespace-nowrap" />
                      {r?.outsideBand ? <span className="mt-0.5 block whitespace-nowrap text-[11px] text-verdict-warn">outside the band</span> : null}
                    </Td>
                    <Td numeric className="hidden sm:table-cell">
                      <Link href={`/builds/${b.id}`} className="hover:text-copper hover:underline">
                        {b.runCount}
                      </Link>
                    </Td>
                    <Td numeric className="whitespace-nowrap">
                      {r ? (
                        <Link href={`/runs/${r.id}`} className="hover:text-copper hover:underline">
                          {f.value}
                        </Link>
                      ) : (
                        DASH
                      )}
                      {f.uncertainty ? <span className="block text-[11px] text-ink-faint">{f.uncertainty}</span> : null}
                    </Td>
                    <Td numeric className="whitespace-nowrap">
                      {r ? (
                        <Link href={`/runs/${r.id}`} className="hover:text-copper hover:underline">
                          {drift.main}
                        </Link>
                      ) : (
                        drift.main
                      )}
                      {r ? <span className="block text-[11px] text-ink-faint">{drift.detail}</span> : null}
                    </Td>
                    <Td numeric className="hidden whitespace-nowrap sm:table-cell">
                      {r ? (
                        <Link href={`/runs/${r.id}`} className="hover:text-copper hover:underline">
                          {formatPercent(r.thdPercent)}
                        </Link>
                      ) : (
                        DASH
                      )}
                      {r && r.worstHarmonicDbc !== null ? <span className="block text-[11px] text-ink-faint">worst {formatDecibels(r.worstHarmonicDbc, "dBc")}</span> : null}
                    </Td>
                    <Td numeric className="hidden whitespace-nowrap text-[12px] lg:table-cell">
                      {r ? formatDateTime(r.createdAt) : `created ${formatDate(b.createdAt)}`}
                    </Td>
                  </Tr>
                );
              })}
            </tbody>
          </Table>
          <nav aria-label={`${caption}: pages`} className="flex flex-wrap items-center justify-between gap-2 text-sm text-ink-soft">
            <span className="num">
              {first}–{last} of {page.total} {page.total === 1 ? "build" : "builds"}
              {page.pageCount > 1 ? ` · page ${page.page} of ${page.pageCount}` : ""}
            </span>
            {page.pageCount > 1 ? (
              <span className="flex gap-2">
                {page.page > 1 ? (
                  <Link href={tableHref(basePath, keep, query, { page: page.page - 1 }, prefix)} scroll={false} className={buttonVariants({ variant: "secondary", size: "sm" })}>
                    ← Previous
                  </Link>
                ) : null}
                {page.page < page.pageCount ? (
                  <Link href={tableHref(basePath, keep, query, { page: page.page + 1 }, prefix)} scroll={false} className={buttonVariants({ variant: "secondary", size: "sm" })}>
                    Next →
                  </Link>
                ) : null}
              </span>
            ) : null}
          </nav>
        </>
      )}
    </div>
  );
}
