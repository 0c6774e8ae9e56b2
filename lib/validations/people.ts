import { z } from "zod";
import { roles } from "@/lib/auth/permissions";
import { emailSchema, personNameSchema } from "./auth";

export const roleSchema = z.enum(roles, { error: "Choose a role: viewer, technician, engineer or admin." });

// The invitee's address: emailSchema's rules, with the empty case worded for the person sending the invitation.
const inviteeEmailSchema = z
  .string({ error: "Enter the e-mail address of the person you are inviting." })
  .trim()
  .min(1, "Enter the e-mail address of the person you are inviting.")
  .pipe(emailSchema);

export const inviteSchema = z.object({ email: inviteeEmailSchema, role: roleSchema });

export const invitationIdSchema = z.object({ invitationId: z.string().min(1).max(64) });

export const changeRoleSchema = z.object({ userId: z.string().min(1).max(64), role: roleSchema });

export const setStatusSchema = z.object({
  userId: z.string().min(1).max(64),
  status: z.enum(["active", "disabled"], { error: "Status is active or disabled." }),
});

export const profileNameSchema = z.object({ name: personNameSchema });

export const notificationPreferencesSchema = z.object({
  flagEmails: z.enum(["none", "my-builds", "all"], { error: "Choose which flags to be told about." }),
});

/** Query of the audit page and GET /api/v1/audit; bad values fall back to no filter. */
export const auditFilterSchema = z.object({
  actor: z.string().max(64).optional().catch(undefined),
  action: z.string().max(80).optional().catch(undefined),
  entity: z.string().max(40).optional().catch(undefined),
  from: z.iso.date().optional().catch(undefined),
  to: z.iso.date().optional().catch(undefined),
  page: z.coerce.number().int().min(1).max(10_000).default(1).catch(1),
});
