import { NextResponse, type NextRequest } from "next/server";
import { percentEscapesValid, securityHeaders } from "@/lib/http/security-headers";

// Runs before every page, route handler and static file: the one place the browser security headers are set,
// and where a URL the router could not decode is answered as a 400 instead of the framework's plain-text 500.

function badEscapeAnswer(pathname: string): Response {
  const detail = "The address has a malformed percent-escape (RFC 3986 §2.1): each % must be followed by two hex digits that spell UTF-8.";
  if (pathname.startsWith("/api/")) {
    return new Response(JSON.stringify({ type: "https://tankbook.test/problems/bad-request", title: "Bad request", status: 400, detail }), {
      status: 400,
      headers: { "content-type": "application/problem+json", "cache-control": "no-store" },
    });
  }
  const html = `<!doctype html><html lang="en"><head><meta charset="utf-8"><title>Bad address · Tankbook</title></head>
<body style="font-family:system-ui,sans-serif;max-width:36rem;margin:4rem auto;padding:0 1rem;color:#1f2328">
<h1 style="font-size:1.25rem">This address cannot be read</h1><p>${detail}</p><p><a href="/dashboard">Go to the dashboard</a></p></body></html>`;
  return new Response(html, { status: 400, headers: { "content-type": "text/html; charset=utf-8", "cache-control": "no-store" } });
}

export function proxy(request: NextRequest): Response {
  const pathname = new URL(request.url).pathname;
  const response = percentEscapesValid(pathname) ? NextResponse.next() : badEscapeAnswer(pathname);
  const headers = securityHeaders({ production: process.env.NODE_ENV === "production", s3Endpoint: process.env.S3_ENDPOINT ?? "http://127.0.0.1:4569" });
  for (const [name, value] of Object.entries(headers)) response.headers.set(name, value);
  return response;
}
