import type { NextConfig } from "next";

const nextConfig: NextConfig = {
  // `npm test` builds into .next-test so that a running `npm start` (.next) is not disturbed.
  distDir: process.env.NEXT_DIST_DIR || ".next",
  poweredByHeader: false,
  reactStrictMode: true,
  // Uploads of spend histories can be large; route handlers stream them, server actions stay small.
  // authInterrupts: forbidden() in requirePageActor renders app/forbidden.tsx with status 403.
  experimental: { serverActions: { bodySizeLimit: "2mb" }, authInterrupts: true },
  // The one Pages Router API route (pages/api/fits/[id]/predict.ts) is bundled like the App Router's
  // code: otherwise its packages load unbundled from node_modules, where `server-only` refuses to load
  // and next-auth's ESM cannot resolve "next/server".
  bundlePagesRouterDependencies: true,
  // Loaded by Node once per process instead of bundled into each router's server code: the App Router's
  // bundles and the Pages Router route share one copy (with both bundled, the web server's peak RSS under
  // the memory benchmark's load rose from 424–432 MB to 456–481 MB; with these shared, 432–441 MB).
  serverExternalPackages: ["@node-rs/argon2", "pg-boss", "smtp-server", "pdfkit", "zod", "drizzle-orm", "postgres", "jstat", "ml-matrix", "@auth/core", "jose"],
  // Security headers (issue 8; tests/e2e/security.test.ts). Pages get their Content-Security-Policy with a
  // per-request nonce from proxy.ts; everything else (route handlers' JSON, files) gets a policy that
  // allows nothing, since nothing there should run or be framed.
  async headers() {
    const everywhere = [
      { key: "X-Content-Type-Options", value: "nosniff" },
      { key: "Referrer-Policy", value: "strict-origin-when-cross-origin" },
      { key: "X-Frame-Options", value: "DENY" },
      { key: "Permissions-Policy", value: "camera=(), microphone=(), geolocation=(), payment=(), usb=(), browsing-topics=()" },
      { key: "Cross-Origin-Opener-Policy", value: "same-origin" },
    ];
    return [
      { source: "/:path*", headers: everywhere },
      { source: "/api/:path*", headers: [{ key: "Content-Security-Policy", value: "default-src 'none'; frame-ancestors 'none'; base-uri 'none'; form-action 'none'" }] },
      // HSTS only when the app is reached over TLS (a proxy in front sets X-Forwarded-Proto: https).
      {
        source: "/:path*",
        has: [{ type: "header", key: "x-forwarded-proto", value: "https" }],
        headers: [{ key: "Strict-Transport-Security", value: "max-age=63072000; includeSubDomains" }],
      },
    ];
  },
};

export default nextConfig;
