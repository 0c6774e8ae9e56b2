import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { Breadcrumbs, trailCrumbs } from "@/components/logbook/breadcrumbs";
import { draftFromRevision } from "@/components/logbook/design-draft";
import { DesignForm } from "@/components/logbook/design-form";
import { isRowId } from "@/components/logbook/route-ids";
import { PageHeader } from "@/components/ui/page-header";
import { getDesign } from "@/db/queries/designs";
import { requireUser } from "@/lib/auth/current-user";
import { can } from "@/lib/auth/permissions";
import { updateDesignAction } from "../../actions";

export const metadata: Metadata = { title: "Edit design" };

type Props = { params: Promise<{ projectId: string; designId: string }> };

export default async function EditDesignPage({ params }: Props) {
  const { projectId, designId } = await params;
  const user = await requireUser(`/projects/${projectId}/designs/${designId}/edit`);
  if (!isRowId(projectId) || !isRowId(designId)) notFound();
  const design = await getDesign(designId);
  if (!design || design.projectId !== projectId) notFound();
  const base = `/projects/${projectId}/designs/${designId}`;
  return (
    <>
      <PageHeader
        eyebrow={
          <Breadcrumbs
            items={trailCrumbs({ projectId, projectName: design.projectName, designId, designName: design.name }, "Edit")}
          />
        }
        title={`Edit ${design.name}`}
        description={`Saving makes revision ${design.currentRevision + 1}. Runs already logged keep the values they were measured against.`}
      />
      {can(user.role, "design:write") ? (
        <DesignForm
          mode="edit"
          action={updateDesignAction.bind(null, designId)}
          initialDraft={draftFromRevision(design.name, design.topology, design.revision)}
          cancelHref={base}
        />
      ) : (
        <p role="alert" className="rounded-md border border-rule bg-paper-raised px-4 py-3 text-sm text-ink-soft">
          Editing designs and specs needs the engineer role; you are signed in as a {user.role}.
        </p>
      )}
    </>
  );
}
