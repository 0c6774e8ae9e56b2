/** @type {import('next').NextConfig} */
const nextConfig = {
  // knex drags in optional drivers Turbopack cannot resolve; piscina must load its worker file from disk.
  serverExternalPackages: ["knex", "piscina", "pg-boss", "s3rver", "smtp-server", "mailparser"],
  poweredByHeader: false,
  reactStrictMode: true,
  typescript: { tsconfigPath: "tsconfig.json" },
};

export default nextConfig;
