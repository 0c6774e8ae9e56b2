import { NextResponse, type NextRequest } from "next/server";
import { percentEscapesValid } from "@/lib/http/percent-escapes";

// Answers a URL the router could not decode with a 400 instead of the framework's plain-text 500. It runs for
// requests without a body, and for requests with one only when the raw path holds a "%" (see `config`): with a
// proxy in the way Next buffers a request body until it has all of it (and cuts it at 10 MB), which would break
// streamed uploads and the early 413 of oversized JSON. Our ids are UUIDs, so no client of ours writes a "%" in a
// path; the buffering meets hand-made URLs only, and a well-formed one still reaches its route, body and all.
// The security headers come from next.config.mjs, which touches no body.

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
  return percentEscapesValid(pathname) ? NextResponse.next() : badEscapeAnswer(pathname);
}

export const config = {
  matcher: [
    {
      source: "/:path*",
      missing: [
        { type: "header", key: "content-length" },
        { type: "header", key: "transfer-encoding" },
      ],
    },
    // Next tests the matcher against the raw path as well as the decoded one, so a path that cannot be decoded
    // still holds its "%" here.
    { source: "/:escaped(.*%.*)" },
  ],
};
