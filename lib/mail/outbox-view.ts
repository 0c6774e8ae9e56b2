import { env } from "../env";
import type { HeldMessage } from "./held-message";
import { listHeldMessages } from "./outbox";

// What the Outbox page may show. A password-reset link lets whoever reads it take over the account it was
// sent to, so an admin reading the outbox must not see the links of other accounts; only `npm run dev`
// (NODE_ENV=development, where nobody's real account lives) shows everything as sent.

export const RESET_LINK_HIDDEN = "[link hidden: it would let whoever reads it take over that account]";

// The token is base64url/hex; stop at whitespace, quotes and angle brackets so HTML attributes stay intact.
const RESET_LINK = /(?:https?:\/\/[^\s"'<>]*)?\/reset-password\/[^\s"'<>]+/g;

/** The message with every password-reset link replaced by RESET_LINK_HIDDEN (text and HTML parts). */
export function redactResetLinks(message: HeldMessage): HeldMessage {
  return {
    ...message,
    text: message.text.replace(RESET_LINK, RESET_LINK_HIDDEN),
    html: message.html.replace(RESET_LINK, RESET_LINK_HIDDEN),
  };
}

/** Whether the viewer is every recipient of the message (case-insensitive), so the links in it are their own. */
function onlyTo(message: HeldMessage, viewerEmail: string): boolean {
  const me = viewerEmail.toLowerCase();
  return message.to.length > 0 && message.to.every((address) => address.toLowerCase() === me);
}

/**
 * Held messages as the viewer may read them on the Outbox page, newest first: in development every message
 * whole; otherwise the viewer's own messages whole and everyone else's with their reset links hidden.
 * @throws Error when FAKE_SMTP_API_URL is empty or the fake SMTP server's API is unreachable
 */
export async function listOutboxFor(viewer: { email: string }): Promise<HeldMessage[]> {
  const messages = await listHeldMessages();
  if (env().NODE_ENV === "development") return messages;
  return messages.map((m) => (onlyTo(m, viewer.email) ? m : redactResetLinks(m)));
}
