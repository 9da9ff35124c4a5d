// Access entries for the owner's pages and route handlers, the public certificate check, and
// the notice log (see routes.ts for the helpers). Made-up ids and codes answer 404.
import type { RouteEntry, Who, Expect } from "./routes";
import { apiFor, pageFor } from "./routes";

const everyone = (status: Expect): Record<Who, Expect> => ({ anon: status, tester: status, inspector: status, admin: status, owner: status });
const signedOutOnly: Record<Who, Expect> = { anon: 200, tester: 307, inspector: 307, admin: 307, owner: 307 };
const staffOnlyMissing: Record<Who, Expect> = { anon: 401, tester: 403, inspector: 404, admin: 404, owner: 403 };

export const ownerRoutes: RouteEntry[] = [
  { route: "/owner/assemblies/[id]", path: "/owner/assemblies/999999", method: "GET", expect: { anon: 307, tester: 403, inspector: 403, admin: 403, owner: 404 } },
  { route: "/owner-access", method: "GET", expect: signedOutOnly },
  { route: "/o/[token]", path: "/o/not-a-real-token-aaaaaaaaaaaaaa", method: "GET", expect: everyone(200) },
  { route: "/verify", method: "GET", expect: everyone(200) },
  { route: "/verify/[code]", path: "/verify/ZZZZZZZZZZZZ", method: "GET", expect: everyone(404) },
  { route: "/inspector/notices", method: "GET", expect: pageFor("inspector", "admin") },

  { route: "/api/certificates/[code]/pdf", path: "/api/certificates/ZZZZZZZZZZZZ/pdf", method: "GET", expect: { anon: 401, tester: 404, inspector: 404, admin: 404, owner: 404 } },
  { route: "/api/certificates/[code]/reissue", path: "/api/certificates/ZZZZZZZZZZZZ/reissue", method: "POST", expect: apiFor("inspector", "admin") },
  { route: "/api/owner/session/code", method: "POST", expect: everyone(422) },
  { route: "/api/owner/session/link", method: "POST", expect: everyone(422) },
  { route: "/api/owner/sign-in-link", method: "POST", expect: everyone(422) },
  { route: "/api/owner/contact", method: "POST", expect: apiFor("owner") },
  { route: "/api/notices/runs", method: "GET", expect: apiFor("inspector", "admin") },
  { route: "/api/notices/runs", method: "POST", expect: apiFor("admin") },
  { route: "/api/notices/runs/[id]", path: "/api/notices/runs/999999", method: "GET", expect: staffOnlyMissing },
  { route: "/api/notices/runs/[id]/letters", path: "/api/notices/runs/999999/letters", method: "GET", expect: staffOnlyMissing },
  { route: "/api/notices/runs/[id]/letters", path: "/api/notices/runs/999999/letters", method: "POST", expect: apiFor("inspector", "admin") },
];
