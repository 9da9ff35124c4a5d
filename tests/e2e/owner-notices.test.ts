// Notices in the browser: an owner opens the link in a notice e-mail and lands on their sites;
// the link then no longer works; an owner with a letter signs in with the account number and
// code; a program admin runs the day's notices from the notices page and watches it finish.
import { spawnSync } from "node:child_process";
import { writeFileSync } from "node:fs";
import path from "node:path";
import type { Browser } from "playwright-core";
import { afterAll, beforeAll, describe, expect, test } from "vitest";
import { closeDb } from "@/db/client";
import { DEMO_PASSWORD, demoAccounts } from "@/db/seed/demo-accounts";
import { runNoticesForProgram } from "@/lib/data/notices-run";
import { appUrl, launchBrowser, screenshot, signInWithBrowser } from "../helpers/browser";
import { closeTestDb } from "../helpers/db";
import { sessionCookieFor } from "../helpers/http";
import { firstLink, messagesTo } from "../helpers/mail";
import { createNoticeWorld } from "../integration/notices-world";

let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
  await closeDb();
  await closeTestDb();
});

const shots = () => process.env.SCREENSHOT_DIR ?? path.join(process.cwd(), ".data-test", "screenshots");

describe("owners signing in from notices", () => {
  test("the e-mailed link: a page that says who it is for, one press, the owner's sites; then it no longer works", async () => {
    const world = await createNoticeWorld();
    const { siteId } = await world.addSite({ name: "Rowan's greenhouse", contacts: [{ name: "Rowan Pellwood", email: world.email("rowan") }] });
    await world.addAssembly(siteId, { label: "mister supply line", kind: "PVB", nextDueInDays: -10 });
    const run = await runNoticesForProgram(world.programId, { trigger: "schedule" });
    expect(run.sent).toBe(1);
    const [message] = await messagesTo(world.email("rowan"));
    const link = firstLink(message!, "/o/");
    const token = new URL(link).pathname.split("/").pop()!;

    const context = await browser.newContext({ viewport: { width: 390, height: 844 } });
    const page = await context.newPage();
    await page.goto(appUrl(`/o/${token}`));
    await expect.poll(() => page.getByRole("heading", { level: 1 }).textContent()).toBe("Welcome, Rowan Pellwood");
    await screenshot(page, "owner-link-welcome-phone");
    await Promise.all([page.waitForURL((url) => url.pathname === "/owner"), page.getByRole("button", { name: "See my assemblies" }).click()]);
    await expect.poll(() => page.locator("main").textContent()).toMatch(/Your assembly at the mister supply line is overdue/);
    await screenshot(page, "owner-link-signed-in-phone");

    const other = await browser.newContext({ viewport: { width: 390, height: 844 } });
    const again = await other.newPage();
    await again.goto(appUrl(`/o/${token}`));
    await expect.poll(() => again.getByRole("heading", { level: 1 }).textContent()).toBe("This link no longer works");
    await screenshot(again, "owner-link-used-phone");
    await other.close();
    await context.close();
  });

  test("the letter: account number and one-time code on the owner page", async () => {
    const world = await createNoticeWorld();
    const site = await world.addSite({ name: "Sable Mill cottages", contacts: [{ name: "Tamsin Orrell", email: null }] });
    await world.addAssembly(site.siteId, { label: "well house", kind: "DC", nextDueInDays: 12 });
    const run = await runNoticesForProgram(world.programId, { trigger: "schedule" });
    expect(run.letters).toBe(1);

    // The admin downloads the day's letters; the code is read off the printed page.
    const cookie = (await sessionCookieFor(world.adminEmail)).split("=");
    const admin = await browser.newContext();
    await admin.addCookies([{ name: cookie[0]!, value: cookie[1]!, url: appUrl("/") }]);
    const pdf = await admin.request.get(appUrl(`/api/notices/runs/${run.runId}/letters`));
    expect(pdf.status()).toBe(200);
    const file = path.join(shots(), "owner-letters.pdf");
    writeFileSync(file, await pdf.body());
    spawnSync("pdftoppm", ["-png", "-r", "70", "-singlefile", file, path.join(shots(), "owner-letter")]);
    const text = spawnSync("pdftotext", ["-layout", file, "-"], { encoding: "utf8" }).stdout;
    const code = /one-time code[\s\S]*?([A-Z0-9]{5}-[A-Z0-9]{5})/i.exec(text)?.[1];
    expect(code).toBeTruthy();
    await admin.close();

    const context = await browser.newContext({ viewport: { width: 1280, height: 900 } });
    const page = await context.newPage();
    await page.goto(appUrl("/owner-access"));
    await page.getByLabel("Account number").fill(site.accountNumber);
    await page.getByLabel("One-time code").fill("ZZZZZ-ZZZZZ");
    await page.getByRole("button", { name: "See my assemblies" }).click();
    await expect.poll(() => page.getByRole("alert").first().textContent()).toMatch(/do not match a current letter/);
    await screenshot(page, "owner-access-wrong-code");
    await page.getByLabel("One-time code").fill(code!);
    await Promise.all([page.waitForURL((url) => url.pathname === "/owner"), page.getByRole("button", { name: "See my assemblies" }).click()]);
    await expect.poll(() => page.locator("main").textContent()).toMatch(/Get notices by e-mail/);
    await expect.poll(() => page.locator("main").textContent()).toMatch(/Your assembly at the well house is due for its yearly test by/);
    await screenshot(page, "owner-access-signed-in");
    await context.close();
  });
});

describe("the admin's notice run", () => {
  test("the button starts today's run; the progress bar follows it to the result", async () => {
    const context = await browser.newContext({ viewport: { width: 1280, height: 900 } });
    const page = await signInWithBrowser(context, demoAccounts.neighbourAdmin, DEMO_PASSWORD);
    await page.goto(appUrl("/inspector/notices"));
    await expect.poll(() => page.getByRole("heading", { level: 1 }).textContent()).toBe("Notices");
    await screenshot(page, "notices-before-run");
    await page.getByRole("button", { name: "Run today's notices now" }).click();
    await expect.poll(() => page.getByRole("progressbar").count()).toBe(1);
    await expect.poll(() => page.getByRole("status").first().textContent(), { timeout: 60_000 }).toMatch(/Done: \d+ e-mails sent|Skipped/);
    await page.reload();
    await expect.poll(() => page.locator("main").textContent()).toMatch(/Notice log \(\d+\)/);
    await screenshot(page, "notices-after-run");
    await context.close();
  });
});
