import type { Metadata } from "next";
import Link from "next/link";
import { LayoutFigureCard } from "@/components/layouts/layout-figure-card";
import { buttonVariants } from "@/components/ui/button";
import { EmptyState } from "@/components/ui/empty-state";
import { Select } from "@/components/ui/field";
import { TopologyFilterSelect } from "@/components/logbook/topology-filter-select";
import { PageHeader } from "@/components/ui/page-header";
import { requireUser } from "@/lib/auth/current-user";
import { CONSTRUCTION_KINDS, constructionName } from "@/lib/layouts/construction";
import { MAX_COMPARED_BUILDS } from "@/lib/layouts/build-comparison";
import { MIN_BUILDS_FOR_TRUST } from "@/lib/layouts/layout-figures";
import { listLayoutFigures } from "@/lib/logbook/layouts";
import { TOPOLOGIES } from "@/lib/oscillator/design";

export const metadata: Metadata = { title: "Layouts" };

type Search = { searchParams: Promise<Record<string, string | string[] | undefined>> };

function one(value: string | string[] | undefined): string | undefined {
  const v = Array.isArray(value) ? value[0] : value;
  return v && v.trim() !== "" ? v.trim() : undefined;
}

/** Builds each figure lists on the overview; a filtered view lists them all. */
const BUILDS_PER_FIGURE = 12;

export default async function LayoutsPage({ searchParams }: Search) {
  const user = await requireUser("/layouts");
  const params = await searchParams;
  const kind = CONSTRUCTION_KINDS.find((k) => k === one(params.kind));
  const topology = TOPOLOGIES.find((t) => t === one(params.topology));
  const figures = await listLayoutFigures(user, { kind, topology });
  const narrowed = Boolean(kind && topology);
  const filtered = Boolean(kind || topology);
  // The build closest to each figure's median stands for its construction in a side-by-side comparison.
  const across = figures
    .filter((f) => f.capacitanceF.median !== null)
    .map((f) => [...f.builds].sort((a, b) => Math.abs(a.typicalF - f.capacitanceF.median!) - Math.abs(b.typicalF - f.capacitanceF.median!))[0].buildId)
    .slice(0, MAX_COMPARED_BUILDS);

  return (
    <>
      <PageHeader
        title="Layouts"
        description={
          <>
            What this lab&apos;s constructions add to a design: for each kind of build and topology, the implied extra capacitance of the
            builds whose value held across their tweaks, over runs without trust warnings. The figure is the median across builds with the
            scaled median absolute deviation (MAD × 1.4826) as the spread; a figure resting on fewer than {MIN_BUILDS_FOR_TRUST} steady
            builds is marked thin.
          </>
        }
      />
      <form action="/layouts" method="get" className="mb-5 flex flex-wrap items-end gap-2" aria-label="Filter layout figures">
        <div className="w-44">
          <label htmlFor="layout-kind" className="mb-1 block text-xs font-medium text-ink-soft">
            Construction
          </label>
          <Select id="layout-kind" name="kind" defaultValue={kind ?? ""}>
            <option value="">Every construction</option>
            {CONSTRUCTION_KINDS.map((k) => (
              <option key={k} value={k}>
                {k === "pcb" ? "PCB (every revision)" : constructionName({ kind: k, revision: "" })}
              </option>
            ))}
          </Select>
        </div>
        <div className="w-44">
          <label htmlFor="layout-topology" className="mb-1 block text-xs font-medium text-ink-soft">
            Topology
          </label>
          <TopologyFilterSelect id="layout-topology" value={topology} anyLabel="Every topology" />
        </div>
        <button type="submit" className={buttonVariants({ variant: "secondary", size: "md" })}>
          Show
        </button>
        {filtered ? (
          <Link className="self-center text-sm text-copper underline" href="/layouts">
            Clear
          </Link>
        ) : null}
      </form>
      {figures.length === 0 ? (
        filtered ? (
          <EmptyState title="No figure for this construction and topology yet">
            No build of this kind has an analysed run without trust warnings.{" "}
            <Link className="text-copper underline" href="/layouts">
              Show every construction
            </Link>
            .
          </EmptyState>
        ) : (
          <EmptyState title="No layout figures yet">
            A figure appears once builds have analysed captures on both sides of a tweak: upload a capture, make a tweak (even moving the
            leads), upload another. When the implied capacitance holds, the build counts here.{" "}
            <Link className="text-copper underline" href="/projects">
              Open the projects
            </Link>
            .
          </EmptyState>
        )
      ) : (
        <div className="space-y-5">
          {across.length >= 2 ? (
            <p className="text-sm">
              <Link className="text-copper underline" href={`/builds/compare?ids=${across.join(",")}`}>
                Compare one build of each construction
              </Link>{" "}
              <span className="text-ink-soft">(the build nearest each figure&apos;s median, side by side)</span>
            </p>
          ) : null}
          {figures.map((f) => (
            <LayoutFigureCard
              key={`${f.constructionKey}-${f.topology}`}
              figure={f}
              buildLimit={narrowed ? undefined : BUILDS_PER_FIGURE}
              moreHref={`/layouts?${new URLSearchParams({ kind: f.construction.kind, topology: f.topology })}`}
            />
          ))}
        </div>
      )}
    </>
  );
}
