// A quick re-probe of issue 17's list against the test stack, from outside, as the issue's author probed it:
// `node scripts/bootstrap.mjs test --config scripts/fuzz/vitest.config.ts scripts/fuzz/probe.fuzz.ts`.
// Each probe prints what it sent and what came back; the test fails if any answered as the issue described.
import { randomBytes } from "node:crypto";
import net from "node:net";
import { afterAll, expect, it } from "vitest";
import { closeDb, db } from "../../db/index";
import { listHeldMessages } from "../../lib/mail/outbox";
import { closeLucia } from "../../lib/auth/lucia";
import { closeCampaignClients, createFixture, type Fixture } from "./campaign";

const base = process.env.APP_URL ?? "";
const results: { item: string; probe: string; answer: string; ok: boolean }[] = [];

afterAll(async () => {
  closeCampaignClients();
  await closeDb();
  await closeLucia();
});

function note(item: string, probe: string, answer: string, ok: boolean): void {
  results.push({ item, probe, answer, ok });
}

async function call(method: string, path: string, init: { headers?: Record<string, string>; body?: BodyInit } = {}): Promise<{ status: number; type: string; text: string; headers: Headers; ms: number }> {
  const started = performance.now();
  const res = await fetch(`${base}${path}`, { method, headers: { "x-forwarded-for": `198.19.${randomBytes(1)[0]}.${randomBytes(1)[0] % 250 + 1}`, ...init.headers }, body: init.body, redirect: "manual" });
  const text = await res.text();
  return { status: res.status, type: res.headers.get("content-type") ?? "", text, headers: res.headers, ms: performance.now() - started };
}

function rawHeadStatus(head: string): Promise<{ status: number; ms: number }> {
  const { hostname, port } = new URL(base);
  const started = performance.now();
  return new Promise((resolve) => {
    const s = net.connect({ host: hostname, port: Number(port) }, () => s.write(head));
    let got = "";
    s.on("data", (d) => {
      got += d.toString("latin1");
      const m = /^HTTP\/1\.1 (\d{3})/.exec(got);
      if (m) {
        s.destroy();
        resolve({ status: Number(m[1]), ms: performance.now() - started });
      }
    });
    s.on("error", () => resolve({ status: 0, ms: performance.now() - started }));
  });
}

const median = (xs: number[]) => [...xs].sort((a, b) => a - b)[Math.floor(xs.length / 2)];

function multipart(filename: string, content: string, extra = ""): { body: string; type: string } {
  const b = `----probe${randomBytes(4).toString("hex")}`;
  return { body: `--${b}\r\nContent-Disposition: form-data; name="file"; filename="${filename}"${extra}\r\nContent-Type: text/csv\r\n\r\n${content}\r\n--${b}--\r\n`, type: `multipart/form-data; boundary=${b}` };
}

function capture(seed: number): string {
  const rows = ["Time (s),Out (V)"];
  for (let i = 0; i < 2000; i++) rows.push(`${(i * 5e-8).toExponential(6)},${Math.sin(2 * Math.PI * 405e3 * i * 5e-8 + seed).toFixed(5)}`);
  return `${rows.join("\n")}\n`;
}

