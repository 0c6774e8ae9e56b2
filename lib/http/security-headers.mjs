// Browser security headers for every page, route and file, set in one place: next.config.mjs headers().
// Plain JavaScript because next.config.mjs imports it. Not set from proxy.ts: a proxy makes Next buffer every
// request body before the route handler sees it, which would end streamed capture uploads.
// Next reads headers() when the app is built, so S3_ENDPOINT at build time is the one the CSP names.

/**
 * @typedef {object} SecurityHeaderOptions
 * @property {boolean} production NODE_ENV: HSTS only in production, so a developer's http://127.0.0.1 is never pinned to https.
 * @property {string} s3Endpoint S3_ENDPOINT: the browser PUTs captures to presigned URLs there, so it must be a connect-src.
 */

/** The origin the browser uploads to: the configured endpoint's, or any AWS S3 host when none is set. */
/** @param {string} s3Endpoint @returns {string[]} */
function storageOrigins(s3Endpoint) {
  if (!s3Endpoint) return ["https://*.amazonaws.com"];
  try {
    const url = new URL(s3Endpoint);
    // Virtual-hosted buckets are a subdomain of the endpoint.
    const isIp = /^[\d.]+$/.test(url.hostname) || url.hostname.startsWith("[");
    return isIp ? [url.origin] : [url.origin, `${url.protocol}//*.${url.host}`];
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
export function contentSecurityPolicy(/** @type {SecurityHeaderOptions} */ options) {
  /** @type {Record<string, string[]>} */
  const directives = {
    "default-src": ["'self'"],
    // `next dev` evaluates modules with eval() for its source maps and fast refresh; production never does.
    "script-src": ["'self'", "'unsafe-inline'", ...(options.production ? [] : ["'unsafe-eval'"])],
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
export function securityHeaders(/** @type {SecurityHeaderOptions} */ options) {
  /** @type {Record<string, string>} */
  const headers = {
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
