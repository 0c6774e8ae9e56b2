import { env } from "../env";
import { MailError, toMailError } from "./errors";
import { createMailTransport, mailServerLabel, mailTransport } from "./transport";

const HEALTH_TIMEOUT_MS = 2_000;

/** One outgoing message; always give both forms (see renderEmail). */
export interface OutgoingMail {
  to: string | string[];
  subject: string;
  text: string;
  html: string;
}

/**
 * Send a message from MAIL_FROM.
 * @returns the Message-ID header nodemailer generated, e.g. "<…@tankbook.test>"
 * @throws MailError when the server is unreachable or refuses the message
 */
export async function sendMail(mail: OutgoingMail): Promise<string> {
  const recipients = Array.isArray(mail.to) ? mail.to : [mail.to];
  if (recipients.length === 0 || recipients.some((r) => r.trim() === "")) {
    throw new TypeError(`sendMail: "to" must name at least one non-empty address; got ${JSON.stringify(mail.to)}`);
  }
  try {
    const info = await mailTransport().sendMail({
      from: env().MAIL_FROM,
      to: recipients,
      subject: mail.subject,
      text: mail.text,
      html: mail.html,
    });
    return info.messageId;
  } catch (err) {
    throw toMailError(err, "send mail", mailServerLabel());
  }
}

/**
 * For /api/health: does the SMTP server answer (and accept our login, if any) within ~2 s?
 * @returns `{ ok: true }` or `{ ok: false, error }` with a readable reason; never throws
 */
export async function checkMail(): Promise<{ ok: true } | { ok: false; error: string }> {
  const e = env();
  const transport = createMailTransport(e, HEALTH_TIMEOUT_MS);
  let timer: NodeJS.Timeout | undefined;
  try {
    await Promise.race([
      transport.verify(),
      new Promise<never>((_, reject) => {
        // Backstop in case a stage nodemailer does not time out (e.g. a slow AUTH) hangs.
        timer = setTimeout(() => reject(new MailError("unreachable", `Mail server at ${mailServerLabel(e)} did not answer within ${HEALTH_TIMEOUT_MS} ms`)), HEALTH_TIMEOUT_MS + 500);
      }),
    ]);
    return { ok: true };
  } catch (err) {
    return { ok: false, error: toMailError(err, "connect", mailServerLabel(e)).message };
  } finally {
    clearTimeout(timer);
    transport.close();
  }
}
