import { getEnv } from "@/lib/env";

/**
 * Cross-site request forgery guard for state-changing route handlers (server actions have
 * Next's own check). A browser always sends Origin on such requests; a mismatch is refused.
 * Requests without Origin come from non-browser clients (scripts, schedulers) and carry no
 * ambient cookie risk unless a browser sent them, which Sec-Fetch-Site would reveal.
 */
export function isSameOriginRequest(request: Request): boolean {
  const origin = request.headers.get("origin");
  const fetchSite = request.headers.get("sec-fetch-site");
  if (!origin) return fetchSite === null || fetchSite === "same-origin" || fetchSite === "none";
  if (origin === "null") return false;
  const allowed = new Set<string>();
  allowed.add(new URL(getEnv().APP_URL).origin);
  const host = request.headers.get("x-forwarded-host") ?? request.headers.get("host");
  if (host) {
    allowed.add(`http://${host}`);
    allowed.add(`https://${host}`);
  }
  return allowed.has(origin);
}
