// Access entries for the tester's pages and route handlers (see routes.ts for the helpers).
import { apiFor, pageFor, type RouteEntry } from "./routes";

const draftKey = "0123456789abcdef0123456789abcdef";
const redirectsEveryone = { anon: 307, tester: 307, inspector: 307, admin: 307, owner: 307 } as const;

export const testerRoutes: RouteEntry[] = [
  { route: "/tester/credentials", method: "GET", expect: pageFor("tester") },
  { route: "/tester/assemblies", method: "GET", expect: pageFor("tester") },
  { route: "/tester/assemblies/new", method: "GET", expect: pageFor("tester") },
  { route: "/tester/reports", method: "GET", expect: pageFor("tester") },
  { route: "/tester/reports/new", method: "GET", expect: pageFor("tester") },
  { route: "/tester/reports/[id]", path: "/tester/reports/999999999", method: "GET", expect: { ...pageFor("tester"), tester: 404 } },
  { route: "/tester/coming-due", method: "GET", expect: pageFor("tester") },
  // The QR tag target: sign-in first, then each role is sent where it works with the assembly.
  { route: "/a/[id]", path: "/a/1", method: "GET", expect: redirectsEveryone },
  { route: "/api/tester/credentials", method: "GET", expect: apiFor("tester") },
  { route: "/api/tester/certifications", method: "POST", expect: apiFor("tester") },
  { route: "/api/tester/certifications/[id]", path: "/api/tester/certifications/999999", method: "PATCH", expect: apiFor("tester") },
  { route: "/api/tester/kits", method: "POST", expect: apiFor("tester") },
  { route: "/api/tester/kits/[id]/verification", path: "/api/tester/kits/999999/verification", method: "POST", expect: apiFor("tester") },
  { route: "/api/tester/kits/[id]/retire", path: "/api/tester/kits/999999/retire", method: "POST", expect: apiFor("tester") },
  { route: "/api/assemblies", method: "POST", expect: apiFor("tester") },
  { route: "/api/assemblies/search", path: "/api/assemblies/search?q=QV", method: "GET", expect: apiFor("tester", "inspector", "admin") },
  { route: "/api/assemblies/sites", path: "/api/assemblies/sites?q=QV", method: "GET", expect: apiFor("tester", "inspector", "admin") },
  { route: "/api/assemblies/tags", path: "/api/assemblies/tags?ids=1", method: "GET", expect: apiFor("tester", "inspector", "admin") },
  { route: "/api/reports", method: "POST", expect: apiFor("tester") },
  { route: "/api/reports/mine", method: "GET", expect: apiFor("tester") },
  { route: "/api/reports/drafts", method: "GET", expect: apiFor("tester") },
  { route: "/api/reports/drafts/[key]", path: `/api/reports/drafts/${draftKey}`, method: "GET", expect: apiFor("tester") },
  { route: "/api/reports/drafts/[key]", path: `/api/reports/drafts/${draftKey}`, method: "PUT", expect: apiFor("tester") },
  { route: "/api/reports/drafts/[key]", path: `/api/reports/drafts/${draftKey}`, method: "DELETE", expect: apiFor("tester") },
  // Filing tester, program staff and site owners may read a report; for anyone else it does not exist.
  { route: "/api/reports/[id]/pdf", path: "/api/reports/999999999/pdf", method: "GET", expect: { anon: 401, tester: 404, inspector: 404, admin: 404, owner: 404 } },
];
