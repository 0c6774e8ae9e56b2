import type { Metadata } from "next";
import Link from "next/link";
import { buttonVariants } from "@/components/ui/button";
import { EmptyState } from "@/components/ui/empty-state";
import { FormMessage } from "@/components/ui/field";
import { PageHeader } from "@/components/ui/page-header";
import { requireUser } from "@/lib/auth/current-user";
import { can } from "@/lib/auth/permissions";

export const metadata: Metadata = { title: "Home" };

const welcome: Record<string, string> = {
  invited: "Your account is ready and you are signed in.",
  "password-reset": "Your new password is saved. Every other device was signed out.",
};

const roleLine: Record<string, string> = {
  viewer: "You can read every project, design, build and run.",
  technician: "You can create builds, log tweaks and upload captures.",
  engineer: "You can create projects, designs and specs, and accept or reject builds.",
  admin: "You can do everything, including inviting people and reading the audit log.",
};

export default async function DashboardPage({ searchParams }: { searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  const user = await requireUser("/dashboard");
  const params = await searchParams;
  const notice = typeof params.welcome === "string" ? welcome[params.welcome] : undefined;
  const firstName = user.name.split(" ")[0];
  return (
    <>
      {notice ? (
        <div className="mb-4">
          <FormMessage tone="success" message={notice} />
        </div>
      ) : null}
      <PageHeader
        title={`Hello, ${firstName}`}
        description={
          <>
            Signed in as <span className="font-medium text-ink">{user.role}</span>. {roleLine[user.role]}
          </>
        }
      />
      <EmptyState
        title="Your builds will show up here"
        action={
          <Link href="/projects" className={buttonVariants({ variant: can(user.role, "project:write") ? "primary" : "secondary" })}>
            Go to projects
          </Link>
        }
      >
        Recent runs, open flags and builds waiting for review appear on this page once your team logs them.
        {can(user.role, "project:write") ? " Start with a project and a design." : " Open a project to find its designs and builds."}
      </EmptyState>
    </>
  );
}
