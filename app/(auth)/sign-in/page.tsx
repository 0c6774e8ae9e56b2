import type { Metadata } from "next";
import { redirect } from "next/navigation";
import { Card, CardBody } from "@/components/ui/card";
import { FormMessage } from "@/components/ui/field";
import { getCurrentUser } from "@/lib/auth/current-user";
import { nextPathSchema } from "@/lib/validations/auth";
import { SignInForm } from "./sign-in-form";

export const metadata: Metadata = { title: "Sign in" };

const notices: Record<string, string> = {
  "1": "You are signed out.",
  everywhere: "You are signed out on every device. Your API tokens still work.",
  "everywhere-tokens": "You are signed out on every device, and your API tokens are revoked.",
};

export default async function SignInPage({ searchParams }: { searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  const params = await searchParams;
  const next = nextPathSchema.parse(typeof params.next === "string" ? params.next : undefined);
  if (await getCurrentUser()) redirect(next);
  const signedOut = typeof params["signed-out"] === "string" ? notices[params["signed-out"]] : undefined;
  return (
    <>
      <h1 className="text-2xl font-semibold tracking-tight">Sign in to Tankbook</h1>
      <p className="mt-1 text-sm text-ink-soft">Use the e-mail address your lab&apos;s admin invited.</p>
      {signedOut ? (
        <div className="mt-4">
          <FormMessage tone="success" message={signedOut} />
        </div>
      ) : null}
      <Card className="mt-6">
        <CardBody className="py-5">
          <SignInForm next={next === "/dashboard" ? undefined : next} />
        </CardBody>
      </Card>
      <p className="mt-6 text-sm text-ink-soft">
        No account yet? Tankbook accounts are created by invitation: ask your lab&apos;s Tankbook admin.
      </p>
    </>
  );
}
