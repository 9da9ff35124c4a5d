import { NextResponse, type NextRequest } from "next/server";

/**
 * Security headers for every page, with a fresh nonce per request so the Content-Security-
 * Policy can forbid inline scripts except Next's own (Next reads the nonce from the request's
 * CSP header and puts it on its scripts). Also passes the requested path to pages, so sign-in
 * can come back to it. Not a guard: every page, action and route handler checks the actor.
 */
export function proxy(request: NextRequest) {
  const nonce = btoa(crypto.randomUUID());
  const isDev = process.env.NODE_ENV === "development";
  const csp = [
    "default-src 'self'",
    `script-src 'self' 'nonce-${nonce}' 'strict-dynamic'${isDev ? " 'unsafe-eval'" : ""}`,
    // React's style attributes (progress bars, charts) need inline styles; no inline scripts do.
    "style-src 'self' 'unsafe-inline'",
    "img-src 'self' data: blob:",
    "font-src 'self'",
    `connect-src 'self'${isDev ? " ws:" : ""}`,
    "frame-src 'self'",
    "frame-ancestors 'none'",
    "form-action 'self'",
    "base-uri 'self'",
    "object-src 'none'",
  ].join("; ");

  const headers = new Headers(request.headers);
  headers.set("x-zw-path", request.nextUrl.pathname + request.nextUrl.search);
  headers.set("x-nonce", nonce);
  headers.set("content-security-policy", csp);
  const response = NextResponse.next({ request: { headers } });
  response.headers.set("content-security-policy", csp);
  response.headers.set("referrer-policy", "strict-origin-when-cross-origin");
  response.headers.set("x-content-type-options", "nosniff");
  response.headers.set("x-frame-options", "DENY");
  response.headers.set("permissions-policy", "camera=(), microphone=(), geolocation=(), payment=()");
  response.headers.set("cross-origin-opener-policy", "same-origin");
  if (request.nextUrl.protocol === "https:" || request.headers.get("x-forwarded-proto") === "https") {
    response.headers.set("strict-transport-security", "max-age=31536000; includeSubDomains");
  }
  return response;
}

// Route handlers (/api/…) skip the proxy: their fixed security headers come from
// next.config.ts, and the proxy would buffer (and cut) large upload bodies.
export const config = {
  matcher: [{ source: "/((?!_next/static|_next/image|icon.svg|logo-mark.svg|favicon.ico|api/).*)" }],
};
