import type { Metadata } from "next";
import Link from "next/link";
import { Card, CardBody } from "@/components/ui/card";
import { EmptyState } from "@/components/ui/empty-state";
import { getPasswordResetAccount, RESET_LINK_INVALID_MESSAGE } from "@/lib/auth/password-reset";
import { ResetPasswordForm } from "./reset-password-form";

export const metadata: Metadata = { title: "Choose a new password", referrer: "no-referrer" };

export default async function ResetPasswordPage({ params }: { params: Promise<{ token: string }> }) {
  const { token } = await params;
  const account = token.length <= 200 ? await getPasswordResetAccount(token) : null;
  if (!account) {
    return (
      <EmptyState
        title="This link no longer works"
        action={
          <Link href="/forgot-password" className="font-medium text-copper underline underline-offset-2">
            Send a new reset link
          </Link>
        }
      >
        {RESET_LINK_INVALID_MESSAGE}
      </EmptyState>
    );
  }
  return (
    <>
      <h1 className="text-2xl font-semibold tracking-tight">Choose a new password</h1>
      <p className="mt-1 text-sm text-ink-soft">
        For <span className="font-medium text-ink">{account.email}</span>. Saving it signs you out on every other device.
      </p>
      <Card className="mt-6">
        <CardBody className="py-5">
          <ResetPasswordForm token={token} email={account.email} />
        </CardBody>
      </Card>
    </>
  );
}
