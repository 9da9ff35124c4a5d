// Who may open each page and call each route handler: the expected status per role.
// Every page.tsx and route.ts under app/ must have an entry (the access test finds new ones).
import type { Role } from "@/db/schema/users";

export type Who = "anon" | Role;
export type Expect = number | "ok";

export interface RouteEntry {
  /** The route as the file system names it, e.g. "/inspector/testers" or "/api/testers/[approvalId]/decision". */
  route: string;
  /** A concrete path to request (defaults to route). */
  path?: string;
  method: "GET" | "POST" | "PUT" | "PATCH" | "DELETE";
  expect: Record<Who, Expect>;
}

const everyone = (status: Expect): Record<Who, Expect> => ({ anon: status, tester: status, inspector: status, admin: status, owner: status });

/** A page only `roles` may open: others get 403, signed-out visitors go to sign-in (307). */
export function pageFor(...roles: Role[]): Record<Who, Expect> {
  const all: Role[] = ["tester", "inspector", "admin", "owner"];
  return { anon: 307, ...Object.fromEntries(all.map((r) => [r, roles.includes(r) ? 200 : 403])) } as Record<Who, Expect>;
}

/** An API only `roles` may call: 401 signed out, 403 for others, "ok" (<400 or a validation 4xx) for them. */
export function apiFor(...roles: Role[]): Record<Who, Expect> {
  const all: Role[] = ["tester", "inspector", "admin", "owner"];
  return { anon: 401, ...Object.fromEntries(all.map((r) => [r, roles.includes(r) ? "ok" : 403])) } as Record<Who, Expect>;
}

/** Sign-in pages: open to visitors, a signed-in user is sent home (307). */
const signedOutOnly: Record<Who, Expect> = { anon: 200, tester: 307, inspector: 307, admin: 307, owner: 307 };

export const foundationRoutes: RouteEntry[] = [
  { route: "/", method: "GET", expect: everyone(307) },
  { route: "/login", method: "GET", expect: signedOutOnly },
  { route: "/register", method: "GET", expect: everyone(200) },
  { route: "/forgot-password", method: "GET", expect: everyone(200) },
  { route: "/reset-password/[token]", path: "/reset-password/not-a-real-token-aaaaaaaaaaaa", method: "GET", expect: everyone(200) },
  { route: "/invite/[token]", path: "/invite/not-a-real-token-aaaaaaaaaaaa", method: "GET", expect: everyone(200) },
  { route: "/tester", method: "GET", expect: pageFor("tester") },
  { route: "/inspector", method: "GET", expect: pageFor("inspector", "admin") },
  { route: "/inspector/testers", method: "GET", expect: pageFor("inspector", "admin") },
  { route: "/admin", method: "GET", expect: pageFor("admin") },
  { route: "/admin/mailbox", method: "GET", expect: pageFor("admin") },
  { route: "/owner", method: "GET", expect: pageFor("owner") },
  { route: "/api/health", method: "GET", expect: everyone(200) },
  { route: "/api/auth/session", method: "POST", expect: everyone(422) },
  { route: "/api/auth/session", method: "DELETE", expect: everyone(200) },
  { route: "/api/auth/register", method: "POST", expect: everyone(422) },
  { route: "/api/auth/password-reset", method: "POST", expect: everyone(422) },
  { route: "/api/auth/password-reset/confirm", method: "POST", expect: everyone(422) },
  { route: "/api/auth/invitation", method: "POST", expect: everyone(422) },
  { route: "/api/testers/[approvalId]/decision", path: "/api/testers/999999/decision", method: "POST", expect: apiFor("inspector", "admin") },
  { route: "/api/files", path: "/api/files?purpose=certification", method: "POST", expect: { anon: 401, tester: 422, inspector: 403, admin: 403, owner: 403 } },
  { route: "/api/files/[id]", path: "/api/files/999999", method: "GET", expect: { anon: 401, tester: 404, inspector: 404, admin: 404, owner: 404 } },
];
