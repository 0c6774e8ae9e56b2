import { afterAll, describe, expect, it } from "vitest";
import { closeDb } from "@/db/index";
import { authenticateRequest } from "@/lib/auth/authenticate-request";
import { closeLucia } from "@/lib/auth/lucia";
import { createPerson, signedInCookie } from "./helpers";

// authenticateRequest against the real database with hand-made Requests: the Origin rule for cookie-authenticated
// writes is easiest to see here, since /api/v1 write routes belong to other parts of the app.

afterAll(async () => {
  await closeDb();
  await closeLucia();
});

function req(method: string, headers: Record<string, string>): Request {
  return new Request("http://127.0.0.1:3100/api/v1/anything", { method, headers: { host: "127.0.0.1:3100", ...headers } });
}

describe("authenticateRequest", () => {
  it("accepts the session cookie on GET without an Origin", async () => {
    const person = await createPerson("technician");
    const cookie = await signedInCookie(person);
    expect(await authenticateRequest(req("GET", { cookie }))).toMatchObject({ id: person.id, role: "technician" });
  });

  it("accepts a cookie-authenticated POST only when Origin names this host", async () => {
    const person = await createPerson("technician");
    const cookie = await signedInCookie(person);
    expect(await authenticateRequest(req("POST", { cookie, origin: "http://127.0.0.1:3100" }))).toMatchObject({ id: person.id });
    expect(await authenticateRequest(req("POST", { cookie, origin: "http://evil.example" }))).toBeNull();
    expect(await authenticateRequest(req("DELETE", { cookie }))).toBeNull();
  });

  it("returns null for no credentials at all", async () => {
    expect(await authenticateRequest(req("GET", {}))).toBeNull();
  });
});
