import { afterAll, describe, expect, it } from "vitest";
import { closeDb } from "@/db/index";
import { getBuildTableRow, getDashboardCounts, listBuildTable, listBuildsNeedingAttention, listLatestRuns, listMyBuilds } from "@/db/queries/dashboard";
import { acceptBuild, followBuild, unfollowBuild } from "@/lib/logbook/review";
import { META, failing, finishRun, logRun, makeBuild, makePerson } from "./fixtures";

afterAll(async () => {
  await closeDb();
});

/** One project with a build in every state. Frequencies: worst-case band of the fixture design ≈ 2.09–2.43 MHz. */
async function projectWithEveryState() {
  const engineer = await makePerson("engineer");
  const tech = await makePerson("technician");
  const first = await makeBuild({ owner: engineer, builtBy: tech, label: "A-none" });
  const make = (label: string) => makeBuild({ owner: engineer, label, projectId: first.projectId });
  const none = first;
  const unchecked = await make("B-unchecked");
  await logRun(unchecked, tech);
  const inSpec = await make("C-in-spec");
  await finishRun(inSpec, await logRun(inSpec, tech), [], { measuredHz: 2_250_000, thdPercent: 0.4, driftPpm: -50 });
  const flagged = await make("D-flagged");
  await finishRun(flagged, await logRun(flagged, tech), [failing("harmonic-2")], { measuredHz: 2_240_000, thdPercent: 3.2, driftPpm: 400 });
  const drifting = await make("E-outside-band");
  await finishRun(drifting, await logRun(drifting, tech), [], { measuredHz: 1_500_000, thdPercent: 0.9, driftPpm: -333_000 });
  const accepted = await make("F-accepted");
  await finishRun(accepted, await logRun(accepted, tech), [failing("thd", 3, 2)], { measuredHz: 2_230_000, thdPercent: 3 });
  await acceptBuild(engineer, { buildId: accepted.buildId, reason: "THD is fine for this use." }, META);
  return { engineer, tech, projectId: first.projectId, builds: { none, unchecked, inSpec, flagged, drifting, accepted } };
}

const labels = (rows: { label: string }[]) => rows.map((r) => r.label);

