import { afterAll, describe, expect, it } from "vitest";
import { closeDb, db } from "@/db/index";
import { listAlertState } from "@/db/queries/alerts";
import { setNotificationPreferences } from "@/db/queries/notification-preferences";
import { notifyFlags } from "@/lib/alerts";
import { env } from "@/lib/env";
import { followBuild, followProject, unfollowBuild } from "@/lib/logbook/review";
import { listHeldMessages } from "@/lib/mail/outbox";
import { META, auditFor, failing, finishRun, logRun, makeBuild, makePerson } from "../review/fixtures";

// Alerts against the real database and the fake SMTP server: each test uses fresh addresses, so the outbox is
// read with a `to` filter and never cleared (other suites share the server).

afterAll(async () => {
  await closeDb();
});

async function mailTo(email: string) {
  return listHeldMessages({ to: email });
}

describe("notifyFlags", () => {
  it("a_flag_sends_exactly_one_email_to_the_creator_with_the_verdict_and_the_run_link", async () => {
    const engineer = await makePerson("engineer");
    const fx = await makeBuild({ owner: engineer, label: "BB-<alert>&1" });
    const runId = await logRun(fx, engineer, "=cmd.csv");
    await finishRun(fx, runId, [failing("harmonic-2", -35.2)]);

    const result = await notifyFlags(runId);
    expect(result.newRules).toEqual(["harmonic-2"]);
    expect(result.sentTo).toContain(engineer.email);

    const messages = await mailTo(engineer.email);
    expect(messages).toHaveLength(1);
    const [m] = messages;
    expect(m.subject).toMatch(/^Spec flag on BB-<alert>&1 \(Colpitts [0-9a-f]{8}\): harmonic 2$/);
    // fixtures.finishRun stores the frequency check (passed) and one check per failing rule: 1 of 2 failed.
    expect(m.text).toContain("failed its spec: 1 of 2 checks failed");
    expect(m.text).toContain(`${env().APP_URL.replace(/\/+$/, "")}/runs/${runId}`);
    expect(m.text).toContain("harmonic 2: harmonic-2 at -35.2 against -40: outside.");
    expect(m.text).toContain("you created or built this build");
    // Escaped in the HTML part (renderEmail): the label's < > & never reach the markup raw.
    expect(m.html).toContain("BB-&lt;alert&gt;&amp;1");
    expect(m.html).not.toContain("BB-<alert>");

    const audit = await auditFor("alert.sent", fx.buildId);
    expect(audit).toHaveLength(1);
    expect(audit[0].actor_id).toBeNull();
    expect(audit[0].detail).toMatchObject({ runId, rules: ["harmonic-2"] });
    expect(audit[0].detail.recipients).toContain(engineer.id);
  });

  it("the_next_failing_run_of_the_same_rule_sends_nothing_and_a_pass_then_a_failure_sends_again", async () => {
    const tech = await makePerson("technician");
    const fx = await makeBuild({ owner: tech });

    const first = await logRun(fx, tech);
    await finishRun(fx, first, [failing("thd", 3.1, 2)]);
    await notifyFlags(first);
    expect(await mailTo(tech.email)).toHaveLength(1);

    const second = await logRun(fx, tech);
    await finishRun(fx, second, [failing("thd", 3.4, 2)]);
    const quiet = await notifyFlags(second);
    expect(quiet.newRules).toEqual([]);
    expect(quiet.sentTo).toEqual([]);
    expect(await mailTo(tech.email)).toHaveLength(1);

    const passing = await logRun(fx, tech);
    await finishRun(fx, passing, []);
    const cleared = await notifyFlags(passing);
    expect(cleared.clearedRules).toEqual(["thd"]);
    expect(await listAlertState(fx.buildId)).toEqual([]);
    expect(await mailTo(tech.email)).toHaveLength(1);

    const again = await logRun(fx, tech);
    await finishRun(fx, again, [failing("thd", 2.5, 2)]);
    await notifyFlags(again);
    const messages = await mailTo(tech.email);
    expect(messages).toHaveLength(2);
    expect(messages[0].text).toContain(`/runs/${again}`); // newest first
  });

  it("one_email_lists_several_newly_failing_rules_and_names_those_already_reported", async () => {
    const engineer = await makePerson("engineer");
    const fx = await makeBuild({ owner: engineer });
    const a = await logRun(fx, engineer);
    await finishRun(fx, a, [failing("thd", 3, 2)]);
    await notifyFlags(a);
    const b = await logRun(fx, engineer);
    await finishRun(fx, b, [failing("thd", 3, 2), failing("harmonic-2"), failing("harmonic-3")]);
    const result = await notifyFlags(b);
    expect(result.newRules).toEqual(["harmonic-2", "harmonic-3"]);
    const [latest] = await mailTo(engineer.email);
    expect(latest.subject).toMatch(/: harmonic 2, harmonic 3$/);
    expect(latest.text).toContain("Newly failing rules:");
    expect(latest.text).toContain("Still failing, already reported: THD.");
    expect(await mailTo(engineer.email)).toHaveLength(2);
  });

  it("followers_of_the_build_and_of_its_project_are_emailed_honouring_preferences_and_unfollows", async () => {
    const owner = await makePerson("engineer", "owner");
    const buildFollower = await makePerson("viewer", "build-follower");
    const projectFollower = await makePerson("technician", "project-follower");
    const mutedOwnerProjectFollower = await makePerson("engineer", "muted");
    const everything = await makePerson("viewer", "all-flags");
    const nothing = await makePerson("engineer", "no-flags");
    const bystander = await makePerson("viewer", "bystander");
    const fx = await makeBuild({ owner });

    await followBuild(buildFollower, { buildId: fx.buildId }, META);
    await followProject(projectFollower, { projectId: fx.projectId }, META);
    await followProject(mutedOwnerProjectFollower, { projectId: fx.projectId }, META);
    await unfollowBuild(mutedOwnerProjectFollower, { buildId: fx.buildId }, META);
    await setNotificationPreferences(everything.id, { flagEmails: "all" });
    await followBuild(nothing, { buildId: fx.buildId }, META);
    await setNotificationPreferences(nothing.id, { flagEmails: "none" });
    await unfollowBuild(owner, { buildId: fx.buildId }, META);

    const runId = await logRun(fx, owner);
    await finishRun(fx, runId, [failing("frequency", 1.2, 0.5)]);
    const result = await notifyFlags(runId);
    // Other people in the shared database may ask for every build's flags, so only these seven are checked.
    expect(result.sentTo).toEqual(expect.arrayContaining([buildFollower.email, projectFollower.email, everything.email]));
    for (const p of [owner, mutedOwnerProjectFollower, nothing, bystander]) expect(result.sentTo).not.toContain(p.email);

    for (const p of [buildFollower, projectFollower, everything]) expect(await mailTo(p.email)).toHaveLength(1);
    for (const p of [owner, mutedOwnerProjectFollower, nothing, bystander]) expect(await mailTo(p.email)).toHaveLength(0);
    expect((await mailTo(projectFollower.email))[0].text).toContain("you follow its project");
    expect((await mailTo(everything.email))[0].text).toContain("every build");
    // Leave the shared database as found: nobody else's test should start e-mailing this person.
    await db()("auth_user").where({ id: everything.id }).update({ status: "disabled" });
  });

  it("a_disabled_follower_gets_nothing", async () => {
    const owner = await makePerson("engineer");
    const fx = await makeBuild({ owner });
    await db()("auth_user").where({ id: owner.id }).update({ status: "disabled" });
    const runId = await logRun(fx, owner);
    await finishRun(fx, runId, [failing("harmonic-2")]);
    const result = await notifyFlags(runId);
    expect(result.sentTo).not.toContain(owner.email);
    expect(await mailTo(owner.email)).toHaveLength(0);
  });

  it("an_older_run_analysed_after_a_newer_one_decides_nothing", async () => {
    const owner = await makePerson("engineer");
    const fx = await makeBuild({ owner });
    const older = await logRun(fx, owner);
    const newer = await logRun(fx, owner);
    await finishRun(fx, newer, []);
    await notifyFlags(newer);
    await finishRun(fx, older, [failing("harmonic-2")]);
    const result = await notifyFlags(older);
    expect(result.skipped).toBe("not-latest");
    expect(await mailTo(owner.email)).toHaveLength(0);
    expect(await listAlertState(fx.buildId)).toEqual([]);
  });

  it("a_run_not_yet_analysed_or_unknown_is_skipped_without_throwing", async () => {
    const owner = await makePerson("engineer");
    const fx = await makeBuild({ owner });
    const queued = await logRun(fx, owner);
    expect((await notifyFlags(queued)).skipped).toBe("not-done");
    expect((await notifyFlags("00000000-0000-4000-8000-000000000000")).skipped).toBe("no-run");
  });

  it("a_mail_server_that_is_down_is_logged_not_thrown_and_the_rule_stays_unmarked", async () => {
    const owner = await makePerson("engineer");
    const fx = await makeBuild({ owner });
    const runId = await logRun(fx, owner);
    await finishRun(fx, runId, [failing("harmonic-2")]);
    const lines: string[] = [];
    // lib/mail rebuilds its transport whenever the SMTP settings it reads from env() change; point them at the
    // discard port (nothing listens there on loopback) for this one call.
    const settings = env() as { SMTP_PORT: number };
    const port = settings.SMTP_PORT;
    settings.SMTP_PORT = 9;
    try {
      const result = await notifyFlags(runId, { log: (l) => lines.push(l) });
      expect(result.sentTo).toEqual([]);
      expect(result.failedTo).toContain(owner.email);
      expect(result.newRules).toEqual([]);
    } finally {
      settings.SMTP_PORT = port;
    }
    expect(lines.join("\n")).toContain(`alert for run ${runId} to ${owner.email} failed`);
    expect(await listAlertState(fx.buildId)).toEqual([]);
    // With the server back, the same run can alert.
    const retry = await notifyFlags(runId);
    expect(retry.sentTo).toContain(owner.email);
    expect(await mailTo(owner.email)).toHaveLength(1);
  });
});
