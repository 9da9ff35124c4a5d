// Hostile bodies for every JSON route that changes state, as every role that may call it:
// random and adversarial JSON (wrong types, huge and odd strings, injection strings, negative,
// NaN-like and far-off values). Every answer is a clear 4xx or a success, never a 5xx, and a
// refused request writes nothing.
import fc from "fast-check";
import { afterAll, describe, expect, test } from "vitest";
import { demoAccounts } from "@/db/seed/demo-accounts";
import { allRoutes } from "./access/all-routes";
import type { RouteEntry, Who } from "./access/routes";
import { closeTestDb, countAllTables } from "../helpers/db";
import { api, ORIGIN, sessionCookieFor } from "../helpers/http";

afterAll(closeTestDb);

const accounts: Record<Exclude<Who, "anon">, string> = { tester: demoAccounts.tester, inspector: demoAccounts.inspector, admin: demoAccounts.admin, owner: demoAccounts.owner };

/** Routes whose success would sign the fuzzing session out or send mail to real-looking people; fuzzed as the public. */
const fuzzAsPublicOnly = new Set(["DELETE /api/auth/session"]);

const adversarialString = fc.oneof(
  fc.string(),
  fc.string({ unit: "grapheme", maxLength: 40 }),
  fc.constantFrom("' OR 1=1 --", "'; DROP TABLE users; --", "<script>alert(1)</script>", '"><img src=x onerror=alert(1)>', "=HYPERLINK(\"http://x\")", "../../../../etc/passwd", "%00", "\u0000", "\uFFFF", "𝕏".repeat(50), "NaN", "Infinity", "-1", "1e309", "0x10", " ", ""),
  fc.constant("x".repeat(70_000)),
);
const adversarialNumber = fc.oneof(fc.integer(), fc.double(), fc.constantFrom(-1, 0, 1e308, -1e308, Number.MAX_SAFE_INTEGER, 2 ** 53 + 1));
const adversarialDate = fc.constantFrom("0000-00-00", "1900-01-01", "2999-12-31", "9999-12-31", "2026-02-30", "2026-13-01", "yesterday", "2026-12-01T25:61:00Z");
const leaf = fc.oneof(adversarialString, adversarialNumber, adversarialDate, fc.boolean(), fc.constant(null));
const body = fc.oneof(
  fc.dictionary(fc.oneof(fc.string({ maxLength: 12 }), fc.constantFrom("email", "password", "id", "reportIds", "amountCents", "kind", "readings", "__proto__", "constructor")), fc.oneof(leaf, fc.array(leaf, { maxLength: 5 }), fc.dictionary(fc.string({ maxLength: 8 }), leaf, { maxKeys: 4 })), { maxKeys: 8 }),
  fc.array(leaf, { maxLength: 5 }),
  leaf,
);

function callersOf(entry: RouteEntry): Who[] {
  if (fuzzAsPublicOnly.has(`${entry.method} ${entry.route}`)) return ["anon"];
  const allowed = (Object.entries(entry.expect) as [Who, unknown][]).filter(([, expected]) => expected === "ok" || (typeof expected === "number" && expected < 400) || expected === 422).map(([who]) => who);
  return allowed.length ? allowed : ["anon"];
}

const targets = allRoutes.filter((r) => r.method !== "GET").flatMap((entry) => callersOf(entry).map((who) => ({ entry, who, label: `${entry.method} ${entry.path ?? entry.route} as ${who}` })));

describe("hostile JSON bodies", () => {
  test.each(targets)("$label", async ({ entry, who }) => {
    const cookie = who === "anon" ? null : await sessionCookieFor(accounts[who]);
    await fc.assert(
      fc.asyncProperty(body, async (payload) => {
        const before = await countAllTables();
        let request = api()[entry.method.toLowerCase() as "post"](entry.path ?? entry.route)
          .set("Origin", ORIGIN)
          .set("content-type", "application/json")
          .redirects(0);
        if (cookie) request = request.set("Cookie", cookie);
        const response = await request.send(JSON.stringify(payload));
        expect(response.status, `${entry.route} answered ${response.status}: ${response.text.slice(0, 200)}`).toBeLessThan(500);
        if (response.status >= 400) {
          expect(typeof response.body.error, "a refused request says why").toBe("string");
          expect(await countAllTables(), "a refused request writes nothing").toEqual(before);
        }
      }),
      { numRuns: Number(process.env.FUZZ_RUNS ?? 15), seed: 20261201 },
    );
  });

  test("a body that is not JSON at all", async () => {
    for (const entry of allRoutes.filter((r) => r.method === "POST")) {
      const response = await api().post(entry.path ?? entry.route).set("Origin", ORIGIN).set("content-type", "application/json").send("{not json");
      expect(response.status, entry.route).toBeLessThan(500);
    }
  });
});
