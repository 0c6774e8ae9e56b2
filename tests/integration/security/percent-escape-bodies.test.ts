import request from "supertest";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDb } from "@/db/index";
import { closeLucia } from "@/lib/auth/lucia";
import { createApiPerson, type ApiPerson } from "../api/helpers";
import { appUrl } from "../../helpers/stack";
import { storedCounts } from "../hostile/helpers";

// A request with a body to a path whose percent-escapes do not decode (RFC 3986 §2.1, UTF-8 per RFC 3629) is
// refused by proxy.ts like the same request without a body: 400, problem+json under /api, never the framework's
// plain-text 500. Paths with well-formed escapes still reach their route with the body intact.

let engineer: ApiPerson;

beforeAll(async () => {
  engineer = await createApiPerson("engineer", "escape-bodies");
});

afterAll(async () => {
  await closeDb();
  await closeLucia();
});

const MALFORMED = ["/api/v1/projects/%E0%A4%A", "/api/v1/projects/%", "/api/v1/builds/%ZZ/tweaks", "/api/v1/designs/%C0%AE%C0%AE"];

describe("malformed percent-escapes with a body", () => {
  it("answer 400 problem+json naming the escape for POST, PATCH, PUT and DELETE with JSON bodies, storing nothing", async () => {
    const before = await storedCounts();
    for (const path of MALFORMED) {
      for (const method of ["post", "patch", "put", "delete"] as const) {
        const res = await request(appUrl())[method](path).set("authorization", `Bearer ${engineer.token}`).set("content-type", "application/json").send('{"name":"x"}');
        expect(res.status, `${method} ${path}: ${res.text.slice(0, 200)}`).toBe(400);
        expect(res.headers["content-type"]).toMatch(/^application\/problem\+json/);
        expect(JSON.parse(res.text).detail).toContain("percent-escape");
      }
    }
    expect(await storedCounts()).toEqual(before);
  });

  it("answer 400 for a chunked body and for a 1 MB body too", async () => {
    const big = await request(appUrl()).post("/api/v1/projects/%E0%A4%A").set("content-type", "application/json").send(`{"name":"${"z".repeat(1_000_000)}"}`);
    expect(big.status).toBe(400);
    expect(big.headers["content-type"]).toMatch(/^application\/problem\+json/);
    // fetch with a stream body sends it chunked, without Content-Length.
    const stream = new ReadableStream({
      start(controller) {
        controller.enqueue(new TextEncoder().encode('{"name":"chunked"}'));
        controller.close();
      },
    });
    const chunked = await fetch(`${appUrl()}/api/v1/projects/%E0%A4%A`, { method: "POST", body: stream, headers: { "content-type": "application/json" }, duplex: "half" } as RequestInit);
    expect(chunked.status).toBe(400);
    expect(chunked.headers.get("content-type")).toMatch(/^application\/problem\+json/);
  });

  it("answer a page path's form post with the 400 page, not the framework's 500", async () => {
    const res = await request(appUrl()).post("/builds/%E0%A4%A").set("content-type", "application/x-www-form-urlencoded").send("a=1");
    expect(res.status).toBe(400);
    expect(res.headers["content-type"]).toMatch(/^text\/html/);
    expect(res.text).toContain("This address cannot be read");
  });

  it("let a well-formed escape with a body through to its route, which reads the body", async () => {
    const project = await request(appUrl()).post("/api/v1/projects").set("authorization", `Bearer ${engineer.token}`).set("content-type", "application/json").send(JSON.stringify({ name: `escape ${Date.now()}`, purpose: "before" }));
    expect(project.status, project.text).toBe(201);
    const id: string = project.body.id;
    // The id's first character written as its escape (e.g. "a" as %61): the same resource, through the proxy.
    const escaped = `%${id.charCodeAt(0).toString(16)}${id.slice(1)}`;
    const res = await request(appUrl()).patch(`/api/v1/projects/${escaped}`).set("authorization", `Bearer ${engineer.token}`).set("content-type", "application/json").send('{"purpose":"after, through an escaped path"}');
    expect(res.status, res.text.slice(0, 200)).toBe(200);
    expect(res.body.purpose).toBe("after, through an escaped path");
  });
});