describe("listBuildTable", () => {
  it("gives_each_build_its_state_and_latest_analysed_numbers", async () => {
    const { projectId, builds } = await projectWithEveryState();
    const page = await listBuildTable({ projectId, sort: "label", direction: "asc" });
    expect(page.total).toBe(6);
    expect(page.items.map((r) => [r.label, r.state])).toEqual([
      ["A-none", "no-runs"],
      ["B-unchecked", "unchecked"],
      ["C-in-spec", "in-spec"],
      ["D-flagged", "flagged"],
      ["E-outside-band", "in-spec"],
      ["F-accepted", "accepted"],
    ]);
    const inSpec = page.items[2];
    expect(inSpec.latestRun).toMatchObject({ measuredHz: 2_250_000, thdPercent: 0.4, driftPpm: -50, verdict: "pass", outsideBand: false });
    expect(page.items[4].latestRun?.outsideBand).toBe(true);
    expect(page.items[1].runCount).toBe(1);
    expect(page.items[1].latestRun).toBeNull();
    expect((await getBuildTableRow(builds.flagged.buildId))?.state).toBe("flagged");
  });

  it("filters_by_state_kind_search_and_design", async () => {
    const { projectId, builds } = await projectWithEveryState();
    expect(labels((await listBuildTable({ projectId, state: ["flagged", "accepted"], sort: "label", direction: "asc" })).items)).toEqual(["D-flagged", "F-accepted"]);
    expect(labels((await listBuildTable({ projectId, q: "in-spec" })).items)).toEqual(["C-in-spec"]);
    expect((await listBuildTable({ projectId, kind: "pcb" })).total).toBe(0);
    expect(labels((await listBuildTable({ designId: builds.drifting.designId })).items)).toEqual(["E-outside-band"]);
  });

  it("sorts_on_numbers_with_missing_values_last_in_both_directions", async () => {
    const { projectId } = await projectWithEveryState();
    // 1.50 < 2.23 < 2.24 < 2.25 MHz, then the two builds without a measurement, newest first.
    expect(labels((await listBuildTable({ projectId, sort: "measuredHz", direction: "asc" })).items)).toEqual(["E-outside-band", "F-accepted", "D-flagged", "C-in-spec", "B-unchecked", "A-none"]);
    const byThd = labels((await listBuildTable({ projectId, sort: "thdPercent", direction: "desc" })).items);
    expect(byThd.slice(0, 4)).toEqual(["D-flagged", "F-accepted", "E-outside-band", "C-in-spec"]);
    expect(byThd.slice(4).sort()).toEqual(["A-none", "B-unchecked"]);
    const byDrift = labels((await listBuildTable({ projectId, sort: "absDriftPpm", direction: "desc" })).items);
    expect(byDrift[0]).toBe("E-outside-band");
    expect(labels((await listBuildTable({ projectId, sort: "state", direction: "asc" })).items)[0]).toBe("D-flagged");
  });

  it("pages_on_the_server_with_a_total", async () => {
    const { projectId } = await projectWithEveryState();
    const p1 = await listBuildTable({ projectId, sort: "label", direction: "asc", pageSize: 4, page: 1 });
    const p2 = await listBuildTable({ projectId, sort: "label", direction: "asc", pageSize: 4, page: 2 });
    const p3 = await listBuildTable({ projectId, sort: "label", direction: "asc", pageSize: 4, page: 3 });
    expect([p1.total, p1.pageCount, p1.items.length, p2.items.length]).toEqual([6, 2, 4, 2]);
    expect(labels([...p1.items, ...p2.items])).toEqual(["A-none", "B-unchecked", "C-in-spec", "D-flagged", "E-outside-band", "F-accepted"]);
    expect(p3).toMatchObject({ items: [], total: 6, page: 3 });
  });
});

describe("listBuildsNeedingAttention", () => {
  it("lists_open_builds_flagged_or_outside_the_band_with_reasons", async () => {
    const { projectId } = await projectWithEveryState();
    const rows = await listBuildsNeedingAttention({ projectId });
    expect(rows.map((r) => [r.label, r.reasons, r.failingRules, r.unacknowledgedFlagCount])).toEqual([
      ["E-outside-band", ["outside-band"], [], 0],
      ["D-flagged", ["flagged"], ["harmonic-2"], 1],
    ]);
  });
});

describe("listMyBuilds", () => {
  it("holds_what_a_person_built_or_follows_minus_unfollowed_follows", async () => {
    const { tech, engineer, builds } = await projectWithEveryState();
    expect(labels(await listMyBuilds(tech.id))).toEqual(["A-none"]);
    await followBuild(tech, { buildId: builds.flagged.buildId }, META);
    expect(labels(await listMyBuilds(tech.id)).sort()).toEqual(["A-none", "D-flagged"]);
    await unfollowBuild(tech, { buildId: builds.flagged.buildId }, META);
    expect(labels(await listMyBuilds(tech.id))).toEqual(["A-none"]);
    expect((await listMyBuilds(engineer.id)).length).toBe(6);
  });
});

describe("listLatestRuns and getDashboardCounts", () => {
  it("shows_the_newest_runs_across_projects_with_their_build_and_project", async () => {
    const { projectId, builds } = await projectWithEveryState();
    const runs = await listLatestRuns({ projectId, limit: 3 });
    expect(runs.map((r) => r.buildLabel)).toEqual(["F-accepted", "E-outside-band", "D-flagged"]);
    expect(runs[0]).toMatchObject({ projectId, designId: builds.accepted.designId, verdict: "fail", status: "done" });
    const counts = await getDashboardCounts();
    expect(counts.buildsByState.flagged).toBeGreaterThanOrEqual(1);
    expect(counts.needingAttention).toBeGreaterThanOrEqual(2);
  });
});

