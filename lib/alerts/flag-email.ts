import { renderEmail } from "@/lib/mail/template";
import type { FollowVia } from "@/db/queries/follows";

// The alert e-mail: which rules newly fail on which build, the run's verdict, and one link to the run page.
// Every value goes through renderEmail, which escapes it for the HTML part.

/** A flagged rule as the e-mail lists it. */
export interface AlertFlag {
  rule: string;
  message: string;
}

export interface FlagEmailInput {
  build: { label: string; designName: string; projectName: string };
  run: { originalFilename: string; createdAt: Date; createdByName: string; checkCount: number };
  /** Rules failing for the first time since they last passed (the reason for this e-mail). */
  newFlags: AlertFlag[];
  /** Rules this run also fails that were already e-mailed. */
  stillFailing: string[];
  runUrl: string;
  /** Why this person gets the e-mail. */
  reason: FollowVia | "all";
}

/** A rule id in words: "harmonic-3" → "harmonic 3", "warning-not-steady" → "not steady". */
export function ruleLabel(rule: string): string {
  if (rule === "thd") return "THD";
  if (rule === "in-record-drift") return "in-record drift";
  if (rule === "start-up") return "start-up time";
  if (rule === "tempco") return "temperature coefficient";
  const harmonic = /^harmonic-(\d+)$/.exec(rule);
  if (harmonic) return `harmonic ${harmonic[1]}`;
  if (rule.startsWith("warning-")) return rule.slice("warning-".length).replace(/-/g, " ");
  return rule.replace(/-/g, " ");
}

// Numeric runs compare as numbers, so "harmonic 2" comes before "harmonic 10".
const naturalOrder = new Intl.Collator("en", { numeric: true, sensitivity: "base" });

/** Rule ids in the order a reader expects their names: natural order of {@link ruleLabel}. */
export function compareRules(a: string, b: string): number {
  return naturalOrder.compare(ruleLabel(a), ruleLabel(b));
}

const REASONS: Record<FollowVia | "all", string> = {
  build: "you follow this build",
  project: "you follow its project",
  maker: "you created or built this build",
  all: "your profile asks for the flags of every build",
};

function utc(date: Date): string {
  return `${date.toISOString().slice(0, 16).replace("T", " ")} UTC`;
}

/**
 * Subject and both bodies of one alert e-mail.
 * @throws TypeError when runUrl is not an http(s) URL (from renderEmail)
 */
export function renderFlagEmail(input: FlagEmailInput): { subject: string; text: string; html: string } {
  const { build, run } = input;
  const newFlags = [...input.newFlags].sort((a, b) => compareRules(a.rule, b.rule));
  const stillFailing = [...input.stillFailing].sort(compareRules);
  const failedCount = newFlags.length + stillFailing.length;
  const names = newFlags.map((f) => ruleLabel(f.rule));
  const subject = `Spec flag on ${build.label} (${build.designName}): ${names.join(", ")}`;
  const paragraphs = [
    `A run of build ${build.label} (design ${build.designName}, project ${build.projectName}) failed its spec: ` +
      `${failedCount} of ${run.checkCount} ${run.checkCount === 1 ? "check" : "checks"} failed. ` +
      `Capture ${run.originalFilename}, logged by ${run.createdByName} on ${utc(run.createdAt)}.`,
    `${newFlags.length === 1 ? "Newly failing rule" : "Newly failing rules"}:`,
    ...newFlags.map((f) => `• ${ruleLabel(f.rule)}: ${f.message}`),
  ];
  if (stillFailing.length > 0) {
    paragraphs.push(`Still failing, already reported: ${stillFailing.map(ruleLabel).join(", ")}.`);
  }
  paragraphs.push(
    "You will not get another e-mail about these rules on this build until a run passes them again.",
    `You get this because ${REASONS[input.reason]}. Unfollow the build, or change your notification choice in your profile.`,
  );
  const bodies = renderEmail({
    title: `${build.label}: ${names.length === 1 ? "a spec rule" : `${names.length} spec rules`} newly failing`,
    paragraphs,
    action: { label: "Open the run", url: input.runUrl },
  });
  return { subject, ...bodies };
}
