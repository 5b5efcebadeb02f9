import type { NextConfig } from "next";

const nextConfig: NextConfig = {
  // `npm test` builds into .next-test so that a running `npm start` (.next) is not disturbed.
  distDir: process.env.NEXT_DIST_DIR || ".next",
  poweredByHeader: false,
  reactStrictMode: true,
  // Uploads of spend histories can be large; route handlers stream them, server actions stay small.
  // authInterrupts: forbidden() in requirePageActor renders app/forbidden.tsx with status 403.
  experimental: { serverActions: { bodySizeLimit: "2mb" }, authInterrupts: true },
  serverExternalPackages: ["@node-rs/argon2", "pg-boss", "smtp-server", "pdfkit"],
};

export default nextConfig;
