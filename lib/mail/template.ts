/** Escape text for HTML element content and double-quoted attribute values. */
export function escapeHtml(value: string): string {
  return value
    .replace(/&/g, "&amp;")
    .replace(/</g, "&lt;")
    .replace(/>/g, "&gt;")
    .replace(/"/g, "&quot;")
    .replace(/'/g, "&#39;");
}

/** Content of one email in our own plain layout. */
export interface EmailContent {
  title: string;
  paragraphs: string[];
  /** One call to action, e.g. a sign-in link; the URL must be http(s). */
  action?: { label: string; url: string };
}

function checkActionUrl(url: string): void {
  let parsed: URL;
  try {
    parsed = new URL(url);
  } catch {
    throw new TypeError(`email action url must be an absolute http(s) URL; got ${JSON.stringify(url)}`);
  }
  if (parsed.protocol !== "http:" && parsed.protocol !== "https:") {
    throw new TypeError(`email action url must use http or https; got ${JSON.stringify(url)}`);
  }
}

/**
 * Render an email as plain text and HTML. Every interpolated value is HTML-escaped, so user-supplied
 * names or notes can go in as they are.
 * @returns both bodies, ready for sendMail
 * @throws TypeError when action.url is not an http(s) URL
 */
export function renderEmail(content: EmailContent): { text: string; html: string } {
  if (content.action) checkActionUrl(content.action.url);

  const textParts = [content.title, "", ...content.paragraphs.flatMap((p) => [p, ""])];
  if (content.action) textParts.push(`${content.action.label}: ${content.action.url}`, "");
  textParts.push("--", "Sent by Tankbook, the bench logbook for LC oscillator builds.");
  const text = textParts.join("\n");

  const paragraphs = content.paragraphs
    .map((p) => `<p style="margin:0 0 14px;line-height:1.5">${escapeHtml(p)}</p>`)
    .join("\n");
  const action = content.action
    ? `<p style="margin:20px 0"><a href="${escapeHtml(content.action.url)}" style="display:inline-block;padding:9px 16px;border-radius:4px;background:#1f4e5f;color:#ffffff;text-decoration:none;font-weight:600">${escapeHtml(content.action.label)}</a></p>
<p style="margin:0 0 14px;font-size:13px;color:#5b6770;word-break:break-all">${escapeHtml(content.action.url)}</p>`
    : "";
  const html = `<!doctype html>
<html lang="en">
<head><meta charset="utf-8"><meta name="viewport" content="width=device-width"><title>${escapeHtml(content.title)}</title></head>
<body style="margin:0;padding:24px 12px;background:#f4f5f6;font-family:system-ui,-apple-system,'Segoe UI',sans-serif;font-size:15px;color:#1d2429">
<div style="max-width:560px;margin:0 auto;background:#ffffff;border:1px solid #dde1e4;border-radius:6px;padding:24px 28px">
<p style="margin:0 0 18px;font-size:13px;font-weight:600;letter-spacing:0.04em;color:#1f4e5f">TANKBOOK</p>
<h1 style="margin:0 0 16px;font-size:19px;font-weight:600">${escapeHtml(content.title)}</h1>
${paragraphs}
${action}
<p style="margin:24px 0 0;padding-top:12px;border-top:1px solid #e6e9eb;font-size:12px;color:#5b6770">Sent by Tankbook, the bench logbook for LC oscillator builds.</p>
</div>
</body>
</html>`;
  return { text, html };
}
