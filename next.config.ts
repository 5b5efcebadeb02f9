import type { NextConfig } from "next";

const nextConfig: NextConfig = {
  poweredByHeader: false,
  reactStrictMode: true,
  // Uploads of spend histories can be large; route handlers stream them, server actions stay small.
  experimental: { serverActions: { bodySizeLimit: "2mb" } },
  serverExternalPackages: ["@node-rs/argon2", "pg-boss", "smtp-server"],
};

export default nextConfig;
