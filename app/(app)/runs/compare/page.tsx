import type { Metadata } from "next";
import Link from "next/link";
import { SpectrumOverlayChart } from "@/components/charts/spectrum-overlay-chart";
import { Breadcrumbs, buildPlace, trailCrumbs } from "@/components/logbook/breadcrumbs";
import { isRowId } from "@/components/logbook/route-ids";
import { runFigures } from "@/components/logbook/run-results";
import { StabilityComparison } from "@/components/logbook/stability/stability-comparison";
import { tweakLabel } from "@/components/logbook/tweak-label";
import { RunComparisonTable } from "@/components/review/run-comparison-table";
import { buttonVariants } from "@/components/ui/button";
import { Card, CardBody, CardHeader } from "@/components/ui/card";
import { EmptyState } from "@/components/ui/empty-state";
import { Select } from "@/components/ui/field";
import { PageHeader } from "@/components/ui/page-header";
import { getBuild } from "@/db/queries/builds";
import { getRun, getRunPlot, listRuns, type Run } from "@/db/queries/runs";
import { listTweaks } from "@/db/queries/tweaks";
import type { PlotData } from "@/lib/analysis/plot";
import { requireUser } from "@/lib/auth/current-user";
import { compareRuns, type ComparableRun } from "@/lib/drift-trend/run-comparison";
import { formatDateTime } from "@/lib/format/dates";
import { formatPartValue } from "@/lib/format/numbers";
import type { Topology } from "@/lib/oscillator/design";
import { partUnitOrBlank } from "@/components/logbook/part-unit";

export const metadata: Metadata = { title: "Compare runs" };

type Props = { searchParams: Promise<Record<string, string | string[] | undefined>> };

function one(value: string | string[] | undefined): string | undefined {
  const v = Array.isArray(value) ? value[0] : value;
  return v && isRowId(v.trim()) ? v.trim() : undefined;
}

function comparable(run: Run): ComparableRun {
  const f = runFigures(run);
  return {
    measuredHz: f.frequencyHz,
    frequencyUncertaintyHz: f.frequencyUncertaintyHz,
    predictedHz: run.snapshot.predictedHz ?? run.predictedHz,
    driftPpm: run.driftPpm,
    impliedExtraCapacitanceF: run.impliedExtraCapacitanceF,
    fundamentalVpk: f.fundamentalVpk,
    thdPercent: f.thdPercent,
    worstHarmonicDbc: run.worstHarmonicDbc,
    sinadDb: f.sinadDb,
    snrDb: f.snrDb,
    sfdrDb: f.sfdrDb,
    inRecordDriftPpm: run.inRecordDriftPpm ?? f.inRecordDriftPpm,
    harmonics: f.harmonics.map((h) => ({ order: h.order, dBc: h.dBc, detectionLimitDbc: h.detectionLimitDbc, status: h.status })),
    // Judged against the spec the run was judged against at the bench, not today's.
    spec: run.snapshot.spec ?? null,
    verdict: run.verdict,
  };
}

function spectrumOf(plot: unknown): PlotData["spectrum"] | null {
  const p = plot as Partial<PlotData> | null;
  return p && p.spectrum && Array.isArray(p.spectrum.frequencyHz) && Array.isArray(p.spectrum.dBV) ? p.spectrum : null;
}

