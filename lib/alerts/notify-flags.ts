import { db } from "@/db/index";
import { claimAlerts, clearPassedAlerts, getLatestAnalysedRunId, lockBuildForAlerts, releaseAlerts } from "@/db/queries/alerts";
import { recordAudit } from "@/db/queries/audit";
import { getBuild } from "@/db/queries/builds";
import { listRunFlags } from "@/db/queries/flags";
import { listAlertRecipients } from "@/db/queries/follows";
import { getRun } from "@/db/queries/runs";
import { env } from "@/lib/env";
import { sendMail } from "@/lib/mail/send";
import { renderFlagEmail, type AlertFlag } from "./flag-email";

/** What one call did; for logs and tests. */
export interface NotifyResult {
  /** Why nothing was decided: the run is gone, not analysed, or not the build's latest analysed run. */
  skipped?: "no-run" | "not-done" | "not-latest";
  /** Rules e-mailed for the first time in this failing streak. */
  newRules: string[];
  /** Rules that passed again, so their next failure e-mails. */
  clearedRules: string[];
  /** Addresses the e-mail went to. */
  sentTo: string[];
  /** Addresses it could not go to (the mail server refused or was down). */
  failedTo: string[];
}

export interface NotifyOptions {
  /** Where failures are written; console.error by default. */
  log?: (line: string) => void;
}

/** The run page link (APP_URL + /runs/<id>, the logbook pages' route). */
export function runUrl(runId: string): string {
  return `${env().APP_URL.replace(/\/+$/, "")}/runs/${encodeURIComponent(runId)}`;
}

/**
 * After an analysis: decides which of the build's spec rules newly fail and e-mails every follower once per build
 * and rule, until that rule passes again (one e-mail may list several rules). Only the build's latest analysed
 * run decides; rules it does not flag are cleared. Each e-mail sent is recorded in the audit log.
 *
 * Never throws: a mail or database failure is logged and reported in the result, so it cannot fail the analysis.
 * When no e-mail could go out at all, the rules are not marked, so the next failing run tries again.
 *
 * @param runId - the run whose analysis just finished (results and flags stored)
 */
export async function notifyFlags(runId: string, options: NotifyOptions = {}): Promise<NotifyResult> {
  const log = options.log ?? ((line: string) => console.error(line));
  const result: NotifyResult = { newRules: [], clearedRules: [], sentTo: [], failedTo: [] };
  try {
    const run = await getRun(runId);
    if (!run) return { ...result, skipped: "no-run" };
    if (run.status !== "done") return { ...result, skipped: "not-done" };

    const decided = await db().transaction(async (trx) => {
      if (!(await lockBuildForAlerts(run.buildId, trx))) return null;
      if ((await getLatestAnalysedRunId(run.buildId, trx)) !== runId) return null;
      const flags = await listRunFlags(runId, trx);
      const failing = [...new Set(flags.map((f) => f.rule))].sort();
      const cleared = await clearPassedAlerts(run.buildId, failing, trx);
      const claimed = await claimAlerts(run.buildId, runId, failing, trx);
      const recipients = claimed.length > 0 ? await listAlertRecipients(run.buildId, trx) : [];
      return { flags, failing, cleared, claimed, recipients };
    });
    if (!decided) return { ...result, skipped: "not-latest" };
    result.clearedRules = decided.cleared;
    result.newRules = decided.claimed;
    if (decided.claimed.length === 0 || decided.recipients.length === 0) return result;

    const build = await getBuild(run.buildId);
    if (!build) return result;
    const claimedSet = new Set(decided.claimed);
    const newFlags: AlertFlag[] = decided.flags.filter((f) => claimedSet.has(f.rule)).map((f) => ({ rule: f.rule, message: f.message }));
    const stillFailing = decided.failing.filter((r) => !claimedSet.has(r));
    const url = runUrl(runId);

    // Outside the transaction: the build row is not held locked while the mail server answers.
    for (const person of decided.recipients) {
      try {
        const mail = renderFlagEmail({
          build: { label: build.label, designName: build.designName, projectName: build.projectName },
          run: { originalFilename: run.originalFilename, createdAt: run.createdAt, createdByName: run.createdByName, checkCount: run.specChecks?.length ?? decided.failing.length },
          newFlags,
          stillFailing,
          runUrl: url,
          reason: person.reason,
        });
        await sendMail({ to: person.email, ...mail });
        result.sentTo.push(person.email);
      } catch (err) {
        result.failedTo.push(person.email);
        log(`alert for run ${runId} to ${person.email} failed: ${err instanceof Error ? err.message : String(err)}`);
      }
    }

    if (result.sentTo.length === 0) {
      // Nothing went out: forget the marks this call made, so a later failing run e-mails instead of staying quiet.
      await releaseAlerts(run.buildId, runId, decided.claimed);
      result.newRules = [];
      return result;
    }
    await recordAudit({
      actorId: null,
      action: "alert.sent",
      entityType: "build",
      entityId: run.buildId,
      detail: {
        runId,
        rules: decided.claimed,
        stillFailing,
        recipients: decided.recipients.filter((p) => result.sentTo.includes(p.email)).map((p) => p.userId),
        failedRecipients: decided.recipients.filter((p) => result.failedTo.includes(p.email)).map((p) => p.userId),
      },
    });
    return result;
  } catch (err) {
    log(`alerts for run ${runId} failed: ${err instanceof Error ? err.message : String(err)}`);
    return result;
  }
}
