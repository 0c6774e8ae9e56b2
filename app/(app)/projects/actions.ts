"use server";

import { revalidatePath } from "next/cache";
import { redirect } from "next/navigation";
import type { FormState } from "@/lib/auth/action-state";
import { getCurrentUser } from "@/lib/auth/current-user";
import { requestMeta } from "@/lib/auth/request-meta";
import { failedForm, formObject, invalidForm } from "@/lib/logbook/action-helpers";
import { createProject, updateProject } from "@/lib/logbook/projects";
import { projectInputSchema, projectPatchSchema } from "@/lib/validations/project";

/** New project (engineer and above): fields `name`, `purpose`. Redirects to the project on success. */
export async function createProjectAction(_prev: FormState, formData: FormData): Promise<FormState> {
  let projectId: string;
  try {
    const parsed = projectInputSchema.safeParse(formObject(formData));
    if (!parsed.success) return invalidForm(parsed.error, formData);
    const project = await createProject({ user: await getCurrentUser(), ip: (await requestMeta()).ip }, parsed.data);
    projectId = project.id;
  } catch (err) {
    return failedForm(err, formData);
  }
  revalidatePath("/projects");
  redirect(`/projects/${projectId}`);
}

/** Rename a project or change its purpose (engineer and above); bind the id: `updateProjectAction.bind(null, id)`. */
export async function updateProjectAction(projectId: string, _prev: FormState, formData: FormData): Promise<FormState> {
  try {
    const parsed = projectPatchSchema.safeParse(formObject(formData));
    if (!parsed.success) return invalidForm(parsed.error, formData);
    await updateProject({ user: await getCurrentUser(), ip: (await requestMeta()).ip }, projectId, parsed.data);
  } catch (err) {
    return failedForm(err, formData);
  }
  revalidatePath("/projects");
  revalidatePath(`/projects/${projectId}`);
  return { ok: true, message: "Project saved." };
}
