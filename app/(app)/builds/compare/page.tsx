import type { Metadata } from "next";
import Link from "next/link";
import { BuildComparisonTable } from "@/components/layouts/build-comparison-table";
import { EmptyState } from "@/components/ui/empty-state";
import { PageHeader } from "@/components/ui/page-header";
import { requireUser } from "@/lib/auth/current-user";
import { NotFoundError } from "@/lib/errors";
import { MAX_COMPARED_BUILDS } from "@/lib/layouts/build-comparison";
import { getBuildComparison } from "@/lib/logbook/layouts";
import { compareQuerySchema } from "@/lib/validations/layouts";

export const metadata: Metadata = { title: "Compare builds" };

type Search = { searchParams: Promise<Record<string, string | string[] | undefined>> };

export default async function CompareBuildsPage({ searchParams }: Search) {
  const params = await searchParams;
  const raw = Array.isArray(params.ids) ? params.ids.join(",") : (params.ids ?? "");
  const user = await requireUser(`/builds/compare?ids=${encodeURIComponent(raw)}`);
  const parsed = compareQuerySchema.safeParse({ ids: raw });
  let problem: string | null = parsed.success ? null : (parsed.error.issues[0]?.message ?? "These builds cannot be compared.");
  let builds = null;
  if (parsed.success) {
    try {
      builds = await getBuildComparison(user, parsed.data.ids);
    } catch (err) {
      if (!(err instanceof NotFoundError)) throw err;
      problem = `${err.message} It may have been removed; compare the others.`;
    }
  }

  return (
    <>
      <PageHeader
        title="Compare builds"
        description="The newest analysed run of each build against its prediction, the implied capacitance and its trend across tweaks, THD and harmonic levels side by side."
      />
      {builds ? (
        <BuildComparisonTable builds={builds} />
      ) : (
        <EmptyState title={raw ? "These builds cannot be compared" : "Choose builds to compare"}>
          {raw ? `${problem} ` : ""}
          Open the{" "}
          <Link className="text-copper underline" href="/layouts">
            Layouts
          </Link>{" "}
          page and follow “Compare these builds” under a figure, or add <code className="font-mono">?ids=</code> with two to {MAX_COMPARED_BUILDS} build
          ids separated by commas.
        </EmptyState>
      )}
    </>
  );
}
