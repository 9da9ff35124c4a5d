// Role gating, checked on the server for every page and route handler: a table of routes ×
// roles with the expected status. A page or handler added without an entry fails this test.
import { readdirSync, readFileSync, statSync } from "node:fs";
import path from "node:path";
import { afterAll, describe, expect, test } from "vitest";
import { demoAccounts } from "@/db/seed/demo-accounts";
import { allRoutes } from "./access/all-routes";
import type { Who } from "./access/routes";
import { closeTestDb } from "../helpers/db";
import { api, ORIGIN, sessionCookieFor } from "../helpers/http";

const appDir = path.join(process.cwd(), "app");

/** Every page (GET) and every exported method of every route handler, from the files. */
function discoverRoutes(): string[] {
  const found: string[] = [];
  const walk = (dir: string) => {
    for (const name of readdirSync(dir)) {
      const full = path.join(dir, name);
      if (statSync(full).isDirectory()) {
        if (!name.startsWith("_")) walk(full);
        continue;
      }
      const route =
        "/" +
        path
          .relative(appDir, dir)
          .split(path.sep)
          .filter((segment) => segment && !(segment.startsWith("(") && segment.endsWith(")")))
          .join("/");
      if (name === "page.tsx") found.push(`GET ${route}`);
      if (name === "route.ts") {
        const source = readFileSync(full, "utf8");
        for (const m of source.matchAll(/export\s+(?:const|async function|function)\s+(GET|POST|PUT|PATCH|DELETE)\b/g)) found.push(`${m[1]} ${route}`);
      }
    }
  };
  walk(appDir);
  return found.sort();
}

const roleAccounts: Record<Exclude<Who, "anon">, string> = {
  tester: demoAccounts.tester,
  inspector: demoAccounts.inspector,
  admin: demoAccounts.admin,
  owner: demoAccounts.owner,
};
afterAll(closeTestDb);

describe("route access table", () => {
  test("every page and route handler has an entry", () => {
    const listed = new Set(allRoutes.map((r) => `${r.method} ${r.route}`));
    const missing = discoverRoutes().filter((r) => !listed.has(r));
    expect(missing, `add these to tests/integration/access: ${missing.join(", ")}`).toEqual([]);
  });

  test("no entry names a route that does not exist", () => {
    const discovered = new Set(discoverRoutes());
    const stale = allRoutes.map((r) => `${r.method} ${r.route}`).filter((r) => !discovered.has(r));
    expect(stale).toEqual([]);
  });

  const cases = allRoutes.flatMap((entry) => (Object.keys(entry.expect) as Who[]).map((who) => ({ entry, who, label: `${entry.method} ${entry.path ?? entry.route} as ${who}` })));

  test.each(cases)("$label", async ({ entry, who }) => {
    const target = entry.path ?? entry.route;
    let request = api()[entry.method.toLowerCase() as "get"](target).redirects(0);
    // A fresh session per case: one case signs out, and must not sign the others out.
    const cookie = who === "anon" ? null : await sessionCookieFor(roleAccounts[who]);
    if (cookie) request = request.set("Cookie", cookie);
    if (entry.method !== "GET") request = request.set("Origin", ORIGIN).set("content-type", "application/json").send("{}");
    const response = await request;
    const expected = entry.expect[who];
    if (expected === "ok") {
      expect(response.status, `${target} as ${who}`).not.toBe(401);
      expect(response.status, `${target} as ${who}`).not.toBe(403);
      expect(response.status, `${target} as ${who}`).toBeLessThan(500);
    } else {
      expect(response.status, `${target} as ${who}`).toBe(expected);
    }
    if (expected === 307 && who === "anon" && entry.method === "GET" && entry.path === undefined && entry.route !== "/") {
      expect(response.headers.location).toContain("/login?next=");
    }
  });
});
