import type { Metadata } from "next";
import { Card, CardBody, CardHeader } from "@/components/ui/card";
import { Table, Td, Th, Tr } from "@/components/ui/data-table";
import { EmptyState } from "@/components/ui/empty-state";
import { PageHeader } from "@/components/ui/page-header";
import { listApiTokens } from "@/db/queries/api-tokens";
import { getNotificationPreferences } from "@/db/queries/notification-preferences";
import { listSessions } from "@/db/queries/sessions";
import { requireUser } from "@/lib/auth/current-user";
import { signOutEverywhereAction } from "../../(auth)/actions";
import { formatUtc } from "../format-time";
import { InlineActionForm } from "../inline-action-form";
import { revokeTokenAction } from "./actions";
import { CreateTokenForm, NameForm, NotificationsForm, PasswordForm } from "./profile-forms";

export const metadata: Metadata = { title: "Profile" };

export default async function ProfilePage() {
  const user = await requireUser("/profile");
  const [tokens, prefs, sessions] = await Promise.all([listApiTokens(user.id), getNotificationPreferences(user.id), listSessions(user.id)]);
  return (
    <>
      <PageHeader title="Profile" description={<>{user.email} · {user.role}</>} />
      <div className="grid gap-6 lg:grid-cols-2">
        <Card>
          <CardHeader title="Your name" />
          <CardBody>
            <NameForm name={user.name} />
          </CardBody>
        </Card>
        <Card>
          <CardHeader title="Password" description="Changing it signs you out on your other devices." />
          <CardBody>
            <PasswordForm />
          </CardBody>
        </Card>
        <Card>
          <CardHeader title="E-mail notifications" />
          <CardBody>
            <NotificationsForm flagEmails={prefs.flagEmails} />
          </CardBody>
        </Card>
        <Card>
          <CardHeader title="Signed-in devices" description={`${sessions.length} active session${sessions.length === 1 ? "" : "s"}, this one included.`} />
          <CardBody>
            <ul className="mb-3 space-y-1 text-xs text-ink-soft">
              {sessions.slice(0, 5).map((s) => (
                <li key={s.id} className="num">
                  since {formatUtc(s.createdAt)} · {s.ip ?? "unknown address"} · {(s.userAgent ?? "unknown browser").slice(0, 60)}
                </li>
              ))}
            </ul>
            <form action={signOutEverywhereAction} className="space-y-3">
              {/* Ticked by default: this button is for "someone else may be in", and a token that person made is the
                  credential an owner forgets. Unticking keeps bench scripts running when only browsers should go. */}
              <label className="flex items-start gap-2 text-sm text-ink">
                <input type="checkbox" name="revokeTokens" value="on" defaultChecked className="mt-0.5 h-4 w-4 accent-copper" />
                <span>
                  Also revoke my API tokens
                  <span className="block text-xs text-ink-soft">Bench scripts using them stop working until you make new ones. Untick to keep them.</span>
                </span>
              </label>
              <button type="submit" className="rounded-md border border-verdict-fail bg-paper-raised px-3 py-1.5 text-sm font-medium text-verdict-fail hover:bg-verdict-failBg">
                Sign out everywhere
              </button>
            </form>
          </CardBody>
        </Card>
      </div>

      <Card className="mt-6">
        <CardHeader
          title="API tokens"
          description="For bench scripts: send Authorization: Bearer <token> to /api/v1. A token acts with your role, is shown once and can be revoked at any time."
        />
        <CardBody className="space-y-4">
          <CreateTokenForm />
          {tokens.length === 0 ? (
            <EmptyState title="No tokens yet">Create one for each script or bench, so you can revoke one without breaking the others.</EmptyState>
          ) : (
            <Table caption="Your API tokens">
              <thead>
                <tr>
                  <Th>Name</Th>
                  <Th>Starts with</Th>
                  <Th>Created</Th>
                  <Th>Last used</Th>
                  <Th>Status</Th>
                </tr>
              </thead>
              <tbody>
                {tokens.map((t) => (
                  <Tr key={t.id}>
                    <Td className="whitespace-nowrap font-medium">{t.name}</Td>
                    <Td className="num whitespace-nowrap font-mono text-[13px]">
                      {t.tokenPrefix}…
                    </Td>
                    <Td className="num whitespace-nowrap font-mono text-[13px]">
                      {formatUtc(t.createdAt)}
                    </Td>
                    <Td className="num whitespace-nowrap font-mono text-[13px]">
                      {t.lastUsedAt ? formatUtc(t.lastUsedAt) : "never"}
                    </Td>
                    <Td>
                      {t.revokedAt ? (
                        <span className="text-xs text-ink-faint">revoked {formatUtc(t.revokedAt)}</span>
                      ) : (
                        <InlineActionForm action={revokeTokenAction} submitLabel="Revoke" variant="danger" submitAriaLabel={`Revoke the token ${t.name}`}>
                          <input type="hidden" name="tokenId" value={t.id} />
                        </InlineActionForm>
                      )}
                    </Td>
                  </Tr>
                ))}
              </tbody>
            </Table>
          )}
        </CardBody>
      </Card>
    </>
  );
}
