// Every server action, found in the code: who may call it (checked in the code and over HTTP
// as each role, the way the browser calls it), and hostile arguments that must never make it
// fail with a 5xx or write anything when it refuses.
import { readdirSync, readFileSync, statSync } from "node:fs";
import path from "node:path";
import fc from "fast-check";
import { afterAll, describe, expect, test } from "vitest";
import { demoAccounts } from "@/db/seed/demo-accounts";
import type { Permission } from "@/lib/auth/permissions";
import type { Who } from "./access/routes";
import { closeTestDb, countAllTables } from "../helpers/db";
import { api, ORIGIN, sessionCookieFor } from "../helpers/http";

afterAll(closeTestDb);

interface ActionEntry {
  /** "<file>#<export>" */
  key: string;
  /** The permission the action's wrapper checks; null = open to visitors (sign-in forms). */
  permission: Permission | null;
  /** A page that carries the action, to post it to (as the browser does). */
  page: string;
  /** A well-formed, harmless argument (it must pass validation to reach the permission check). */
  sample: Record<string, unknown>;
}

const actions: ActionEntry[] = [
  { key: "app/(auth)/login/actions.ts#signIn", permission: null, page: "/login", sample: { email: "nobody@testers.example", password: "not-a-password" } },
  { key: "app/(auth)/login/actions.ts#signOut", permission: null, page: "/login", sample: {} },
  { key: "app/(auth)/register/actions.ts#registerAsTester", permission: null, page: "/register", sample: { email: "bad" } },
  { key: "app/(auth)/forgot-password/actions.ts#askForPasswordReset", permission: null, page: "/forgot-password", sample: { email: "not-an-address" } },
  { key: "app/(auth)/reset-password/[token]/actions.ts#chooseNewPassword", permission: null, page: "/reset-password/not-a-real-token-aaaaaaaaaaaa", sample: { token: "x" } },
  { key: "app/(auth)/invite/[token]/actions.ts#finishInvitation", permission: null, page: "/invite/not-a-real-token-aaaaaaaaaaaa", sample: { token: "x" } },
  { key: "app/(auth)/owner-access/actions.ts#signInWithCode", permission: null, page: "/owner-access", sample: { accountNumber: "", code: "" } },
  { key: "app/(auth)/owner-access/actions.ts#requestSignInLink", permission: null, page: "/owner-access", sample: { email: "not-an-address" } },
  { key: "app/o/[token]/actions.ts#continueWithLink", permission: null, page: "/o/not-a-real-token-aaaaaaaaaaaa", sample: { token: "not-a-real-token-aaaaaaaaaaaa" } },
  { key: "app/(portal)/inspector/testers/actions.ts#decideTester", permission: "testers.review", page: "/inspector/testers", sample: { approvalId: 999999, decision: "approve" } },
  { key: "app/(portal)/owner/actions.ts#addContactEmail", permission: "owner.portal", page: "/owner", sample: { email: "someone.new@owners.example" } },
];

const appDir = path.join(process.cwd(), "app");

