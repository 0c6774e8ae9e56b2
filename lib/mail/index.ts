export { checkMail, sendMail, type OutgoingMail } from "./send";
export { renderEmail, escapeHtml, type EmailContent } from "./template";
export { MailError } from "./errors";
export type { HeldMessage } from "./held-message";
