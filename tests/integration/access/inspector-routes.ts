// Access entries for the inspector's and the admin's pages and route handlers (see routes.ts
// for the helpers). Made-up ids answer 404 to the staff: someone else's record is "not found".
import type { Role } from "@/db/schema/users";
import { apiFor, pageFor, type Expect, type RouteEntry, type Who } from "./routes";

const MISSING = "999999";

/** A staff page for a record that does not exist: 404 to the staff, 403 to everyone else. */
function missingPageFor(...roles: Role[]): Record<Who, Expect> {
  const expect = pageFor(...roles);
  for (const role of roles) expect[role] = 404;
  return expect;
}

const staff = ["inspector", "admin"] as const;

export const inspectorRoutes: RouteEntry[] = [
  // pages
  { route: "/inspector/reports", method: "GET", expect: pageFor(...staff) },
  { route: "/inspector/reports/[id]", path: `/inspector/reports/${MISSING}`, method: "GET", expect: missingPageFor(...staff) },
  { route: "/inspector/inventory", method: "GET", expect: pageFor(...staff) },
  { route: "/inspector/inventory/import", method: "GET", expect: pageFor(...staff) },
  { route: "/inspector/sites/new", method: "GET", expect: pageFor(...staff) },
  { route: "/inspector/sites/[id]", path: `/inspector/sites/${MISSING}`, method: "GET", expect: missingPageFor(...staff) },
  { route: "/inspector/assemblies/[id]", path: `/inspector/assemblies/${MISSING}`, method: "GET", expect: missingPageFor(...staff) },
  { route: "/inspector/owners/[id]", path: `/inspector/owners/${MISSING}`, method: "GET", expect: missingPageFor(...staff) },
  { route: "/inspector/compliance", method: "GET", expect: pageFor(...staff) },
  { route: "/inspector/testers/[id]", path: `/inspector/testers/${MISSING}`, method: "GET", expect: missingPageFor(...staff) },
  { route: "/inspector/summary", method: "GET", expect: pageFor(...staff) },
  { route: "/admin/settings", method: "GET", expect: pageFor("admin") },
  { route: "/admin/return-reasons", method: "GET", expect: pageFor("admin") },
  { route: "/admin/users", method: "GET", expect: pageFor("admin") },
  { route: "/admin/audit", method: "GET", expect: pageFor("admin") },
  { route: "/testers", method: "GET", expect: { anon: 200, tester: 200, inspector: 200, admin: 200, owner: 200 } },

  // review
  { route: "/api/inspector/queue", method: "GET", expect: apiFor(...staff) },
  { route: "/api/inspector/queue/clean-passes", method: "GET", expect: apiFor(...staff) },
  { route: "/api/inspector/reports/[id]/decision", path: `/api/inspector/reports/${MISSING}/decision`, method: "POST", expect: apiFor(...staff) },
  { route: "/api/inspector/reports/accept-clean", method: "POST", expect: apiFor(...staff) },
  // inventory
  { route: "/api/inspector/sites", method: "POST", expect: apiFor(...staff) },
  { route: "/api/inspector/sites/[id]", path: `/api/inspector/sites/${MISSING}`, method: "PATCH", expect: apiFor(...staff) },
  { route: "/api/inspector/sites/[id]/owners", path: `/api/inspector/sites/${MISSING}/owners`, method: "POST", expect: apiFor(...staff) },
  { route: "/api/inspector/sites/[id]/owners/[ownerId]", path: `/api/inspector/sites/${MISSING}/owners/${MISSING}`, method: "PATCH", expect: apiFor(...staff) },
  { route: "/api/inspector/sites/[id]/assemblies", path: `/api/inspector/sites/${MISSING}/assemblies`, method: "POST", expect: apiFor(...staff) },
  { route: "/api/inspector/assemblies/[id]", path: `/api/inspector/assemblies/${MISSING}`, method: "PATCH", expect: apiFor(...staff) },
  { route: "/api/inspector/assemblies/[id]/status", path: `/api/inspector/assemblies/${MISSING}/status`, method: "POST", expect: apiFor(...staff) },
  { route: "/api/inspector/assemblies/[id]/confirm", path: `/api/inspector/assemblies/${MISSING}/confirm`, method: "POST", expect: apiFor(...staff) },
  { route: "/api/inspector/assemblies/[id]/merge", path: `/api/inspector/assemblies/${MISSING}/merge`, method: "POST", expect: apiFor(...staff) },
  { route: "/api/inspector/owners/[id]", path: `/api/inspector/owners/${MISSING}`, method: "PATCH", expect: apiFor(...staff) },
  { route: "/api/inspector/owners/[id]/invitation", path: `/api/inspector/owners/${MISSING}/invitation`, method: "POST", expect: apiFor(...staff) },
  { route: "/api/inspector/imports", method: "POST", expect: apiFor(...staff) },
  { route: "/api/inspector/imports", method: "GET", expect: apiFor(...staff) },
  { route: "/api/inspector/imports/[id]", path: `/api/inspector/imports/${MISSING}`, method: "GET", expect: apiFor(...staff) },
  // compliance
  { route: "/api/inspector/compliance", method: "GET", expect: apiFor(...staff) },
  { route: "/api/inspector/compliance/list", method: "GET", expect: apiFor(...staff) },
  // summary
  { route: "/api/inspector/summary/[year]/csv", path: "/api/inspector/summary/2025/csv", method: "GET", expect: apiFor(...staff) },
  { route: "/api/inspector/summary/[year]/pdf", path: "/api/inspector/summary/2025/pdf", method: "GET", expect: apiFor(...staff) },
  // admin
  { route: "/api/admin/settings", method: "PUT", expect: apiFor("admin") },
  { route: "/api/admin/settings/recompute", method: "GET", expect: apiFor("admin") },
  { route: "/api/admin/rule-sets", method: "POST", expect: apiFor("admin") },
  { route: "/api/admin/return-reasons", method: "POST", expect: apiFor("admin") },
  { route: "/api/admin/return-reasons/[id]", path: `/api/admin/return-reasons/${MISSING}`, method: "PATCH", expect: apiFor("admin") },
  { route: "/api/admin/users", method: "POST", expect: apiFor("admin") },
  { route: "/api/admin/users/[id]", path: `/api/admin/users/${MISSING}`, method: "PATCH", expect: apiFor("admin") },
  { route: "/api/admin/audit/csv", method: "GET", expect: apiFor("admin") },
];
