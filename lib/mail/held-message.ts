/**
 * One message held by the development fake SMTP server, as its HTTP API returns it.
 * Shared by fake-smtp (which writes it) and lib/mail/outbox (which reads it).
 */
export interface HeldMessage {
  id: string;
  /** ISO 8601 time the fake server accepted the message. */
  receivedAt: string;
  /** The From header as written, e.g. "Tankbook <no-reply@tankbook.test>". */
  from: string;
  /** Envelope recipients (RCPT TO), so Bcc recipients are listed too. */
  to: string[];
  subject: string;
  text: string;
  /** Empty when the message had no HTML part. */
  html: string;
}
