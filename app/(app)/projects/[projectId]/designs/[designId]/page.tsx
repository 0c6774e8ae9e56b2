import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { cache } from "react";
import { Breadcrumbs, trailCrumbs } from "@/components/logbook/breadcrumbs";
import { BuildForm } from "@/components/logbook/build-form";
import { CreatePanel } from "@/components/logbook/create-panel";
import { draftFromRevision } from "@/components/logbook/design-draft";
import { DesignForm } from "@/components/logbook/design-form";
import { designOfRevision, predictedHzOf, specPhrases, TOPOLOGY_NAMES } from "@/components/logbook/design-model";
import { PartsTable } from "@/components/logbook/parts-table";
import { PredictionPanel } from "@/components/logbook/prediction-panel";
import { isRowId } from "@/components/logbook/route-ids";
import { buttonVariants } from "@/components/ui/button";
import { Card, CardBody, CardHeader } from "@/components/ui/card";
import { PageHeader } from "@/components/ui/page-header";
import { listBuilds, type BuildSummary } from "@/db/queries/builds";
import { getDesign, listDesignRevisions } from "@/db/queries/designs";
import type { Page } from "@/db/queries/pagination";
import { requireUser } from "@/lib/auth/current-user";
import { can } from "@/lib/auth/permissions";
import { BadRequestError } from "@/lib/errors";
import { formatDateTime } from "@/lib/format/dates";
import { formatQuantity } from "@/lib/format/numbers";
import { buildDesignReport, type DesignReport } from "@/lib/oscillator/report";
import { BuildsTableSection } from "@/components/builds-table/builds-table-section";
import { CalibratedPredictionPanel } from "@/components/layouts/calibrated-prediction-panel";
import { BuildsAgainstPredictionChart } from "@/components/layouts/builds-against-prediction-chart";
import { constructionName, constructionOf, parseConstruction } from "@/lib/layouts/construction";
import { designCalibration, designCalibrationsByConstruction } from "@/lib/logbook/layouts";
import { createBuildAction } from "../actions";

type Props = {
  params: Promise<{ projectId: string; designId: string }>;
  searchParams: Promise<Record<string, string | string[] | undefined>>;
};

function one(value: string | string[] | undefined): string | undefined {
  const v = Array.isArray(value) ? value[0] : value;
  return v && v.trim() !== "" ? v.trim() : undefined;
}

/** "BB-3" after BB-1 and BB-2; the first build is BB-1. */
function nextLabel(labels: string[]): string {
  const numbers = labels.map((l) => /^BB-(\d+)$/i.exec(l)?.[1]).filter((n): n is string => n !== undefined).map(Number);
  return `BB-${numbers.length ? Math.max(...numbers) + 1 : labels.length + 1}`;
}

// The title and the page read the same design: one query per request, not two.
const loadDesign = cache(getDesign);

export async function generateMetadata({ params }: Props): Promise<Metadata> {
  const { designId } = await params;
  const design = isRowId(designId) ? await loadDesign(designId) : null;
  return { title: design?.name ?? "Design" };
}