export default async function CompareRunsPage({ searchParams }: Props) {
  const search = await searchParams;
  const aId = one(search.a);
  const bId = one(search.b);
  await requireUser("/runs/compare");

  const [givenA, givenB] = await Promise.all([aId ? getRun(aId) : null, bId ? getRun(bId) : null]);
  const anchor = givenA ?? givenB;
  if (!anchor) {
    return (
      <>
        <PageHeader title="Compare two runs" description="Before and after a tweak: overlaid spectra and the change in every figure." />
        <EmptyState
          title={aId || bId ? "That run was not found" : "Pick two runs of a build"}
          action={
            <Link href="/dashboard" className={buttonVariants({ variant: "secondary" })}>
              Go to your builds
            </Link>
          }
        >
          Open a build and choose “Compare the last two runs”, or add <code className="font-mono">?a=</code> and <code className="font-mono">?b=</code> with two run ids of the
          same build to this page&apos;s address.
        </EmptyState>
      </>
    );
  }

  const build = await getBuild(anchor.buildId);
  if (!build) return <EmptyState title="That run's build was not found" />;
  const [page, tweaks] = await Promise.all([listRuns(anchor.buildId, { status: "done", limit: 200 }), listTweaks(anchor.buildId)]);
  const choices = [...page.items].reverse();
  /** The analysed run next to `id` on the preferred side (or the other side at the ends). */
  const neighbour = async (id: string, prefer: -1 | 1): Promise<Run | null> => {
    const i = choices.findIndex((r) => r.id === id);
    const other = i < 0 ? undefined : (choices[i + prefer] ?? choices[i - prefer]);
    return other ? getRun(other.id) : null;
  };
  // With one run given, compare it with the one before it (or after, for the first run).
  const a = givenA ?? (givenB ? await neighbour(givenB.id, -1) : null);
  const b = givenB ?? (givenA ? await neighbour(givenA.id, 1) : null);
  const sameBuild = a && b ? a.buildId === b.buildId : true;

  const label = (r: Run, letter: "A" | "B") => `${letter} · ${r.originalFilename}`;
  const topology: Topology = anchor.snapshot.topology;
  const [plotA, plotB] = await Promise.all([a && a.status === "done" ? getRunPlot(a.id) : null, b && b.status === "done" ? getRunPlot(b.id) : null]);
  const specA = spectrumOf(plotA);
  const specB = spectrumOf(plotB);
  const comparison = a && b && sameBuild ? compareRuns(comparable(a), comparable(b)) : null;

  // What changed on the bench between the two: part values in their snapshots, and the tweaks logged in between.
  const [early, late] = a && b ? (new Date(a.createdAt) <= new Date(b.createdAt) ? [a, b] : [b, a]) : [null, null];
  const partChanges =
    early && late
      ? Object.keys({ ...early.snapshot.parts, ...late.snapshot.parts })
          .filter((ref) => early.snapshot.parts[ref]?.valueSi !== late.snapshot.parts[ref]?.valueSi)
          .map((ref) => `${ref} ${formatPartValue(early.snapshot.parts[ref]?.valueSi, partUnitOrBlank(topology, ref))} → ${formatPartValue(late.snapshot.parts[ref]?.valueSi, partUnitOrBlank(topology, ref))}`)
      : [];
  const between =
    early && late
      ? tweaks.filter((t) => !t.planned && new Date(t.createdAt) > new Date(early.createdAt) && new Date(t.createdAt) <= new Date(late.createdAt))
      : [];

  return (
    <>
      <PageHeader
        eyebrow={
          <Breadcrumbs
            items={trailCrumbs(buildPlace(build), "Compare runs")}
          />
        }
        title="Compare two runs"
        description={`Runs of build ${build.label}: B against A, figure by figure, and both spectra on one plot.`}
      />

      <form method="get" action="/runs/compare" aria-label="Choose the two runs" className="mb-5 flex flex-wrap items-end gap-3">
        {(["a", "b"] as const).map((key) => {
          const chosen = key === "a" ? a : b;
          return (
            <div key={key} className="min-w-0 flex-1 basis-64">
              <label htmlFor={`compare-${key}`} className="text-xs font-medium text-ink-soft">
                Run {key.toUpperCase()}
              </label>
              <Select id={`compare-${key}`} name={key} defaultValue={chosen?.id ?? ""}>
                {choices.map((r, i) => (
                  <option key={r.id} value={r.id}>
                    #{i + 1} · {r.originalFilename} · {formatDateTime(r.createdAt)}
                  </option>
                ))}
              </Select>
            </div>
          );
        })}
        <button type="submit" className={buttonVariants({ variant: "secondary" })}>
          Compare
        </button>
      </form>

      {!sameBuild ? (
        <p role="alert" className="mb-4 rounded-md border border-verdict-fail/40 bg-verdict-failBg px-3 py-2 text-sm text-verdict-fail">
          Runs A and B belong to different builds. Pick two runs of {build.label} above.
        </p>
      ) : null}
      {a && b && a.id === b.id ? <p className="mb-4 text-sm text-ink-soft">A and B are the same run: pick another one to see what changed.</p> : null}
      {!a || !b ? <p className="mb-4 text-sm text-ink-soft">This build has only one analysed run so far; upload another capture to compare.</p> : null}

      {a && b && sameBuild ? (
        <div className="space-y-5">
          <Card>
            <CardHeader
              title="What changed between them"
              description={`${early!.originalFilename} (${formatDateTime(early!.createdAt)}) → ${late!.originalFilename} (${formatDateTime(late!.createdAt)})`}
            />
            <CardBody className="space-y-1 text-sm">
              {partChanges.length > 0 ? (
                <p>
                  Parts: <span className="num font-mono text-[13px]">{partChanges.join(" · ")}</span>
                </p>
              ) : (
                <p className="text-ink-soft">Same part values in both snapshots.</p>
              )}
              {between.length > 0 ? (
                <ul className="list-disc space-y-0.5 pl-5 text-ink-soft">
                  {between.map((t) => (
                    <li key={t.id}>
                      {tweakLabel(t, topology)} <span className="text-ink-faint">· {formatDateTime(t.createdAt)}</span>
                    </li>
                  ))}
                </ul>
              ) : (
                <p className="text-ink-soft">No tweak was logged between the two runs.</p>
              )}
            </CardBody>
          </Card>

          <Card>
            <CardHeader title="Spectra" description="Both in dBV (re 1 V rms). A solid, B dashed." />
            <CardBody>
              {specA && specB ? (
                <SpectrumOverlayChart
                  a={{ label: label(a, "A"), frequencyHz: specA.frequencyHz, levelsDbv: specA.dBV }}
                  b={{ label: label(b, "B"), frequencyHz: specB.frequencyHz, levelsDbv: specB.dBV }}
                />
              ) : (
                <p className="text-sm text-ink-soft">One of the runs has no spectrum stored (it is not analysed yet, or was analysed before plots were kept).</p>
              )}
            </CardBody>
          </Card>

          <Card>
            <CardHeader
              title="Every figure"
              description="B − A, and which run is better: against the design's target and spec where they set a limit (in spec beats outside it, whatever the other run did), else by the figure's direction (lower THD, higher SINAD)."
            />
            <CardBody>
              <RunComparisonTable
                comparison={comparison!}
                a={{ id: a.id, label: label(a, "A") }}
                b={{ id: b.id, label: label(b, "B") }}
              />
            </CardBody>
          </Card>

          <Card>
            <CardHeader title="Stability" description="Jitter, phase noise, Allan deviation and start-up or ring-down of each run, from its own record." />
            <CardBody>
              <StabilityComparison a={{ label: label(a, "A"), results: a.results }} b={{ label: label(b, "B"), results: b.results }} />
            </CardBody>
          </Card>
        </div>
      ) : null}
    </>
  );
}