/** Every exported function of every "use server" file under app/. */
function discoverActions(): { key: string; source: string; name: string }[] {
  const found: { key: string; source: string; name: string }[] = [];
  const walk = (dir: string) => {
    for (const name of readdirSync(dir)) {
      const full = path.join(dir, name);
      if (statSync(full).isDirectory()) walk(full);
      else if (/\.(ts|tsx)$/.test(name)) {
        const source = readFileSync(full, "utf8");
        if (!/^\s*["']use server["']/.test(source)) continue;
        for (const m of source.matchAll(/export\s+(?:const|async function|function)\s+(\w+)/g)) {
          found.push({ key: `${path.relative(process.cwd(), full)}#${m[1]}`, source, name: m[1]! });
        }
      }
    }
  };
  walk(appDir);
  return found;
}

/** The action ids from the build's manifest: the browser posts these in the Next-Action header. */
function actionIds(): Map<string, string> {
  const dist = process.env.NEXT_DIST_DIR || ".next";
  const manifest = JSON.parse(readFileSync(path.join(process.cwd(), dist, "server", "server-reference-manifest.json"), "utf8")) as { node: Record<string, { exportedName?: string; filename?: string }> };
  const ids = new Map<string, string>();
  for (const [id, entry] of Object.entries(manifest.node)) if (entry.filename && entry.exportedName) ids.set(`${entry.filename}#${entry.exportedName}`, id);
  return ids;
}

const accounts: Record<Exclude<Who, "anon">, string> = { tester: demoAccounts.tester, inspector: demoAccounts.inspector, admin: demoAccounts.admin, owner: demoAccounts.owner };

async function callAction(entry: ActionEntry, id: string, who: Who, argument: unknown) {
  let request = api()
    .post(entry.page)
    .set("Next-Action", id)
    .set("Origin", ORIGIN)
    .set("Accept", "text/x-component")
    .set("content-type", "text/plain;charset=UTF-8")
    .redirects(0);
  if (who !== "anon") request = request.set("Cookie", await sessionCookieFor(accounts[who]));
  const response = await request.send(JSON.stringify([argument]));
  return { status: response.status, text: response.text ?? "" };
}

describe("server actions", () => {
  test("every server action in the code has an entry, and no entry is stale", () => {
    const discovered = discoverActions().map((a) => a.key).sort();
    expect(discovered).toEqual(actions.map((a) => a.key).sort());
  });

  test("each action's wrapper checks the permission the table expects", () => {
    for (const found of discoverActions()) {
      const entry = actions.find((a) => a.key === found.key)!;
      const declaration = found.source.match(new RegExp(`export\\s+const\\s+${found.name}\\s*=\\s*validatedAction\\([^,]+,\\s*("([\\w.]+)"|null)`));
      if (!declaration) {
        // A plain function (sign-out) must not be gated: it only ends the caller's own session.
        expect(entry.permission, `${found.key} is not wrapped; give it a permission or wrap it`).toBeNull();
        continue;
      }
      expect(declaration[2] ?? null, found.key).toBe(entry.permission);
    }
  });

  test("the build knows every action", () => {
    const ids = actionIds();
    for (const entry of actions) expect(ids.has(entry.key), entry.key).toBe(true);
  });

  const who: Who[] = ["anon", "tester", "inspector", "admin", "owner"];
  const cases = actions.filter((a) => a.permission !== null).flatMap((entry) => who.map((w) => ({ entry, who: w, label: `${entry.key.split("/").slice(-2).join("/")} as ${w}` })));

  test.each(cases)("$label", async ({ entry, who: caller }) => {
    const ids = actionIds();
    const before = await countAllTables();
    const { status, text } = await callAction(entry, ids.get(entry.key)!, caller, entry.sample);
    expect(status).toBeLessThan(500);
    const { permissionTable } = await import("@/lib/auth/permissions");
    const allowed = caller !== "anon" && (permissionTable[entry.permission!] as readonly string[]).includes(caller);
    if (caller === "anon") expect(text).toContain("Your session has ended");
    else if (!allowed) expect(text).toContain("You are not allowed to do this.");
    else {
      expect(text).not.toContain("You are not allowed to do this.");
      expect(text).not.toContain("Your session has ended");
    }
    if (!allowed) expect(await countAllTables()).toEqual(before);
  });
});

describe("hostile arguments to every action", () => {
  const leaf = fc.oneof(fc.string(), fc.integer(), fc.double(), fc.boolean(), fc.constant(null), fc.constantFrom("' OR 1=1 --", "<script>alert(1)</script>", "\u0000", "=1+1", "x".repeat(20_000), "9999-99-99", "-1"));
  const argument = fc.oneof(fc.dictionary(fc.oneof(fc.string({ maxLength: 10 }), fc.constantFrom("email", "password", "token", "code", "accountNumber", "approvalId", "decision", "reason", "__proto__")), fc.oneof(leaf, fc.array(leaf, { maxLength: 3 })), { maxKeys: 6 }), leaf, fc.array(leaf, { maxLength: 3 }));

  test.each(actions.map((entry) => ({ entry, label: entry.key.split("/").slice(-2).join("/") })))("$label", async ({ entry }) => {
    const id = actionIds().get(entry.key)!;
    const caller: Who = entry.permission === "owner.portal" ? "owner" : entry.permission ? "inspector" : "anon";
    await fc.assert(
      fc.asyncProperty(argument, async (payload) => {
        const before = await countAllTables();
        const { status, text } = await callAction(entry, id, caller, payload);
        expect(status, text.slice(0, 300)).toBeLessThan(500);
        if (/"ok":false/.test(text)) expect(await countAllTables()).toEqual(before);
      }),
      { numRuns: Number(process.env.FUZZ_RUNS ?? 12), seed: 20261202 },
    );
  });
});
