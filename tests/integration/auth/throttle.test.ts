import { afterAll, describe, expect, it } from "vitest";
import { closeDb } from "@/db/index";
import { closeLucia } from "@/lib/auth/lucia";
import { ACCOUNT_FAILURE_LIMIT, IP_FAILURE_LIMIT } from "@/lib/auth/throttle";
import { apiSignIn, auditRows, createPerson, submitForm, uniqueEmail, uniqueIp } from "./helpers";

afterAll(async () => {
  await closeDb();
  await closeLucia();
});

describe("sign-in throttling", () => {
  it(`refuses an account from one address after ${ACCOUNT_FAILURE_LIMIT} failures there with 429, Retry-After and the wait in words, even with the right password`, async () => {
    const person = await createPerson("technician");
    const ip = uniqueIp();
    for (let i = 0; i < ACCOUNT_FAILURE_LIMIT; i++) expect((await apiSignIn(person.email, `wrong ${i}`, ip)).status).toBe(401);
    const blocked = await apiSignIn(person.email, person.password, ip);
    expect(blocked.status).toBe(429);
    const retryAfter = Number(blocked.headers["retry-after"]);
    expect(retryAfter).toBeGreaterThan(14 * 60); // window is 15 min (lib/auth/throttle.ts)
    expect(retryAfter).toBeLessThanOrEqual(15 * 60);
    expect(blocked.body.detail).toMatch(/^Too many failed sign-ins\. Try again in 1[45] minutes/);
    expect(await auditRows({ actor_id: null, action: "sign-in.throttled" }).then((r) => r.some((e) => e.detail.email === person.email))).toBe(true);
  });

  it("lets the owner in with the right password from another address while one address is locked out of the account (OWASP Authentication Cheat Sheet, account lockout)", async () => {
    const person = await createPerson("technician");
    const attacker = uniqueIp();
    for (let i = 0; i < ACCOUNT_FAILURE_LIMIT; i++) expect((await apiSignIn(person.email, `wrong ${i}`, attacker)).status).toBe(401);
    expect((await apiSignIn(person.email, person.password, attacker)).status).toBe(429);
    expect((await apiSignIn(person.email, person.password, uniqueIp())).status).toBe(201);
  });

  it("shows the throttle message on the sign-in form", async () => {
    const person = await createPerson("technician");
    const ip = uniqueIp();
    for (let i = 0; i < ACCOUNT_FAILURE_LIMIT; i++) await apiSignIn(person.email, `wrong ${i}`, ip);
    const res = await submitForm("/sign-in", (f) => f.includes('name="password"'), { email: person.email, password: person.password }, { ip });
    expect(res.status).toBe(200);
    expect(res.text).toMatch(/Too many failed sign-ins\. Try again in \d+ minutes/);
  });

  it("counts failures only since the account's last successful sign-in", async () => {
    const person = await createPerson("engineer");
    const ip = uniqueIp();
    for (let i = 0; i < ACCOUNT_FAILURE_LIMIT - 1; i++) await apiSignIn(person.email, `wrong ${i}`, ip);
    expect((await apiSignIn(person.email, person.password, ip)).status).toBe(201);
    for (let i = 0; i < ACCOUNT_FAILURE_LIMIT - 1; i++) await apiSignIn(person.email, `wrong again ${i}`, ip);
    expect((await apiSignIn(person.email, person.password, ip)).status).toBe(201);
  });

  it(`refuses a client address after ${IP_FAILURE_LIMIT} failures over any accounts, and not other addresses`, async () => {
    const ip = uniqueIp();
    for (let i = 0; i < IP_FAILURE_LIMIT; i++) expect((await apiSignIn(uniqueEmail("spray"), "guess", ip)).status).toBe(401);
    const person = await createPerson("viewer");
    const blocked = await apiSignIn(person.email, person.password, ip);
    expect(blocked.status).toBe(429);
    expect(Number(blocked.headers["retry-after"])).toBeGreaterThan(0);
    expect((await apiSignIn(person.email, person.password, uniqueIp())).status).toBe(201);
  });
});
