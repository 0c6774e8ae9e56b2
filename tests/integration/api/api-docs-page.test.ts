import request from "supertest";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb } from "@/db/index";
import { closeLucia } from "@/lib/auth/lucia";
import { buildOpenApiDocument } from "@/lib/openapi";
import { appUrl, createApiPerson, TEST_PASSWORD, type ApiPerson } from "./helpers";

let viewer: ApiPerson;
let cookie: string;

beforeAll(async () => {
  viewer = await createApiPerson("viewer", "docs-page");
  const res = await request(appUrl())
    .post("/api/v1/session")
    .set("content-type", "application/json")
    .set("x-forwarded-for", "198.51.100.250")
    .send({ email: viewer.email, password: TEST_PASSWORD });
  expect(res.status, res.text).toBe(201);
  cookie = ([] as string[]).concat(res.headers["set-cookie"]).find((c) => c.startsWith("tankbook_session="))!.split(";")[0];
});

afterAll(async () => {
  await closeDb();
  await closeLucia();
});

const decode = (html: string) => html.replace(/&quot;/g, '"').replace(/&#x27;|&#39;/g, "'").replace(/&lt;/g, "<").replace(/&gt;/g, ">").replace(/&amp;/g, "&");

describe("/api-docs", () => {
  it("renders_every_operation_of_the_document_with_its_errors_and_a_curl_line_for_any_signed_in_role", async () => {
    const res = await request(appUrl()).get("/api-docs").set("cookie", cookie);
    expect(res.status).toBe(200);
    const html = decode(res.text);
    const { document } = buildOpenApiDocument();
    for (const [p, item] of Object.entries(document.paths)) {
      for (const op of Object.values(item) as { operationId: string; summary: string }[]) {
        expect(html, op.operationId).toContain(`id="${op.operationId}"`);
        expect(html).toContain(p);
        expect(html).toContain(op.summary);
      }
    }
    for (const name of Object.keys(document.components.schemas)) expect(html).toContain(`id="schema-${name}"`);
    expect(html).toContain("npm run -s create-token -- --email");
    expect(html).toContain('href="/profile"');
    expect(html).toContain("node scripts/bench-upload.mjs");
    expect(html).toContain('-H "Authorization: Bearer $TANKBOOK_TOKEN"');
    expect(html).toContain("application/problem+json");
    // No renderer that fetches assets from elsewhere: every script and stylesheet is the app's own.
    const external = [...html.matchAll(/<(?:script|link)\b[^>]*(?:src|href)="(https?:\/\/[^"]+)"/g)].map((m) => m[1]);
    expect(external.filter((u) => !u.startsWith(new URL(appUrl()).origin))).toEqual([]);
  });

  it("sends_someone_signed_out_to_sign_in", async () => {
    const res = await request(appUrl()).get("/api-docs").redirects(0);
    expect([303, 307, 308]).toContain(res.status);
    expect(res.headers.location).toMatch(/\/sign-in/);
  });
});
