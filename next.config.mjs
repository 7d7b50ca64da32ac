import { ACTION_BODY_LIMIT_BYTES, actionOrigins } from "./lib/http/action-origins.mjs";
import { securityHeaders } from "./lib/http/security-headers.mjs";

const dev = process.env.NODE_ENV !== "production";
// `npm run bench` builds with GRAINWARD_BENCH_BUILD=1, which adds the files named *.bench.ts under app/
// (the benchmark's bare-route floor, app/api/bench/same-json/route.bench.ts); every other build leaves
// them out. "bench.ts" comes first so that it, not "ts", is the extension of route.bench.ts.
const pageExtensions = process.env.GRAINWARD_BENCH_BUILD === "1" ? ["bench.ts", "tsx", "ts", "jsx", "js"] : ["tsx", "ts", "jsx", "js"];

/** @type {import('next').NextConfig} */
const nextConfig = {
  reactStrictMode: true,
  poweredByHeader: false,
  pageExtensions,
  // Native modules stay outside the server bundle; qrcode too, so the renderer warmed at start
  // (lib/pieces/card-warm.tsx) and the card routes share one instance.
  serverExternalPackages: ["better-sqlite3", "@node-rs/argon2", "sharp", "@react-email/render", "@react-email/components", "nodemailer", "qrcode"],
  experimental: {
    // Server actions here take short forms (no files: uploads go to the API routes, read by
    // lib/http/body.ts): a body over ACTION_BODY_LIMIT_BYTES (256 kB) is refused, with a 413 by
    // proxy.ts when its length is declared. The proxy's copy of a page request's body must stay above
    // it: a body cut off at the proxy's limit would reach the action truncated instead of refused.
    serverActions: { bodySizeLimit: ACTION_BODY_LIMIT_BYTES, allowedOrigins: actionOrigins() },
    proxyClientMaxBodySize: "512kb",
  },
  async headers() {
    // APP_URL as the build sees it decides HSTS; build with the same APP_URL the server runs with.
    return [{ source: "/:path*", headers: securityHeaders({ appUrl: process.env.APP_URL, dev }) }];
  },
};

export default nextConfig;
