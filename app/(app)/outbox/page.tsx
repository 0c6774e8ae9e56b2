import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { EmptyState } from "@/components/ui/empty-state";
import { PageHeader } from "@/components/ui/page-header";
import { requireUser } from "@/lib/auth/current-user";
import { outboxAvailable } from "@/lib/auth/outbox-available";
import { can } from "@/lib/auth/permissions";
import { listOutboxFor } from "@/lib/mail/outbox-view";
import type { HeldMessage } from "@/lib/mail";
import { ForbiddenNotice } from "../forbidden-notice";
import { formatUtc } from "../format-time";

export const metadata: Metadata = { title: "Outbox" };
export const dynamic = "force-dynamic";

export default async function OutboxPage() {
  const user = await requireUser("/outbox");
  if (!outboxAvailable()) notFound();
  // The held messages carry invitation and password-reset links, hence the admin role (people:manage).
  if (!can(user.role, "people:manage")) {
    return (
      <ForbiddenNotice
        message={`The outbox shows every e-mail Tankbook sent, with their invitation and password-reset links, so only admins read it; your role is ${user.role}.`}
      />
    );
  }
  let messages: HeldMessage[] = [];
  let problem: string | null = null;
  try {
    messages = await listOutboxFor(user);
  } catch (err) {
    problem = err instanceof Error ? err.message : String(err);
  }
  return (
    <>
      <PageHeader
        title="Outbox"
        description="Development only: every e-mail Tankbook sent, as the local fake mail server holds it. Nothing here left this machine. Password-reset links of other accounts are hidden outside npm run dev."
      />
      {problem ? (
        <p role="alert" className="rounded-md border border-verdict-fail/40 bg-verdict-failBg px-3 py-2 text-sm text-verdict-fail">
          {problem}
        </p>
      ) : messages.length === 0 ? (
        <EmptyState title="No e-mail sent yet">Invite someone or ask for a password reset; the message shows up here.</EmptyState>
      ) : (
        <ul className="space-y-2">
          {messages.map((m) => (
            <li key={m.id}>
              <details className="rounded-lg border border-rule bg-paper-raised">
                <summary className="flex cursor-pointer flex-wrap gap-x-3 gap-y-0.5 px-4 py-2.5 text-sm">
                  <span className="font-medium">{m.subject || "(no subject)"}</span>
                  <span className="text-ink-soft">to {m.to.join(", ")}</span>
                  <span className="num ml-auto text-xs text-ink-faint">{formatUtc(m.receivedAt)}</span>
                </summary>
                <pre className="overflow-x-auto whitespace-pre-wrap break-words border-t border-rule px-4 py-3 font-mono text-xs leading-relaxed">{m.text}</pre>
              </details>
            </li>
          ))}
        </ul>
      )}
    </>
  );
}
