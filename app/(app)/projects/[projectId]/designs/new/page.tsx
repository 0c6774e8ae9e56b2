import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { Breadcrumbs, trailCrumbs } from "@/components/logbook/breadcrumbs";
import { emptyDraft } from "@/components/logbook/design-draft";
import { DesignForm } from "@/components/logbook/design-form";
import { isRowId } from "@/components/logbook/route-ids";
import { PageHeader } from "@/components/ui/page-header";
import { getProject } from "@/db/queries/projects";
import { requireUser } from "@/lib/auth/current-user";
import { can } from "@/lib/auth/permissions";
import { listConstructionChoicesByTopology } from "@/lib/logbook/layouts";
import { proposeDesignValuesAction } from "@/app/(app)/layouts/actions";
import { createDesignAction } from "../actions";

export const metadata: Metadata = { title: "New design" };

type Props = { params: Promise<{ projectId: string }> };

export default async function NewDesignPage({ params }: Props) {
  const { projectId } = await params;
  const user = await requireUser(`/projects/${projectId}/designs/new`);
  if (!isRowId(projectId)) notFound();
  const project = await getProject(projectId);
  if (!project) notFound();
  const base = `/projects/${projectId}`;
  const canWrite = can(user.role, "design:write");
  // The "start from a target" step aims at this lab's constructions, each with its steady-build count.
  const constructions = canWrite ? await listConstructionChoicesByTopology(user) : null;
  return (
    <>
      <PageHeader
        eyebrow={
          <Breadcrumbs items={trailCrumbs({ projectId, projectName: project.name }, "New design")} />
        }
        title="New design"
        description="Pick the topology, enter the part values with their tolerances, and set the spec. The prediction follows as you type."
      />
      {canWrite && constructions ? (
        <DesignForm
          mode="create"
          action={createDesignAction.bind(null, projectId)}
          initialDraft={emptyDraft("colpitts")}
          cancelHref={base}
          proposal={{ propose: proposeDesignValuesAction, constructions }}
        />
      ) : (
        <p role="alert" className="rounded-md border border-rule bg-paper-raised px-4 py-3 text-sm text-ink-soft">
          Creating designs needs the engineer role; you are signed in as a {user.role}. Ask an engineer or an admin.
        </p>
      )}
    </>
  );
}