it("issue 17's probe list answers as the issue asks", async () => {
  if (!base) throw new Error("APP_URL is not set: run this through scripts/bootstrap.mjs test");
  const fx: Fixture = await createFixture(base, "probe");
  const tech = { authorization: `Bearer ${fx.accounts.technician[0].token}` };
  const eng = { authorization: `Bearer ${fx.accounts.engineer[0].token}` };
  const json = { "content-type": "application/json" };
  const host = new URL(base).host;

  // 1. Size limits, before the body is read.
  const big = await rawHeadStatus(`POST /api/v1/session HTTP/1.1\r\nHost: ${host}\r\nContent-Type: application/json\r\nContent-Length: 200000000\r\n\r\n`);
  note("1", "POST /session, Content-Length 200 MB (head only)", `${big.status} in ${big.ms.toFixed(0)} ms`, big.status === 413);
  const manyKeys = `{${Array.from({ length: 1_000_000 }, (_, i) => `"k${i}":0`).join(",")}}`;
  const healthBefore = await call("GET", "/api/health");
  const [keys, healthDuring] = await Promise.all([
    call("PATCH", `/api/v1/projects/${fx.ids.projectId}`, { headers: { ...eng, ...json }, body: manyKeys }),
    new Promise((r) => setTimeout(r, 30)).then(() => call("GET", "/api/health")),
  ]);
  note("1", `PATCH project, ${(manyKeys.length / 1e6).toFixed(1)} MB with 10⁶ keys; health alongside`, `${keys.status}; health ${healthBefore.ms.toFixed(0)} → ${healthDuring.ms.toFixed(0)} ms`, keys.status === 413 && healthDuring.status === 200);

  // 2. Browser headers on pages and routes.
  for (const path of ["/sign-in", "/people", "/profile", "/api/v1/me", "/api/health"]) {
    const r = await call("GET", path);
    const h = r.headers;
    const ok = /frame-ancestors 'none'/.test(h.get("content-security-policy") ?? "") && h.get("x-frame-options") === "DENY" && h.get("x-content-type-options") === "nosniff" && !!h.get("referrer-policy") && !!h.get("permissions-policy");
    note("2", `GET ${path}: CSP, frame-ancestors, XFO, nosniff, Referrer-Policy, Permissions-Policy`, `${r.status}; CSP ${h.get("content-security-policy") ? "yes" : "no"}, XFO ${h.get("x-frame-options")}, HSTS ${h.get("strict-transport-security") ?? "none"}`, ok);
  }

  // 3. Forgot-password timing (interleaved pairs; the known address is a fuzz account on the fake SMTP).
  const page = await call("GET", "/forgot-password");
  const form = [...page.text.matchAll(/<form\b[^>]*>([\s\S]*?)<\/form>/g)].map((m) => m[1]).find((f) => f.includes('name="email"')) ?? "";
  const hidden = [...form.matchAll(/<input\b[^>]*type="hidden"[^>]*>/g)].map((m) => [/name="([^"]*)"/.exec(m[0])?.[1] ?? "", (/value="([^"]*)"/.exec(m[0])?.[1] ?? "").replace(/&quot;/g, '"').replace(/&amp;/g, "&")]);
  const forgot = async (email: string) => {
    const body = new FormData();
    for (const [k, v] of hidden) body.append(k, v);
    body.append("email", email);
    return (await call("POST", "/forgot-password", { headers: { origin: new URL(base).origin }, body })).ms;
  };
  const known: number[] = [];
  const unknown: number[] = [];
  await forgot("warm@nowhere.test");
  for (let i = 0; i < 12; i++) {
    known.push(await forgot(fx.accounts.viewer[1].email));
    unknown.push(await forgot(`nobody-${randomBytes(4).toString("hex")}@nowhere.test`));
  }
  const gap = median(known) - median(unknown);
  note("3", "forgot-password, 12 interleaved pairs", `known ${median(known).toFixed(1)} ms, unknown ${median(unknown).toFixed(1)} ms`, Math.abs(gap) < 25);

  // 4. Idempotency under concurrency, and a reused key with another body.
  const key = `probe-${Date.now()}`;
  const csv = capture(1);
  const six = await Promise.all(Array.from({ length: 6 }, () => {
    const m = multipart("same.csv", csv);
    return call("POST", `/api/v1/builds/${fx.ids.buildId}/runs`, { headers: { ...tech, "content-type": m.type, "idempotency-key": key }, body: m.body });
  }));
  const statuses = six.map((a) => a.status).sort();
  const ids = new Set(six.map((a) => JSON.parse(a.text).id));
  note("4", "6 identical uploads at once, one Idempotency-Key", `${statuses.join(",")}; ${ids.size} run id`, statuses.join(",") === "200,200,200,200,200,201" && ids.size === 1);
  const other = multipart("other.csv", capture(2));
  const reused = await call("POST", `/api/v1/builds/${fx.ids.buildId}/runs`, { headers: { ...tech, "content-type": other.type, "idempotency-key": key }, body: other.body });
  note("4", "same key, another file", `${reused.status} ${reused.type}`, reused.status === 422);

  // 5. X-Forwarded-For (the test stack trusts 127.0.0.1 as its proxy) and the account's back-off.
  const victim = fx.accounts.viewer[2];
  const wrong: number[] = [];
  for (let i = 0; i < 6; i++) wrong.push((await call("POST", "/api/v1/session", { headers: { ...json, "x-forwarded-for": `203.0.113.${100 + i}` }, body: JSON.stringify({ email: victim.email, password: "wrong password here" }) })).status);
  const owner = await call("POST", "/api/v1/session", { headers: { ...json, cookie: victim.cookie, "x-forwarded-for": "203.0.113.200" }, body: JSON.stringify({ email: victim.email, password: "fuzz campaign passphrase 2026" }) });
  note("5", "6 wrong passwords from rotating addresses, then the owner's right one from their signed-in device", `${wrong.join(",")} then ${owner.status}`, owner.status === 201);
  const audit = await db()("audit_events").where({ action: "sign-in.failed" }).orderBy("created_at", "desc").first();
  note("5", "audit address of the last failure (TRUST_PROXY=127.0.0.1 trusts the test client)", String(audit?.ip ?? "none"), audit?.ip === "203.0.113.105");

  // 6. Tokens after sign out everywhere with the box ticked (the password-reset case is
  // tests/integration/auth/token-revocation.test.ts, which follows the e-mailed link).
  const leaver = fx.accounts.admin[3];
  const profile = await call("GET", "/profile", { headers: { cookie: leaver.cookie } });
  const signOutForm = [...profile.text.matchAll(/<form\b[^>]*>([\s\S]*?)<\/form>/g)].map((m) => m[1]).find((f) => f.includes("Sign out everywhere")) ?? "";
  const out = new FormData();
  for (const m of signOutForm.matchAll(/<input\b[^>]*type="hidden"[^>]*>/g)) out.append(/name="([^"]*)"/.exec(m[0])?.[1] ?? "", (/value="([^"]*)"/.exec(m[0])?.[1] ?? "").replace(/&quot;/g, '"').replace(/&amp;/g, "&"));
  out.append("revokeTokens", "on");
  const signedOut = await call("POST", "/profile", { headers: { cookie: leaver.cookie, origin: new URL(base).origin }, body: out });
  const afterToken = await call("GET", "/api/v1/me", { headers: { authorization: `Bearer ${leaver.token}` } });
  const afterCookie = await call("GET", "/api/v1/me", { headers: { cookie: leaver.cookie } });
  note("6", "sign out everywhere (box ticked), then the token and the cookie", `${signedOut.status}; token ${afterToken.status}, cookie ${afterCookie.status}`, signedOut.status === 303 && afterToken.status === 401 && afterCookie.status === 401);

  // 7. 500s for bad input.
  const surrogate = await call("POST", "/api/v1/projects", { headers: { ...eng, ...json }, body: '{"name":"bench \\udc00","purpose":"x"}' });
  note("7", "project name with a lone surrogate", `${surrogate.status} ${surrogate.type}`, surrogate.status === 400);
  const tweakNote = await call("POST", `/api/v1/builds/${fx.ids.buildId}/tweaks`, { headers: { ...tech, ...json }, body: '{"partRef":"C1","toValue":"2.2n","note":"\\udc00"}' });
  note("7", "tweak note with a lone surrogate", `${tweakNote.status}`, tweakNote.status === 400);
  const review = await call("POST", `/api/v1/builds/${fx.ids.buildId}/review`, { headers: { ...eng, ...json }, body: '{"decision":"accepted","comment":"\\udc00"}' });
  note("7", "review comment with a lone surrogate", `${review.status}`, review.status >= 400 && review.status < 500);
  const slot = await call("POST", "/api/v1/uploads", { headers: { ...tech, ...json }, body: `{"buildId":"${fx.ids.buildId}","filename":"a\\ud800.csv","sizeBytes":10}` });
  note("7", "slot filename with a lone surrogate", `${slot.status}`, slot.status === 400);
  const nul = multipart("x.csv", capture(3), "; filename*=UTF-8''cap%00ture.csv");
  const nulRes = await call("POST", `/api/v1/builds/${fx.ids.buildId}/runs`, { headers: { ...tech, "content-type": nul.type }, body: nul.body });
  note("7", "multipart filename* with a NUL", `${nulRes.status}`, nulRes.status === 400);
  const from = await call("GET", `/api/v1/builds/${fx.ids.buildId}/runs?from=-271821-04-20`, { headers: tech });
  note("7", "runs?from=-271821-04-20", `${from.status} ${from.type}`, from.status === 400);
  const csvFrom = await call("GET", `/api/v1/builds/${fx.ids.buildId}/runs.csv?from=-271821-04-20`, { headers: tech });
  note("7", "runs.csv?from=-271821-04-20", `${csvFrom.status} ${csvFrom.type}`, csvFrom.status === 400);

  // 8. Smaller ones.
  const empty = await call("PATCH", `/api/v1/designs/${fx.ids.designId}`, { headers: { ...eng, ...json }, body: "{}" });
  const topo = await call("PATCH", `/api/v1/designs/${fx.ids.designId}`, { headers: { ...eng, ...json }, body: '{"topology":"flux"}' });
  note("8", "PATCH design {} and an unknown topology", `${empty.status}, ${topo.status}`, empty.status === 400 && topo.status === 400);
  const lower = await call("GET", "/api/v1/me", { headers: { authorization: `bearer ${fx.accounts.viewer[0].token}` } });
  note("8", "Authorization: bearer (lower case)", String(lower.status), lower.status === 200);
  const long = multipart(`${"n".repeat(300)}.csv`, capture(4));
  const longRes = await call("POST", `/api/v1/builds/${fx.ids.buildId}/runs`, { headers: { ...tech, "content-type": long.type }, body: long.body });
  note("8", "multipart filename of 304 characters", `${longRes.status}`, longRes.status === 400);
  const huge = await call("POST", "/api/v1/uploads", { headers: { ...tech, ...json }, body: JSON.stringify({ buildId: fx.ids.buildId, filename: "big.csv", sizeBytes: 500_000_001 }) });
  note("8", "slot for 500,000,001 bytes", `${huge.status}: ${JSON.parse(huge.text).detail}`, huge.status === 413 && /1 byte over/.test(huge.text));
  const cookie = { cookie: fx.accounts.viewer[0].cookie };
  const missingBuild = await call("GET", "/builds/00000000-0000-4000-8000-000000000000", { headers: cookie });
  const missingRun = await call("GET", "/runs/00000000-0000-4000-8000-000000000000", { headers: cookie });
  note("8", "missing build and run pages", `${missingBuild.status}, ${missingRun.status}`, missingBuild.status === 404 && missingRun.status === 404);
  const bidi = `probe \u202Eabc ${randomBytes(2).toString("hex")}`;
  await call("POST", `/api/v1/designs/${fx.ids.designId}/builds`, { headers: { ...tech, ...json }, body: JSON.stringify({ label: bidi, kind: "breadboard" }) });
  const dash = await call("GET", "/dashboard", { headers: { cookie: fx.accounts.technician[0].cookie } });
  note("8", "bidi override in a build label on the dashboard", dash.text.includes(`<bdi>${bidi}</bdi>`) ? "isolated in <bdi>" : "not isolated", dash.text.includes(`<bdi>${bidi}</bdi>`));
  const escGet = await call("GET", "/api/v1/projects/%E0%A4%A");
  const escPost = await call("POST", "/api/v1/projects/%E0%A4%A", { headers: { ...eng, ...json }, body: '{"name":"x"}' });
  const escPage = await call("GET", "/builds/%E0%A4%A");
  note("8", "malformed percent-escape: GET /api, POST /api with a body, GET page", `${escGet.status} ${escGet.type.split(";")[0]}, ${escPost.status} ${escPost.type.split(";")[0]}, ${escPage.status} ${escPage.type.split(";")[0]}`, escGet.status === 400 && escPost.status === 400 && /problem\+json/.test(escPost.type) && escPage.status === 400);

  // 9. is the npm start cluster (tests/integration/security/durable-cluster.test.ts starts one); 10. the outbox.
  const admin = fx.accounts.admin[0];
  const victimReset = new FormData();
  for (const [k, v] of hidden) victimReset.append(k, v);
  victimReset.append("email", fx.accounts.technician[3].email);
  await call("POST", "/forgot-password", { headers: { origin: new URL(base).origin }, body: victimReset });
  let held = "";
  for (let i = 0; i < 40 && !held; i++) {
    const m = (await listHeldMessages({ to: fx.accounts.technician[3].email })).find((x) => /Reset/.test(x.subject));
    if (m) held = /\/reset-password\/([A-Za-z0-9_-]+)/.exec(m.text)?.[1] ?? "";
    else await new Promise((r) => setTimeout(r, 200));
  }
  const outbox = await call("GET", "/outbox", { headers: { cookie: admin.cookie } });
  note("10", "admin's Outbox page after another account's reset", `${outbox.status}; link ${held && outbox.text.includes(held) ? "shown" : "hidden"}`, outbox.status === 200 && !!held && !outbox.text.includes(held));

  const width = Math.max(...results.map((r) => r.probe.length));
  process.stdout.write(`issue 17 probes against ${base}\n${results.map((r) => `${r.ok ? "ok  " : "FAIL"} ${r.item.padStart(2)}. ${r.probe.padEnd(width)}  → ${r.answer}`).join("\n")}\n`);
  expect(results.filter((r) => !r.ok)).toEqual([]);
}, 300_000);