export default async function DesignPage({ params, searchParams }: Props) {
  const { projectId, designId } = await params;
  const user = await requireUser(`/projects/${projectId}/designs/${designId}`);
  if (!isRowId(projectId) || !isRowId(designId)) notFound();
  const search = await searchParams;
  const cursor = one(search.cursor);

  const design = await loadDesign(designId);
  if (!design || design.projectId !== projectId) notFound();
  let builds: Page<BuildSummary>;
  try {
    builds = await listBuilds(designId, { cursor, limit: 25 });
  } catch (err) {
    if (!(err instanceof BadRequestError)) throw err;
    builds = await listBuilds(designId, { limit: 25 });
  }
  const revisions = await listDesignRevisions(designId);
  const constructionParam = one(search.construction);
  const canBuild = can(user.role, "build:create");
  const [calibration, buildFormCalibration] = await Promise.all([
    designCalibration(user, design, constructionParam ? parseConstruction(constructionParam) : null),
    // The new-build form's predictions per construction, only for those who may create a build.
    canBuild ? designCalibrationsByConstruction(user, design) : undefined,
  ]);

  const base = `/projects/${projectId}/designs/${designId}`;
  const rev = design.revision;
  const model = designOfRevision(design.topology, rev);
  let report: DesignReport | null = null;
  let predictionError: string | null = null;
  try {
    report = buildDesignReport(model);
  } catch (err) {
    predictionError = err instanceof Error ? err.message : "The model refused these values.";
  }
  const spec = specPhrases(rev.spec);
  const canEdit = can(user.role, "design:write");
  // The builds on this page of the list, each at its latest run's drift from prediction.
  const chartPoints = builds.items.flatMap((b) =>
    b.latestRun?.driftPpm != null
      ? [{ buildId: b.id, label: b.label, kind: b.kind, constructionName: constructionName(constructionOf(b.kind, b.kindRevision)), driftPpm: b.latestRun.driftPpm }]
      : [],
  );


  return (
    <>
      <PageHeader
        eyebrow={
          <Breadcrumbs items={trailCrumbs({ projectId, projectName: design.projectName }, design.name)} />
        }
        title={design.name}
        description={`${TOPOLOGY_NAMES[design.topology]} · revision ${design.currentRevision} · updated ${formatDateTime(design.updatedAt)}`}
        actions={
          <>
            {canBuild ? (
              <a href="#builds" className={buttonVariants({ variant: "secondary" })}>
                + New build
              </a>
            ) : null}
            {canEdit ? (
              <Link href={`${base}/edit`} className={buttonVariants({ variant: "primary" })}>
                Edit design
              </Link>
            ) : null}
          </>
        }
      />

      <div className="grid gap-5 lg:grid-cols-[minmax(0,1fr)_22rem]">
        <div className="min-w-0 space-y-5">
          <section aria-labelledby="parts-heading" className="space-y-2">
            <h2 id="parts-heading" className="text-sm font-semibold text-ink">
              Parts (revision {rev.revision})
            </h2>
            <PartsTable topology={design.topology} parts={rev.parts} caption={`Parts of ${design.name}`} />
            {rev.extraCapacitanceF ? (
              <p className="text-xs text-ink-soft">
                Known extra capacitance {formatQuantity(rev.extraCapacitanceF, "F", 3, { trimZeros: true })} in parallel with the tank.
              </p>
            ) : null}
          </section>
          <Card>
            <CardHeader title="Spec" description="Runs of this design's builds are judged against these limits." />
            <CardBody>
              {spec.length > 0 ? (
                <ul className="flex flex-wrap gap-2">
                  {spec.map((s) => (
                    <li key={s} className="num rounded-md border border-rule bg-paper px-2 py-1 font-mono text-[13px] text-ink">
                      {s}
                    </li>
                  ))}
                </ul>
              ) : (
                <p className="text-sm text-ink-soft">
                  No limits set yet, so runs get no verdict.
                  {canEdit ? (
                    <>
                      {" "}
                      <Link className="text-copper underline underline-offset-2" href={`${base}/edit`}>
                        Add a spec
                      </Link>
                      : target frequency and tolerance, THD, harmonics, amplitude.
                    </>
                  ) : null}
                </p>
              )}
            </CardBody>
          </Card>
        </div>
        <aside aria-label="Prediction" className="min-w-0">
          <Card>
            <CardHeader title="Prediction" description="From the nominal values and tolerances of this revision." />
            <CardBody>{report ? <PredictionPanel report={report} /> : <p className="text-sm text-verdict-fail">{predictionError}</p>}</CardBody>
          </Card>
          <Card id="calibrated" className="mt-5 scroll-mt-4">
            <CardHeader title="As it will likely measure here" description="The lab's figure for a construction, added to this revision's prediction." />
            <CardBody>
              <CalibratedPredictionPanel view={calibration} chooserPath={`${base}#calibrated`} />
            </CardBody>
          </Card>
        </aside>
      </div>

      <div className="mt-5">
        <CreatePanel title="Try other values (what-if)">
          <DesignForm mode="whatif" initialDraft={draftFromRevision(design.name, design.topology, rev)} cancelHref={canEdit ? `${base}/edit` : undefined} />
        </CreatePanel>
      </div>

      <section id="builds" aria-labelledby="builds-heading" className="mt-8 scroll-mt-4">
        <h2 id="builds-heading" className="mb-2 text-base font-semibold text-ink">
          Builds
        </h2>
        {canBuild ? (
          <CreatePanel title="New build" startOpen={builds.items.length === 0 && !cursor}>
            <BuildForm
              action={createBuildAction.bind(null, designId)}
              suggestedLabel={nextLabel(builds.items.map((b) => b.label))}
              calibration={buildFormCalibration}
            />
          </CreatePanel>
        ) : null}
        {chartPoints.length > 0 ? (
          <div className="mb-4">
            <BuildsAgainstPredictionChart points={chartPoints} />
          </div>
        ) : null}
        <BuildsTableSection
          designId={designId}
          basePath={base}
          searchParams={search}
          caption={`Builds of ${design.name}`}
          emptyText={
            canBuild
              ? "Create a build when a prototype is on the bench; then log its tweaks and upload a capture after each one."
              : "Technicians add builds when a prototype is on the bench."
          }
        />
      </section>

      <section aria-labelledby="history-heading" className="mt-8">
        <h2 id="history-heading" className="mb-2 text-base font-semibold text-ink">
          Revision history
        </h2>
        <ol className="space-y-2">
          {revisions.map((r) => {
            const f0 = predictedHzOf(designOfRevision(design.topology, r));
            return (
              <li key={r.id} className="rounded-lg border border-rule bg-paper-raised">
                <details>
                  <summary className="flex cursor-pointer flex-wrap items-baseline gap-x-3 gap-y-1 px-4 py-2.5 text-sm">
                    <span className="num font-mono font-semibold text-ink">r{r.revision}</span>
                    {r.revision === design.currentRevision ? (
                      <span className="rounded bg-copper-light px-1.5 py-px text-xs font-medium text-copper-dark">current</span>
                    ) : null}
                    <span className="num font-mono text-[13px] text-ink">f0 {formatQuantity(f0, "Hz", 5)}</span>
                    <span className="text-ink-soft">{r.changeNote || (r.revision === 1 ? "First revision" : "No note")}</span>
                    <span className="ml-auto text-xs text-ink-faint">
                      {formatDateTime(r.createdAt)} · {r.createdByName}
                    </span>
                  </summary>
                  <div className="space-y-2 border-t border-rule px-4 py-3">
                    <PartsTable topology={design.topology} parts={r.parts} caption={`Parts of revision ${r.revision}`} />
                    {specPhrases(r.spec).length > 0 ? (
                      <p className="text-xs text-ink-soft">Spec: {specPhrases(r.spec).join(" · ")}</p>
                    ) : null}
                  </div>
                </details>
              </li>
            );
          })}
        </ol>
      </section>
    </>
  );
}
