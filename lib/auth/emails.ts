import { renderEmail, sendMail } from "@/lib/mail";
import { env } from "@/lib/env";
import type { Role } from "./permissions";

// The account e-mails. Links are built from APP_URL so they work from the mail client, not only from the app.

function link(path: string): string {
  return `${env().APP_URL.replace(/\/+$/, "")}${path}`;
}

/** Sends the invitation with its single-use link. */
export async function sendInvitationEmail(input: { to: string; role: Role; inviterName: string; token: string; expiresAt: Date }): Promise<void> {
  const content = renderEmail({
    title: "You are invited to Tankbook",
    paragraphs: [
      `${input.inviterName} invited you to your lab's Tankbook, the bench logbook for LC oscillator builds, as ${input.role === "admin" || input.role === "engineer" ? "an" : "a"} ${input.role}.`,
      "Open the link to choose your name and password. It works once and expires on " + formatUtc(input.expiresAt) + ".",
      "If you did not expect this, ignore the message; nothing happens until the link is used.",
    ],
    action: { label: "Accept the invitation", url: link(`/invitation/${input.token}`) },
  });
  await sendMail({ to: input.to, subject: "Your invitation to Tankbook", ...content });
}

/** Sends the password-reset link. */
export async function sendPasswordResetEmail(input: { to: string; name: string; token: string; expiresAt: Date }): Promise<void> {
  const content = renderEmail({
    title: "Reset your Tankbook password",
    paragraphs: [
      `Hello ${input.name}, someone (hopefully you) asked to reset the password of this Tankbook account.`,
      `The link works once and expires on ${formatUtc(input.expiresAt)}. Using it signs you out on every other device.`,
      "If you did not ask for this, ignore the message: your password stays as it is.",
    ],
    action: { label: "Choose a new password", url: link(`/reset-password/${input.token}`) },
  });
  await sendMail({ to: input.to, subject: "Reset your Tankbook password", ...content });
}

function formatUtc(date: Date): string {
  return `${date.toISOString().slice(0, 16).replace("T", " ")} UTC`;
}
