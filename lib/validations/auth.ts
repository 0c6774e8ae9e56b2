import "./zod-config";
import { z } from "zod";

/** An e-mail address as typed: trimmed, lower-cased (accounts compare case-insensitively anyway). */
export const emailSchema = z
  .string({ error: "Enter your e-mail address." })
  .trim()
  .min(1, "Enter your e-mail address.")
  .max(254, "An e-mail address has at most 254 characters.")
  .pipe(z.email("Enter an e-mail address like name@lab.example."))
  .transform((v) => v.toLowerCase());

// NIST SP 800-63B: at least 8 characters, long passphrases allowed, no composition rules. We ask for 10.
export const PASSWORD_MIN_LENGTH = 10;
export const newPasswordSchema = z
  .string({ error: "Choose a password." })
  .min(PASSWORD_MIN_LENGTH, `Use at least ${PASSWORD_MIN_LENGTH} characters.`)
  .max(200, "Use at most 200 characters.");

export const personNameSchema = z
  .string({ error: "Enter your name." })
  .trim()
  .min(1, "Enter your name.")
  .max(80, "Use at most 80 characters.");

/**
 * A same-site path to return to after signing in. Anything else (another host, "//evil", "/\\evil")
 * falls back to the dashboard rather than failing the sign-in.
 */
export const nextPathSchema = z
  .string()
  .optional()
  .transform((v) => (v && /^\/(?![/\\])[^\s]*$/.test(v) && !v.startsWith("/sign-in") ? v : "/dashboard"));

export const signInSchema = z.object({
  email: emailSchema,
  password: z.string({ error: "Enter your password." }).min(1, "Enter your password.").max(200, "That password is too long."),
  next: nextPathSchema,
});
export type SignInInput = z.infer<typeof signInSchema>;

export const forgotPasswordSchema = z.object({ email: emailSchema });

/**
 * The profile's "Sign out everywhere" form. A ticked checkbox is sent as "on" and an unticked one is not sent at
 * all (HTML's form submission), so an absent field means "keep the API tokens".
 */
export const signOutEverywhereSchema = z
  .object({ revokeTokens: z.literal("on", { error: "revokeTokens is a checkbox: send \"on\" or leave it out." }).optional() })
  .transform((v) => ({ revokeTokens: v.revokeTokens === "on" }));

function confirmed<T extends { password: string; confirm: string }>(v: T, ctx: z.RefinementCtx) {
  if (v.password !== v.confirm) ctx.addIssue({ code: "custom", path: ["confirm"], message: "The two passwords differ." });
}

export const resetPasswordSchema = z
  .object({ token: z.string().min(20).max(200), password: newPasswordSchema, confirm: z.string() })
  .superRefine(confirmed);

export const acceptInvitationSchema = z
  .object({ token: z.string().min(20).max(200), name: personNameSchema, password: newPasswordSchema, confirm: z.string() })
  .superRefine(confirmed);

export const changePasswordSchema = z
  .object({
    currentPassword: z.string().min(1, "Enter your current password.").max(200),
    password: newPasswordSchema,
    confirm: z.string(),
  })
  .superRefine(confirmed);
