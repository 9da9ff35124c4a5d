// No answer of the app ever carries a password hash, a token hash, a session token or a key:
// every page and JSON route in the access table is fetched as each role and scanned.
import { afterAll, describe, expect, test } from "vitest";
import { demoAccounts } from "@/db/seed/demo-accounts";
import { allRoutes } from "./access/all-routes";
import type { Who } from "./access/routes";
import { closeTestDb } from "../helpers/db";
import { api, sessionCookieFor } from "../helpers/http";

afterAll(closeTestDb);

const accounts: Record<Exclude<Who, "anon">, string> = { tester: demoAccounts.tester, inspector: demoAccounts.inspector, admin: demoAccounts.admin, owner: demoAccounts.owner };

const forbidden: [string, RegExp][] = [
  ["an argon2 hash", /\$argon2(id|i|d)\$/],
  ["a password hash field", /password_?hash/i],
  ["a token hash field", /token_?hash/i],
  ["the mail API key", /re_local_standin/],
  ["a payments secret key", /sk_(test|live)_[A-Za-z0-9]{6,}/],
  ["a webhook signing secret", /whsec_[A-Za-z0-9]{6,}/],
];

describe("answers carry no secrets", () => {
  const gets = allRoutes.filter((r) => r.method === "GET");
  test.each((["anon", "tester", "inspector", "admin", "owner"] as Who[]).map((who) => ({ who })))("every GET as $who", async ({ who }) => {
    const cookie = who === "anon" ? null : await sessionCookieFor(accounts[who]);
    for (const entry of gets) {
      let request = api().get(entry.path ?? entry.route).redirects(0);
      if (cookie) request = request.set("Cookie", cookie);
      const response = await request;
      const text = response.text ?? "";
      for (const [what, pattern] of forbidden) expect(pattern.test(text), `${entry.path ?? entry.route} as ${who} shows ${what}`).toBe(false);
      if (cookie) expect(text.includes(cookie.split("=")[1]!), `${entry.route} echoes the session token`).toBe(false);
    }
  });
});
