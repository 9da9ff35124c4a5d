// The demo owner in the browser: signs in, sees an overdue assembly in plain words, opens its
// history, downloads a compliance certificate and checks it on the public page. Screenshots kept.
import { spawnSync } from "node:child_process";
import { writeFileSync } from "node:fs";
import path from "node:path";
import type { Browser } from "playwright-core";
import { afterAll, beforeAll, describe, expect, test } from "vitest";
import { DEMO_PASSWORD, demoAccounts } from "@/db/seed/demo-accounts";
import { appUrl, launchBrowser, screenshot, signInWithBrowser } from "../helpers/browser";

let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
});

const shots = () => process.env.SCREENSHOT_DIR ?? path.join(process.cwd(), ".data-test", "screenshots");

describe("the demo owner", () => {
  test("sees an overdue assembly, its history, and downloads a certificate that verifies", async () => {
    const context = await browser.newContext({ viewport: { width: 1280, height: 900 } });
    const page = await signInWithBrowser(context, demoAccounts.owner, DEMO_PASSWORD);
    expect(new URL(page.url()).pathname).toBe("/owner");
    await expect.poll(() => page.getByRole("heading", { level: 1 }).textContent()).toBe("My sites");

    // What needs doing, in plain words, most urgent first.
    const todo = page.getByRole("region", { name: /What needs doing/ }).or(page.locator("section", { hasText: "What needs doing" }));
    await expect.poll(() => todo.first().textContent()).toMatch(/Your assembly at the ice machine supply is overdue: its yearly test was due on \d{1,2} \w+ \d{4}/);
    await expect.poll(() => todo.first().textContent()).toMatch(/Your assembly at the kitchen branch line failed on \d{1,2} \w+ \d{4}; it must be repaired and retested by \d{1,2} \w+ \d{4}\./);
    expect(await page.getByText("Overdue", { exact: false }).count()).toBeGreaterThan(0);
    await screenshot(page, "owner-home");

    // The overdue assembly's page: the statement, the returned report, the history.
    await page.locator("tr", { hasText: "ice machine supply" }).getByRole("link").first().click();
    await page.waitForURL(/\/owner\/assemblies\/\d+$/);
    await expect.poll(() => page.locator("main").textContent()).toMatch(/overdue/);
    await expect.poll(() => page.locator("main").textContent()).toMatch(/returned to the tester for correction/);
    await expect.poll(() => page.getByRole("heading", { name: /Test history/ }).textContent()).toMatch(/Test history \(3\)/);
    await screenshot(page, "owner-assembly-overdue");

    // A current assembly: download its certificate.
    await page.goto(appUrl("/owner"));
    const row = page.locator("tr", { hasText: "irrigation supply, side yard" });
    const certificateLink = row.getByRole("link", { name: "Certificate (PDF)" });
    const href = await certificateLink.getAttribute("href");
    expect(href).toMatch(/^\/api\/certificates\/[A-Z2-9]{12}\/pdf$/);
    const response = await context.request.get(appUrl(href!));
    expect(response.status()).toBe(200);
    expect(response.headers()["content-type"]).toBe("application/pdf");
    const bytes = await response.body();
    expect(bytes.subarray(0, 5).toString()).toBe("%PDF-");
    const file = path.join(shots(), "owner-certificate.pdf");
    writeFileSync(file, bytes);
    spawnSync("pdftoppm", ["-png", "-r", "70", "-singlefile", file, path.join(shots(), "owner-certificate")]);
    const text = spawnSync("pdftotext", [file, "-"], { encoding: "utf8" }).stdout;
    expect(text).toContain("Certificate of backflow assembly test compliance");
    expect(text).toContain("Hearthside Restaurant");

    // The code on it, checked on the public page by anyone.
    const code = href!.split("/")[3]!;
    const visitor = await browser.newContext({ viewport: { width: 800, height: 900 } });
    const check = await visitor.newPage();
    await check.goto(appUrl("/verify"));
    await check.getByLabel("Verification code").fill(`${code.slice(0, 4)}-${code.slice(4, 8)}-${code.slice(8)}`.toLowerCase());
    await Promise.all([check.waitForURL(new RegExp(`/verify/${code}$`)), check.getByRole("button", { name: "Check" }).click()]);
    await expect.poll(() => check.locator("main").textContent()).toMatch(/Genuine and current/);
    expect(await check.locator("main").textContent()).not.toContain("Wendeline");
    await screenshot(check, "verify-genuine");
    await check.goto(appUrl("/verify/ABCDEFGHJKMN"));
    await expect.poll(() => check.locator("main").textContent()).toMatch(/Not found/);
    await screenshot(check, "verify-not-found");
    await visitor.close();
    await context.close();
  });

  test("on a phone: the same list, readable", async () => {
    const context = await browser.newContext({ viewport: { width: 390, height: 844 } });
    const page = await signInWithBrowser(context, demoAccounts.owner, DEMO_PASSWORD);
    await expect.poll(() => page.locator("main").textContent()).toMatch(/What needs doing/);
    await screenshot(page, "owner-home-phone");
    await context.close();
  });
});
