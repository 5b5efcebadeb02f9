import type { NextConfig } from "next";

const nextConfig: NextConfig = {
  // `npm test` builds into .next-test so that a running `npm start` (.next) is not disturbed.
  distDir: process.env.NEXT_DIST_DIR || ".next",
  poweredByHeader: false,
  reactStrictMode: true,
  // Uploads of spend histories can be large; route handlers stream them, server actions stay small.
  experimental: { serverActions: { bodySizeLimit: "2mb" } },
  serverExternalPackages: ["@node-rs/argon2", "pg-boss", "smtp-server"],
};

export default nextConfig;
