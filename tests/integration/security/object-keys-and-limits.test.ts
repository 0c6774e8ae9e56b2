import request from "supertest";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb, db } from "@/db/index";
import { closeLucia } from "@/lib/auth/lucia";
import { ACCOUNT_FAILURE_LIMIT, IP_FAILURE_LIMIT } from "@/lib/auth/throttle";
import { FILENAME_MAX_CHARS } from "@/lib/logbook/multipart";
import { api, captureCsv, createFixture, sendJson, uploadCapture, type Fixture } from "../api/helpers";
import { apiSignIn, createPerson, getPage, submitForm, uniqueIp } from "../auth/helpers";
import { answerOf, expectClear4xx, PATH_LIKE_NAMES } from "../hostile/helpers";

// Object keys come from server-side ids only (lib/storage/object-keys.ts), whatever the file is called; and the
// sign-in throttle answers 429 with Retry-After once an account or an address has failed too often.

const SERVER_KEY = /^captures\/\d{4}\/\d{2}\/[0-9a-f-]{36}-[0-9a-f-]{36}\.csv$/;
let fx: Fixture;

beforeAll(async () => {
  fx = await createFixture("object-keys");
}, 120_000);

afterAll(async () => {
  await closeDb();
  await closeLucia();
});

/** Pieces of a file name that must never reach a key. */
function fragments(name: string): string[] {
  return name.split(/[\\/.%<>"&\s]+/).filter((p) => p.length >= 3 && p !== "csv");
}

describe("object keys", () => {
  it("are made by the server for multipart uploads, whatever the file is called", async () => {
    let seed = 5100;
    for (const filename of PATH_LIKE_NAMES.filter((n) => n.toLowerCase().endsWith(".csv"))) {
      const res = await uploadCapture(fx.buildId, fx.team.technician, captureCsv(411e3, seed++), {}, { filename });
      // Names over the slots' 255-character cap are refused (lib/logbook/multipart.ts), not stored cut short.
      if ([...filename].length > FILENAME_MAX_CHARS) {
        expect(res.status, filename).toBe(400);
        continue;
      }
      expect(res.status, `${filename}: ${res.text.slice(0, 200)}`).toBe(201);
      const run = await db()("runs").where({ id: res.body.id }).first();
      expect(run.object_key, filename).toMatch(SERVER_KEY);
      expect(run.object_key.startsWith(`captures/`)).toBe(true);
      const ownPart = run.object_key.replace(/^captures\/\d{4}\/\d{2}\//, "");
      for (const piece of fragments(filename)) expect(ownPart, `${filename} → ${piece}`).not.toContain(piece);
    }
  });

  it("are made by the server for presigned slots, and the signed URL names that key", async () => {
    const size = Buffer.byteLength(captureCsv(411e3, 5200));
    for (const filename of ["../../etc/passwd.csv", "captures/2026/01/someone-elses.csv", "%2e%2e/x.csv"]) {
      const slot = await sendJson("post", "/api/v1/uploads", fx.team.technician, { buildId: fx.buildId, filename, sizeBytes: size, contentType: "text/csv" });
      expect(slot.status, slot.text).toBe(201);
      expect(slot.body).not.toHaveProperty("key");
      const row = await db()("upload_slots").where({ id: slot.body.slotId }).first();
      expect(row.object_key).toMatch(SERVER_KEY);
      expect(row.original_filename).toBe(filename);
      const url = new URL(slot.body.url);
      expect(decodeURIComponent(url.pathname).endsWith(`/${row.object_key}`)).toBe(true);
    }
  });

  it("serve the capture under its original name without letting the name break the download header", async () => {
    // Through a slot the name is JSON, so it can hold what a multipart header cannot: quotes, backslashes, CR LF.
    const filename = 'quote"and\\back\r\nX-Injected: 1.csv';
    const csv = captureCsv(411e3, 5300);
    const slot = await sendJson("post", "/api/v1/uploads", fx.team.technician, { buildId: fx.buildId, filename, sizeBytes: Buffer.byteLength(csv), contentType: "text/csv" });
    expect(slot.status, slot.text).toBe(201);
    expect((await fetch(slot.body.url, { method: "PUT", headers: slot.body.headers, body: csv })).status).toBe(200);
    const done = await sendJson("post", `/api/v1/uploads/${slot.body.slotId}/complete`, fx.team.technician, {});
    expect(done.status, done.text).toBe(201);
    const redirect = await api("get", `/api/v1/runs/${done.body.id}/capture`, fx.team.viewer);
    expect(redirect.status).toBe(302);
    const target = new URL(redirect.headers.location);
    const disposition = target.searchParams.get("response-content-disposition") ?? "";
    expect(disposition).toMatch(/^attachment; filename="[^"\r\n]*"; filename\*=UTF-8''/);
    expect(disposition).not.toMatch(/[\r\n]/);
    const file = await fetch(target);
    expect(file.status).toBe(200);
    expect(file.headers.get("x-injected")).toBeNull();
    expect(file.headers.get("content-disposition")).not.toMatch(/[\r\n]/);
  });
});

describe("sign-in throttling", () => {
  it(`answers 429 with Retry-After after ${ACCOUNT_FAILURE_LIMIT} failures on an account from one address, even with the right password there`, async () => {
    const person = await createPerson("viewer", "throttled");
    const ip = uniqueIp();
    for (let i = 0; i < ACCOUNT_FAILURE_LIMIT; i++) expect((await apiSignIn(person.email, "not the password", ip)).status).toBe(401);
    const refused = await apiSignIn(person.email, person.password, ip);
    expect(expectClear4xx(answerOf(refused), "throttled sign-in").status).toBe(429);
    const retryAfter = Number(refused.headers["retry-after"]);
    expect(Number.isInteger(retryAfter)).toBe(true);
    expect(retryAfter).toBeGreaterThan(0);
    expect(refused.headers["set-cookie"] ?? []).toEqual([]);
    // The form says the same, and signs nobody in.
    const form = await submitForm("/sign-in", (f) => f.includes('name="password"'), { email: person.email, password: person.password }, { ip });
    expect(form.status).toBe(200);
    expect(form.text).toMatch(/Too many failed sign-ins/);
  });

  it(`answers 429 to an address after ${IP_FAILURE_LIMIT} failures spread over many accounts`, async () => {
    const ip = uniqueIp();
    for (let i = 0; i < IP_FAILURE_LIMIT; i++) {
      const res = await request((await import("../auth/helpers")).appUrl()).post("/api/v1/session").set("content-type", "application/json").set("x-forwarded-for", ip).send({ email: `nobody-${i}@throttle.test`, password: "guess guess" });
      expect(res.status).toBe(401);
    }
    const person = await createPerson("viewer", "ip-throttled");
    const refused = await apiSignIn(person.email, person.password, ip);
    expect(refused.status).toBe(429);
    expect(Number(refused.headers["retry-after"])).toBeGreaterThan(0);
    // Another address is not affected.
    expect((await apiSignIn(person.email, person.password, uniqueIp())).status).toBe(201);
    expect((await getPage("/sign-in")).status).toBe(200);
  });
});
