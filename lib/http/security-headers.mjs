// Browser security headers for every page and route, set in one place (proxy.ts).

export interface SecurityHeaderOptions {
  /** NODE_ENV: HSTS only in production, so a developer's http://127.0.0.1 is never pinned to https. */
  production: boolean;
  /** S3_ENDPOINT: the browser PUTs captures to presigned URLs there, so it must be a connect-src. */
  s3Endpoint: string;
}

/** The origin the browser uploads to: the configured endpoint's, or any AWS S3 host when none is set. */
function storageOrigins(s3Endpoint: string): string[] {
  if (!s3Endpoint) return ["https://*.amazonaws.com"];
  try {
    const url = new URL(s3Endpoint);
    // Virtual-hosted buckets are a subdomain of the endpoint.
    return [url.origin, `${url.protocol}//*.${url.host}`];
  } catch {
    return [];
  }
}

/**
 * The Content-Security-Policy (CSP Level 3, W3C). Scripts and styles come from this origin; the inline
 * bootstrap scripts Next's App Router writes into every page (the RSC payload) need 'unsafe-inline' unless
 * each page were rendered per request with a nonce, which would make every prerendered page dynamic. What the
 * policy still refuses: scripts from any other origin, plugins (object-src), <base> rewrites, forms posting
 * elsewhere and being framed (frame-ancestors, the clickjacking defence of OWASP's Clickjacking Defense Cheat Sheet).
 */
export function contentSecurityPolicy(options: SecurityHeaderOptions): string {
  const directives: Record<string, string[]> = {
    "default-src": ["'self'"],
    "script-src": ["'self'", "'unsafe-inline'"],
    "style-src": ["'self'", "'unsafe-inline'"],
    "img-src": ["'self'", "data:", "blob:"],
    "font-src": ["'self'"],
    "connect-src": ["'self'", ...storageOrigins(options.s3Endpoint)],
    "object-src": ["'none'"],
    "base-uri": ["'self'"],
    "form-action": ["'self'"],
    "frame-ancestors": ["'none'"],
  };
  return Object.entries(directives)
    .map(([name, values]) => `${name} ${values.join(" ")}`)
    .join("; ");
}

/** Every header the proxy sets on every answer, by name (lower case). */
export function securityHeaders(options: SecurityHeaderOptions): Record<string, string> {
  const headers: Record<string, string> = {
    "content-security-policy": contentSecurityPolicy(options),
    // For browsers without CSP frame-ancestors (RFC 7034).
    "x-frame-options": "DENY",
    // OWASP HTTP Headers Cheat Sheet: no MIME sniffing of a CSV or JSON answer into HTML.
    "x-content-type-options": "nosniff",
    // Links out of Tankbook carry the origin only, never a build or run path.
    "referrer-policy": "strict-origin-when-cross-origin",
    // The logbook needs none of these browser features (W3C Permissions Policy).
    "permissions-policy": "camera=(), microphone=(), geolocation=(), payment=(), usb=(), serial=(), bluetooth=(), interest-cohort=()",
    "cross-origin-opener-policy": "same-origin",
  };
  // RFC 6797: a year, subdomains included; only where Tankbook is served over https in production.
  if (options.production) headers["strict-transport-security"] = "max-age=31536000; includeSubDomains";
  return headers;
}

/** Whether every percent-escape in a URL path decodes to UTF-8 (RFC 3986 §2.1, RFC 3629). */
export function percentEscapesValid(path: string): boolean {
  try {
    decodeURIComponent(path);
    return true;
  } catch {
    return false;
  }
}
