import type { NextConfig } from "next";

/**
 * Route handlers answer JSON, PDFs and files, never a page that runs scripts: they get fixed
 * headers from here, without a trip through the proxy (which mints a nonce per page). Pages
 * get theirs, with the nonce, from proxy.ts.
 */
const apiSecurityHeaders = [
  { key: "content-security-policy", value: "default-src 'none'; frame-ancestors 'self'; base-uri 'none'; form-action 'none'" },
  { key: "x-content-type-options", value: "nosniff" },
  { key: "referrer-policy", value: "strict-origin-when-cross-origin" },
  { key: "x-frame-options", value: "SAMEORIGIN" },
  { key: "cross-origin-resource-policy", value: "same-origin" },
];

const nextConfig: NextConfig = {
  poweredByHeader: false,
  // A second build directory lets two checkouts' test runs build side by side.
  distDir: process.env.NEXT_DIST_DIR || ".next",
  reactStrictMode: true,
  typedRoutes: false,
  experimental: {
    // forbidden() / unauthorized() with real 403/401 pages.
    authInterrupts: true,
    serverActions: { bodySizeLimit: "1mb" },
  },
  // The tests and the build must not reach out to the network.
  images: { unoptimized: true },
  async headers() {
    return [{ source: "/api/:path*", headers: apiSecurityHeaders }];
  },
};

export default nextConfig;
