import type { Metadata } from "next";
import { Card, CardBody } from "@/components/ui/card";
import { EmptyState } from "@/components/ui/empty-state";
import { getInvitationForToken, INVITATION_INVALID_MESSAGE } from "@/lib/auth/invitations";
import { AcceptInvitationForm } from "./accept-invitation-form";

export const metadata: Metadata = { title: "Accept your invitation", referrer: "no-referrer" };

export default async function InvitationPage({ params }: { params: Promise<{ token: string }> }) {
  const { token } = await params;
  const invitation = token.length <= 200 ? await getInvitationForToken(token) : null;
  if (!invitation) return <EmptyState title="This invitation no longer works">{INVITATION_INVALID_MESSAGE}</EmptyState>;
  return (
    <>
      <h1 className="text-2xl font-semibold tracking-tight">Welcome to Tankbook</h1>
      <p className="mt-1 text-sm text-ink-soft">
        You are invited as <span className="font-medium text-ink">{invitation.role}</span> with{" "}
        <span className="font-medium text-ink">{invitation.email}</span>. Choose the name your team will see and a password.
      </p>
      <Card className="mt-6">
        <CardBody className="py-5">
          <AcceptInvitationForm token={token} email={invitation.email} />
        </CardBody>
      </Card>
    </>
  );
}
