import { securityHeaders } from "./lib/http/security-headers.mjs";

/** @type {import('next').NextConfig} */
const nextConfig = {
  // knex drags in optional drivers Turbopack cannot resolve; piscina must load its worker file from disk.
  serverExternalPackages: ["knex", "piscina", "pg-boss", "s3rver", "smtp-server", "mailparser"],
  // `npm test` builds into its own folder so it can run beside a live `npm start`.
  distDir: process.env.NEXT_DIST_DIR || ".next",
  poweredByHeader: false,
  reactStrictMode: true,
  // Types are checked once for the whole tree (app, lib, scripts, tests) by `tsc --noEmit` in `npm test`,
  // so the build does not check them a second time.
  typescript: { ignoreBuildErrors: true },
  // Browser security headers on every answer (lib/http/security-headers.mjs); read when the app is built.
  async headers() {
    const headers = securityHeaders({
      production: process.env.NODE_ENV === "production",
      s3Endpoint: process.env.S3_ENDPOINT ?? "http://127.0.0.1:4569",
    });
    return [{ source: "/:path*", headers: Object.entries(headers).map(([key, value]) => ({ key, value })) }];
  },
};

export default nextConfig;
