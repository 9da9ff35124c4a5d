import type { NextConfig } from "next";

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
};

export default nextConfig;
