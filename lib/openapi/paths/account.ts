import type { OpenAPIRegistry } from "@asteasolutions/zod-to-openapi";
import { z } from "zod";
import { signInSchema } from "@/lib/validations/auth";
import { REQUEST_EXAMPLES } from "../examples";
import { jsonBody, jsonResponse, registerOperation } from "../operation";
import { meSchema, sessionCreatedSchema } from "../schemas/account";

export function registerAccountPaths(registry: OpenAPIRegistry): void {
  registerOperation(registry, {
    method: "get",
    path: "/api/v1/me",
    operationId: "getMe",
    tag: "Account",
    summary: "Who am I",
    description: "The account the token or session acts for. A quick way for a bench script to check its token.",
    action: "read",
    responses: { 200: jsonResponse(meSchema, "The caller.") },
  });
  registerOperation(registry, {
    method: "post",
    path: "/api/v1/session",
    operationId: "createSession",
    tag: "Account",
    summary: "Sign in",
    description:
      "Signs in with e-mail and password and sets the session cookie. JSON only, so no cross-site form can post it. " +
      "Failed sign-ins are throttled per account and per address. Scripts should use an API token instead.",
    action: null,
    body: jsonBody(signInSchema, "SignIn", { example: REQUEST_EXAMPLES.createSession }),
    responses: {
      201: jsonResponse(sessionCreatedSchema, "Signed in; the session cookie is in Set-Cookie.", z.object({ "Set-Cookie": z.string().describe("The session cookie (HttpOnly, Secure, SameSite=Lax).") })),
    },
    problems: {
      401: "Unknown e-mail or wrong password (one message for both).",
      415: "The body is not application/json.",
      429: "Too many failed sign-ins for this account or address; the detail says how long to wait.",
    },
  });
  registerOperation(registry, {
    method: "delete",
    path: "/api/v1/session",
    operationId: "deleteSession",
    tag: "Account",
    summary: "Sign out",
    description: "Ends the cookie's session on the server and clears the cookie. Same-origin requests only.",
    action: null,
    cookieOnly: true,
    responses: { 204: { description: "Signed out." } },
    problems: { 401: "Not signed in, or the request came from another origin." },
  });
}
