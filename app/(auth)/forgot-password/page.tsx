import type { Metadata } from "next";
import Link from "next/link";
import { Card, CardBody } from "@/components/ui/card";
import { ForgotPasswordForm } from "./forgot-password-form";

export const metadata: Metadata = { title: "Forgot your password" };

export default function ForgotPasswordPage() {
  return (
    <>
      <h1 className="text-2xl font-semibold tracking-tight">Forgot your password?</h1>
      <p className="mt-1 text-sm text-ink-soft">
        Enter the address you sign in with. We e-mail a link that lets you choose a new password; it works once, for one hour.
      </p>
      <Card className="mt-6">
        <CardBody className="py-5">
          <ForgotPasswordForm />
        </CardBody>
      </Card>
      <p className="mt-6 text-sm">
        <Link href="/sign-in" className="font-medium text-copper underline underline-offset-2">
          Back to sign-in
        </Link>
      </p>
    </>
  );
}
