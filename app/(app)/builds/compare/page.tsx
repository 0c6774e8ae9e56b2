import type { Metadata } from "next";
import Link from "next/link";
import { BuildComparisonTable } from "@/components/layouts/build-comparison-table";
import { CompareRunPicker } from "@/components/layouts/compare-run-picker";
import { HarmonicsOverlayChart } from "@/components/layouts/harmonics-overlay-chart";
import { Card, CardBody, CardHeader } from "@/components/ui/card";
import { EmptyState } from "@/components/ui/empty-state";
import { PageHeader } from "@/components/ui/page-header";
import { requireUser } from "@/lib/auth/current-user";
import { BadRequestError, NotFoundError } from "@/lib/errors";
import { MAX_COMPARED_BUILDS } from "@/lib/layouts/build-comparison";
import { getBuildComparison } from "@/lib/logbook/layouts";
import { compareQuerySchema } from "@/lib/validations/layouts";

export const metadata: Metadata = { title: "Compare builds" };

type Search = { searchParams: Promise<Record<string, string | string[] | undefined>> };

export default async function CompareBuildsPage({ searchParams }: Search) {
  const params = await searchParams;
  const raw = Array.isArray(params.ids) ? params.ids.join(",") : (params.ids ?? "");
  // The run picker sends one `runs` per build (empty for the default); the API's form is one comma list.
  const rawRuns = Array.isArray(params.runs) ? params.runs.filter((r) => r.trim() !== "").join(",") : (params.runs ?? "");
  const here = `/builds/compare?ids=${encodeURIComponent(raw)}${rawRuns ? `&runs=${encodeURIComponent(rawRuns)}` : ""}`;
  const user = await requireUser(here);
  const parsed = compareQuerySchema.safeParse({ ids: raw, runs: rawRuns });
  let problem: string | null = parsed.success ? null : (parsed.error.issues[0]?.message ?? "These builds cannot be compared.");
  let builds = null;
  if (parsed.success) {
    try {
      builds = await getBuildComparison(user, parsed.data.ids, parsed.data.runs ?? []);
    } catch (err) {
      if (err instanceof NotFoundError) problem = `${err.message} It may have been removed; compare the others.`;
      else if (err instanceof BadRequestError) problem = `${err.message} Leave out ?runs= to compare each build's default run.`;
      else throw err;
    }
  }

  return (
    <>
      <PageHeader
        title="Compare builds"
        description="The chosen run of each build (by default its newest analysed run that is not withdrawn) against its prediction, the implied capacitance and its trend across tweaks, THD, harmonic levels and stability side by side."
      />
      {builds ? (
        <div className="space-y-6">
          <CompareRunPicker builds={builds} />
          <BuildComparisonTable builds={builds} />
          <Card aria-labelledby="harmonics-overlay-title">
            <CardHeader
              title={<span id="harmonics-overlay-title">Harmonics overlaid</span>}
              description="Each compared run's harmonic levels relative to its fundamental; a gap is an order not measured on that run."
            />
            <CardBody>
              <HarmonicsOverlayChart builds={builds.map((b) => ({ buildId: b.build.id, label: b.build.label, harmonics: b.latestRun?.harmonics ?? [] }))} />
            </CardBody>
          </Card>
        </div>
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
