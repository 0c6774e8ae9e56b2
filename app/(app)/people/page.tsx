import type { Metadata } from "next";
import { Card, CardBody, CardHeader } from "@/components/ui/card";
import { Table, Td, Th, Tr } from "@/components/ui/data-table";
import { EmptyState } from "@/components/ui/empty-state";
import { Select } from "@/components/ui/field";
import { PageHeader } from "@/components/ui/page-header";
import { listOpenInvitations } from "@/db/queries/invitations";
import { listUsers } from "@/db/queries/users";
import { requireUser } from "@/lib/auth/current-user";
import { can, roles } from "@/lib/auth/permissions";
import { refusalMessage } from "@/lib/auth/require-permission";
import { ForbiddenNotice } from "../forbidden-notice";
import { formatUtc } from "../format-time";
import { InlineActionForm } from "../inline-action-form";
import { changeRoleAction, resendInvitationAction, revokeInvitationAction, setStatusAction } from "./actions";
import { InviteForm } from "./invite-form";

export const metadata: Metadata = { title: "People" };

export default async function PeoplePage() {
  const me = await requireUser("/people");
  if (!can(me.role, "people:manage")) return <ForbiddenNotice message={refusalMessage(me.role, "people:manage")} />;
  const [people, invitations] = await Promise.all([listUsers(), listOpenInvitations()]);
  const now = Date.now();
  return (
    <>
      <PageHeader title="People" description="Everyone on this Tankbook, their role, and the invitations still open." />
      <Card className="mb-6">
        <CardHeader title="Invite someone" description="They get an e-mail with a link to choose their name and password; it works once, for 7 days." />
        <CardBody>
          <InviteForm />
        </CardBody>
      </Card>

      <h2 className="mb-2 text-sm font-semibold">Accounts</h2>
      <Table caption="Accounts">
        <thead>
          <tr>
            <Th>Name</Th>
            <Th>E-mail</Th>
            <Th>Role</Th>
            <Th>Last seen</Th>
            <Th>Status</Th>
          </tr>
        </thead>
        <tbody>
          {people.map((p) => (
            <Tr key={p.id}>
              <Td className="whitespace-nowrap font-medium">
                {p.name}
                {p.id === me.id ? <span className="ml-1 text-xs font-normal text-ink-faint">(you)</span> : null}
              </Td>
              <Td className="whitespace-nowrap">{p.email}</Td>
              <Td>
                <InlineActionForm action={changeRoleAction} submitLabel="Save" submitAriaLabel={`Save the role of ${p.name}`}>
                  <input type="hidden" name="userId" value={p.id} />
                  {/* Keyed by the saved role: React sets a select's default only when it mounts, so after "Role saved." the
                      form's reset would otherwise show (and a second Save would send) the old role. */}
                  <Select key={p.role} name="role" defaultValue={p.role} aria-label={`Role of ${p.name}`} className="h-8 w-32">
                    {roles.map((r) => (
                      <option key={r} value={r}>
                        {r}
                      </option>
                    ))}
                  </Select>
                </InlineActionForm>
              </Td>
              <Td className="num whitespace-nowrap font-mono text-[13px]">
                {p.lastSeenAt ? formatUtc(p.lastSeenAt) : "never"}
              </Td>
              <Td>
                <InlineActionForm
                  action={setStatusAction}
                  submitLabel={p.status === "active" ? "Disable" : "Enable"}
                  submitAriaLabel={`${p.status === "active" ? "Disable" : "Enable"} ${p.name}`}
                  variant={p.status === "active" ? "danger" : "secondary"}
                >
                  <span className="text-xs font-semibold">{p.status === "active" ? "Active" : "Disabled"}</span>
                  <input type="hidden" name="userId" value={p.id} />
                  <input type="hidden" name="status" value={p.status === "active" ? "disabled" : "active"} />
                </InlineActionForm>
              </Td>
            </Tr>
          ))}
        </tbody>
      </Table>

      <h2 className="mb-2 mt-8 text-sm font-semibold">Open invitations</h2>
      {invitations.length === 0 ? (
        <EmptyState title="No open invitations">Invitations appear here until they are accepted or revoked.</EmptyState>
      ) : (
        <Table caption="Open invitations">
          <thead>
            <tr>
              <Th>E-mail</Th>
              <Th>Role</Th>
              <Th>Invited by</Th>
              <Th>Expires</Th>
              <Th>
                <span className="sr-only">Actions</span>
              </Th>
            </tr>
          </thead>
          <tbody>
            {invitations.map((inv) => (
              <Tr key={inv.id}>
                <Td className="whitespace-nowrap">{inv.email}</Td>
                <Td>{inv.role}</Td>
                <Td>{inv.invitedByName ?? "—"}</Td>
                <Td className="num whitespace-nowrap font-mono text-[13px]">
                  {inv.expiresAt.getTime() < now ? <span className="font-semibold text-verdict-warn">expired </span> : null}
                  {formatUtc(inv.expiresAt)}
                </Td>
                <Td>
                  <div className="flex flex-wrap gap-2">
                    <InlineActionForm action={resendInvitationAction} submitLabel="Resend" submitAriaLabel={`Resend the invitation to ${inv.email}`}>
                      <input type="hidden" name="invitationId" value={inv.id} />
                    </InlineActionForm>
                    <InlineActionForm action={revokeInvitationAction} submitLabel="Revoke" variant="danger" submitAriaLabel={`Revoke the invitation to ${inv.email}`}>
                      <input type="hidden" name="invitationId" value={inv.id} />
                    </InlineActionForm>
                  </div>
                </Td>
              </Tr>
            ))}
          </tbody>
        </Table>
      )}
    </>
  );
}
