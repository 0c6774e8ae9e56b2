import { randomBytes } from "node:crypto";
import request from "supertest";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb, db } from "@/db/index";
import { closeLucia } from "@/lib/auth/lucia";
import { createPerson, formsOf, getPage, signedInCookie, uniqueIp, waitForMail, type TestPerson } from "../auth/helpers";
import { appUrl } from "../../helpers/stack";

// Whether an address has an account must not show in how long a form takes to answer (OWASP Authentication
// Cheat Sheet, "Authentication and Error Messages": respond in the same time). Both forms send their e-mail after
// the answer, so the answer for an address with an account and for one without do the same work before it.
// Samples alternate (one of each, again and again) so load on the machine hits both alike; the medians are
// compared, which a few slow samples do not move. Every address is a test account or an unused address under
// .test (RFC 2606), and every message lands in the fake SMTP server.

/** How far apart the two medians may be. Before the change the e-mail alone added ≈ 100–140 ms. */
const MEDIAN_TOLERANCE_MS = 20;
const PAIRS = 24;

let admin: TestPerson;
let adminCookie: string;
let existing: TestPerson;

beforeAll(async () => {
  admin = await createPerson("admin", "timing-admin");
  adminCookie = await signedInCookie(admin);
  existing = await createPerson("viewer", "timing-existing");
});

afterAll(async () => {
  await closeDb();
  await closeLucia();
});

const median = (xs: number[]): number => {
  const s = [...xs].sort((a, b) => a - b);
  return s.length % 2 ? s[(s.length - 1) / 2] : (s[s.length / 2 - 1] + s[s.length / 2]) / 2;
};

/** The hidden fields of the form on `path` that `pick` chooses, read once: the action reference stays valid. */
async function formFor(path: string, pick: (inner: string) => boolean, cookie?: string): Promise<Record<string, string>> {
  const page = await getPage(path, cookie);
  expect(page.status).toBe(200);
  const form = formsOf(page.text).find((f) => pick(f.inner));
  if (!form) throw new Error(`no matching form on ${path}`);
  return form.hidden;
}

/** Posts the form as a browser without JavaScript does and returns the answer's text and its time in ms. */
async function timedPost(path: string, hidden: Record<string, string>, fields: Record<string, string>, cookie?: string): Promise<{ ms: number; text: string }> {
  const req = request(appUrl()).post(path).redirects(0).set("origin", new URL(appUrl()).origin).set("x-forwarded-for", uniqueIp());
  if (cookie) req.set("cookie", cookie);
  for (const [k, v] of Object.entries(hidden)) req.field(k, v);
  for (const [k, v] of Object.entries(fields)) req.field(k, v);
  const started = performance.now();
  const res = await req;
  const ms = performance.now() - started;
  expect(res.status, res.text.slice(0, 200)).toBe(200);
  return { ms, text: res.text };
}

const nowhere = (label: string) => `${label}-${randomBytes(5).toString("hex")}@nowhere.test`;

async function interleaved(one: () => Promise<number>, other: () => Promise<number>): Promise<{ one: number; other: number }> {
  // Warm both paths first (the page's first render, connection pools).
  await one();
  await other();
  const a: number[] = [];
  const b: number[] = [];
  for (let i = 0; i < PAIRS; i++) {
    // Alternate which goes first so neither always follows the other's after() work.
    if (i % 2 === 0) {
      a.push(await one());
      b.push(await other());
    } else {
      b.push(await other());
      a.push(await one());
    }
  }
  return { one: median(a), other: median(b) };
}

describe("invitation timing", () => {
  it("answers an address with an account as fast as a new one, which is invited and still gets its e-mail", async () => {
    const isInviteForm = (f: string) => f.includes('id="invite-email"');
    const hidden = await formFor("/people", isInviteForm, adminCookie);
    const invited: string[] = [];
    const result = await interleaved(
      async () => {
        const { ms, text } = await timedPost("/people", hidden, { email: existing.email, role: "viewer" }, adminCookie);
        expect(text).toContain(`${existing.email} already has an account.`);
        return ms;
      },
      async () => {
        const email = nowhere("timing-invitee");
        invited.push(email);
        const { ms, text } = await timedPost("/people", hidden, { email, role: "viewer" }, adminCookie);
        expect(text).toContain(`Invitation sent to ${email} as viewer.`);
        return ms;
      },
    );
    console.log(`invitation medians over ${PAIRS} pairs: address with an account ${result.one.toFixed(1)} ms, new address ${result.other.toFixed(1)} ms`);
    expect(Math.abs(result.one - result.other)).toBeLessThan(MEDIAN_TOLERANCE_MS);
    // The e-mail still goes out after the answer, to every invitee.
    await waitForMail(invited.at(-1)!, /Your invitation to Tankbook/);
    expect(await db()("invitations").whereIn("email", invited).count<{ count: string }[]>("* as count").then((r) => Number(r[0].count))).toBe(invited.length);
  }, 120_000);
});

describe("forgot-password timing", () => {
  it("answers an address with an account as fast as an unknown one, and the account still gets its link", async () => {
    const isForm = (f: string) => f.includes('name="email"');
    const hidden = await formFor("/forgot-password", isForm);
    const result = await interleaved(
      async () => (await timedPost("/forgot-password", hidden, { email: existing.email })).ms,
      async () => (await timedPost("/forgot-password", hidden, { email: nowhere("nobody") })).ms,
    );
    console.log(`forgot-password medians over ${PAIRS} pairs: address with an account ${result.one.toFixed(1)} ms, unknown address ${result.other.toFixed(1)} ms`);
    expect(Math.abs(result.one - result.other)).toBeLessThan(MEDIAN_TOLERANCE_MS);
    await waitForMail(existing.email, /Reset your Tankbook password/);
  }, 120_000);
});
