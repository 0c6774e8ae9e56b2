import { mkdtemp, rm } from "node:fs/promises";
import os from "node:os";
import path from "node:path";
import { afterAll, beforeAll, describe, expect, it, vi } from "vitest";
import { startFakeSmtp, type FakeSmtp } from "../../fake-smtp/server";

// This file starts its own fake SMTP on ephemeral ports, even when `npm test` already runs one for the
// stack, and points process.env at it. lib/env caches the environment on first read, so the lib is
// imported afresh (vi.resetModules) after process.env is set.
type MailLib = typeof import("../../lib/mail");
type OutboxLib = typeof import("../../lib/mail/outbox");

let dir: string;
let smtp: FakeSmtp;
let mail: MailLib;
let outbox: OutboxLib;

const MAX_BYTES = 1024 * 1024;

function restart(): Promise<FakeSmtp> {
  // Same ports as before, so the environment the lib already read stays right.
  return startFakeSmtp({
    smtpPort: smtp.smtpPort,
    apiPort: Number(new URL(smtp.apiUrl).port),
    directory: dir,
    maxMessageBytes: MAX_BYTES,
  });
}

beforeAll(async () => {
  dir = await mkdtemp(path.join(os.tmpdir(), "tankbook-smtp-"));
  // A 1 MiB limit here (10 MiB by default) keeps the oversize test quick; the code path is the same.
  smtp = await startFakeSmtp({ smtpPort: 0, apiPort: 0, directory: dir, maxMessageBytes: MAX_BYTES });
  Object.assign(process.env, {
    SMTP_HOST: smtp.smtpHost,
    SMTP_PORT: String(smtp.smtpPort),
    SMTP_SECURE: "false",
    MAIL_FROM: "Tankbook <no-reply@tankbook.test>",
    FAKE_SMTP_API_URL: smtp.apiUrl,
  });
  delete process.env.SMTP_USER;
  delete process.env.SMTP_PASSWORD;
  vi.resetModules();
  mail = await import("../../lib/mail");
  outbox = await import("../../lib/mail/outbox");
});

afterAll(async () => {
  await smtp?.close().catch(() => undefined);
  await rm(dir, { recursive: true, force: true });
});

describe("sendMail", () => {
  it("delivers a message that the fake SMTP then holds, with escaped values in the HTML", async () => {
    await outbox.clearHeldMessages();
    const hostile = '<script>alert("x")</script>';
    const { text, html } = mail.renderEmail({
      title: "Your capture is analysed",
      paragraphs: [`Build ${hostile} finished.`, "Measured 10.702 MHz against 10.700 MHz predicted."],
      action: { label: "Open the run", url: "http://127.0.0.1:3000/runs/r1?a=1&b=2" },
    });
    const messageId = await mail.sendMail({ to: "bench@tankbook.test", subject: "Capture analysed", text, html });
    expect(messageId).toMatch(/^<.+@.+>$/);

    const held = await outbox.listHeldMessages({ to: "bench@tankbook.test" });
    expect(held).toHaveLength(1);
    const [message] = held;
    expect(message.subject).toBe("Capture analysed");
    expect(message.to).toEqual(["bench@tankbook.test"]);
    expect(message.from).toContain("no-reply@tankbook.test");
    expect(message.text).toContain(`Build ${hostile} finished.`);
    expect(message.text).toContain("Open the run: http://127.0.0.1:3000/runs/r1?a=1&b=2");
    expect(message.html).toContain("Build &lt;script&gt;alert(&quot;x&quot;)&lt;/script&gt; finished.");
    expect(message.html).not.toContain("<script>");
    expect(message.html).toContain('href="http://127.0.0.1:3000/runs/r1?a=1&amp;b=2"');
    expect(Date.parse(message.receivedAt)).not.toBeNaN();
    expect(await outbox.getHeldMessage(message.id)).toEqual(message);
  });

  it("throws a rejected MailError (SMTP 552) for a message over the size limit", async () => {
    const text = "x".repeat(MAX_BYTES + 1024);
    await expect(mail.sendMail({ to: "bench@tankbook.test", subject: "too big", text, html: "" })).rejects.toMatchObject({
      name: "MailError",
      kind: "rejected",
      message: expect.stringContaining("552"),
    });
  });

  it("throws TypeError for an empty recipient list", async () => {
    await expect(mail.sendMail({ to: [], subject: "s", text: "t", html: "" })).rejects.toThrow(TypeError);
  });
});

describe("listHeldMessages", () => {
  it("lists newest first and filters by recipient, case-insensitively", async () => {
    await outbox.clearHeldMessages();
    await mail.sendMail({ to: "a@tankbook.test", subject: "first", text: "1", html: "" });
    await mail.sendMail({ to: ["b@tankbook.test", "a@tankbook.test"], subject: "second", text: "2", html: "" });
    await mail.sendMail({ to: "b@tankbook.test", subject: "third", text: "3", html: "" });
    expect((await outbox.listHeldMessages()).map((m) => m.subject)).toEqual(["third", "second", "first"]);
    expect((await outbox.listHeldMessages({ to: "A@tankbook.test" })).map((m) => m.subject)).toEqual(["second", "first"]);
  });

  it("still holds the messages after the fake SMTP restarts", async () => {
    const before = await outbox.listHeldMessages();
    expect(before.length).toBeGreaterThan(0);
    await smtp.close();
    smtp = await restart();
    expect(await outbox.listHeldMessages()).toEqual(before);
  });

  it("returns an empty list after clearHeldMessages, also across a restart", async () => {
    await outbox.clearHeldMessages();
    expect(await outbox.listHeldMessages()).toEqual([]);
    await smtp.close();
    smtp = await restart();
    expect(await outbox.listHeldMessages()).toEqual([]);
  });
  it("throws a clear error when FAKE_SMTP_API_URL is empty", async () => {
    const saved = process.env.FAKE_SMTP_API_URL;
    process.env.FAKE_SMTP_API_URL = "";
    vi.resetModules();
    const bare = await import("../../lib/mail/outbox");
    await expect(bare.listHeldMessages()).rejects.toThrow("FAKE_SMTP_API_URL is empty");
    process.env.FAKE_SMTP_API_URL = saved;
  });
});

describe("checkMail", () => {
  it("is ok while the fake SMTP runs", async () => {
    expect(await mail.checkMail()).toEqual({ ok: true });
  });

  it("says the mail server is unreachable, naming it, once the fake SMTP is closed", async () => {
    await smtp.close();
    const state = await mail.checkMail();
    expect(state.ok).toBe(false);
    expect(!state.ok && state.error).toContain(`Mail server is unreachable at smtp://${smtp.smtpHost}:${smtp.smtpPort}`);
    await expect(outbox.listHeldMessages()).rejects.toThrow(`The fake SMTP server's API is unreachable at ${smtp.apiUrl}`);
    smtp = await restart();
  });
});
