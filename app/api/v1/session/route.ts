import { cookies } from "next/headers";
import { getCurrentSession, clearSessionCookie, setSessionCookie } from "@/lib/auth/current-user";
import { originAllowed } from "@/lib/auth/authenticate-request";
import { clientIp } from "@/lib/auth/client-ip";
import { SESSION_COOKIE_NAME } from "@/lib/auth/lucia";
import { signIn, signOut } from "@/lib/auth/sign-in";
import { UnsupportedMediaTypeError, UnauthorizedError } from "@/lib/errors";
import { discardUnreadBody } from "@/lib/http/api-handler";
import { ANONYMOUS_JSON_LIMITS, readLimitedJson } from "@/lib/http/json-body";
import { problemFromError } from "@/lib/http/problem";
import { signInSchema } from "@/lib/validations/auth";

export const dynamic = "force-dynamic";

/**
 * Sign in without a browser form: JSON `{ email, password }` → 201 with the user and the session cookie.
 * JSON only, so a cross-site form cannot sign a visitor into another account (a JSON POST from another
 * origin needs a CORS preflight, which this route never grants).
 */
export async function POST(request: Request): Promise<Response> {
  try {
    if (!(request.headers.get("content-type") ?? "").startsWith("application/json")) {
      throw new UnsupportedMediaTypeError("Send the e-mail and password as application/json.");
    }
    // Anyone can reach this route, so its body is capped small and read as a stream (see json-body.ts).
    const body = signInSchema.parse(await readLimitedJson(request, ANONYMOUS_JSON_LIMITS));
    const previousSessionId = (await cookies()).get(SESSION_COOKIE_NAME)?.value ?? null;
    const { session, user } = await signIn(
      { email: body.email, password: body.password, previousSessionId },
      { ip: clientIp(request.headers), userAgent: request.headers.get("user-agent") },
    );
    await setSessionCookie(session.id);
    return Response.json({ user, expiresAt: session.expiresAt.toISOString() }, { status: 201, headers: { "cache-control": "no-store" } });
  } catch (err) {
    await discardUnreadBody(request);
    return problemFromError(err);
  }
}

/** Sign out: ends the cookie's session server-side (same-origin requests only) → 204. */
export async function DELETE(request: Request): Promise<Response> {
  try {
    if (!originAllowed(request)) throw new UnauthorizedError("Sign out from Tankbook itself: this request came from another origin.");
    const { session, user } = await getCurrentSession();
    if (!session) throw new UnauthorizedError("You are not signed in.");
    await signOut(session.id, user.id, { ip: clientIp(request.headers) });
    await clearSessionCookie();
    return new Response(null, { status: 204 });
  } catch (err) {
    return problemFromError(err);
  }
}
