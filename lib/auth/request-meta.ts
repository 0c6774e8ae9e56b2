import "server-only";
import { headers } from "next/headers";
import { clientIp } from "./client-ip";
import type { RequestMeta } from "./sign-in";

/** Client address and user agent of the request a server action or page is handling. */
export async function requestMeta(): Promise<RequestMeta> {
  const h = await headers();
  return { ip: clientIp(h), userAgent: h.get("user-agent") };
}
