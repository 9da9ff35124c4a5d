// The demo inspector's day in the browser: filter the queue, open a report, return it with a
// reason, accept another, import a small inventory CSV, open the compliance picture — with
// screenshots. The reports are the test's own (a tester made here), filed in the demo program.
import { mkdtempSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import path from "node:path";
import { eq } from "drizzle-orm";
import type { Browser } from "playwright-core";
import { afterAll, beforeAll, describe, expect, test } from "vitest";
import { testReports } from "@/db/schema";
import { DEMO_PASSWORD, demoAccounts } from "@/db/seed/demo-accounts";
import { addDays } from "@/lib/rules";
import { closeTestDb, testDb } from "../helpers/db";
import { appUrl, launchBrowser, screenshot, signInWithBrowser } from "../helpers/browser";
import { createAssembly, createReport, createSite, createTester, failingRp, today, type TesterFixture } from "../integration/inspector-fixtures";

let browser: Browser;
let tester: TesterFixture;
let failing: { id: number; reportNumber: string };
let passing: { id: number; reportNumber: string };

beforeAll(async () => {
  browser = await launchBrowser();
  tester = await createTester({ programIds: [1] });
  const site = await createSite(1, { name: "Wickerby Dairy", hazard: "high" });
  failing = await createReport({ programId: 1, assemblyId: (await createAssembly(1, site.id)).id, tester, initial: failingRp, testedOn: addDays(today(), -3) });
  passing = await createReport({ programId: 1, assemblyId: (await createAssembly(1, site.id)).id, tester, testedOn: addDays(today(), -2) });
});

afterAll(async () => {
  await browser?.close();
  await closeTestDb();
});

describe("the inspector's review and inventory work", () => {
  test("filter, return, accept, import, compliance", async () => {
    const context = await browser.newContext({ viewport: { width: 1400, height: 900 } });
    const page = await signInWithBrowser(context, demoAccounts.inspector, DEMO_PASSWORD);
    expect(new URL(page.url()).pathname).toBe("/inspector");
    await screenshot(page, "inspector-home");

    // The queue, filtered to the test's tester and then to failed tests.
    await page.goto(appUrl("/inspector/reports"));
    await page.getByLabel("Tester").selectOption(String(tester.id));
    await expect.poll(() => page.getByText(/of [\d,]+ waiting reports match/).textContent()).toMatch(/^2 of/);
    await page.getByLabel("Grade").selectOption("fail");
    await expect.poll(() => page.getByText(/of [\d,]+ waiting reports match/).textContent()).toMatch(/^1 of/);
    await expect.poll(() => new URL(page.url()).searchParams.get("grade")).toBe("fail");
    await screenshot(page, "inspector-queue-filtered");

    // Open the failed one and return it with a reason from the program's list.
    await page.getByRole("link", { name: failing.reportNumber }).click();
    await page.waitForURL((url) => url.pathname === `/inspector/reports/${failing.id}`);
    await expect.poll(() => page.getByRole("heading", { level: 1 }).textContent()).toContain(failing.reportNumber);
    await page.getByText("History of this assembly").waitFor();
    await screenshot(page, "inspector-report-review");
    await page.getByRole("button", { name: "Return for correction…" }).click();
    await page.getByLabel(/Readings are missing or incomplete/).check();
    await page.getByLabel("Another reason, in your words").fill("Please record check #2 as tight or leaking.");
    await page.getByRole("button", { name: "Return the report" }).click();
    await page.getByText(`Report ${failing.reportNumber} returned to the tester`).first().waitFor();
    await page.getByText(/returned to the tester by .+ on \d{1,2} [A-Z][a-z]{2} \d{4}/).first().waitFor();
    await screenshot(page, "inspector-report-returned");

    // Accept the passing one.
    await page.goto(appUrl(`/inspector/reports?testerId=${tester.id}`));
    await page.getByRole("link", { name: passing.reportNumber }).click();
    await page.waitForURL((url) => url.pathname === `/inspector/reports/${passing.id}`);
    await page.getByRole("button", { name: "Accept and issue the certificate" }).click();
    await page.getByText(`Report ${passing.reportNumber} accepted`).first().waitFor();
    await expect.poll(() => page.getByText(/Compliance certificate [A-Z0-9]{12} issued/).count()).toBeGreaterThan(0);
    await screenshot(page, "inspector-report-accepted");
    const statuses = await testDb().select({ id: testReports.id, status: testReports.status }).from(testReports).where(eq(testReports.testerId, tester.id));
    expect(Object.fromEntries(statuses.map((s) => [s.id, s.status]))).toEqual({ [failing.id]: "returned", [passing.id]: "accepted" });

    // Import a small inventory.
    const stamp = Date.now().toString(36).toUpperCase();
    const dir = mkdtempSync(path.join(tmpdir(), "zw-e2e-"));
    const file = path.join(dir, "quillmere-additions.csv");
    writeFileSync(
      file,
      [
        "Account,Site name,Service address,City,Hazard,Type,Manufacturer,Model,Serial number,Location,Installed",
        `E2E${stamp}1,Pellham Print Works,14 Thistlecombe Lane,Quillmere,high,RP,Tallowmere,TR-4,E2E-${stamp}-1,meter vault at the street,2021-03-04`,
        `E2E${stamp}2,Oakhanger Nursery,3 Bramblecote Road,Quillmere,low,PVB,Brindlewick,BW-100,E2E-${stamp}-2,irrigation box by the drive,2022-05-06`,
        `E2E${stamp}3,,,,,XX,Corvane,CV-12,E2E-${stamp}-3,service line,2022-05-06`,
      ].join("\n"),
    );
    await page.goto(appUrl("/inspector/inventory/import"));
    await page.locator('input[type="file"]').setInputFiles(file);
    await page.getByText("The first rows").waitFor();
    await expect.poll(() => page.getByLabel("Account number").inputValue()).toBe("Account");
    await screenshot(page, "inspector-import-mapping");
    await page.getByRole("button", { name: "Check every row and import" }).click();
    await page.getByRole("button", { name: "Import another file" }).waitFor({ timeout: 60_000 });
    await expect.poll(() => page.getByText("Download the rows that were not imported").count()).toBe(1);
    await expect.poll(() => page.getByText(/2 new, 0 updated, 0 unchanged, 1 not imported/).count()).toBeGreaterThan(0);
    await screenshot(page, "inspector-import-done");

    // The compliance picture.
    await page.goto(appUrl("/inspector/compliance"));
    await expect.poll(() => page.getByRole("heading", { level: 1 }).textContent()).toBe("Compliance picture");
    await page.getByText("Tests per month, last 24 months").waitFor();
    await screenshot(page, "inspector-compliance");
    await page.getByRole("link", { name: /Past the repair deadline \(/ }).click();
    await page.waitForURL((url) => url.searchParams.get("list") === "repair_overdue");
    await context.close();
  });

  test("the admin's settings, users and audit log pages", async () => {
    const context = await browser.newContext({ viewport: { width: 1400, height: 900 } });
    const page = await signInWithBrowser(context, demoAccounts.admin, DEMO_PASSWORD);
    for (const [pathname, heading, name] of [
      ["/admin/settings", "Program settings", "admin-settings"],
      ["/admin/users", "Users", "admin-users"],
      ["/admin/audit", "Audit log", "admin-audit"],
      ["/admin/return-reasons", "Return reasons", "admin-return-reasons"],
    ] as const) {
      await page.goto(appUrl(pathname));
      await expect.poll(() => page.getByRole("heading", { level: 1 }).textContent()).toBe(heading);
      await screenshot(page, name);
    }
    // A bad notice schedule is refused on the form with lib/rules' words.
    await page.goto(appUrl("/admin/settings"));
    await page.getByLabel("Final notice").fill("0");
    await page.getByRole("button", { name: "Save the settings" }).click();
    await expect.poll(() => page.getByText(/must come after the overdue notice/).count()).toBeGreaterThan(0);
    await screenshot(page, "admin-settings-refused");
    await context.close();
  });

  test("the public tester roster, on a phone", async () => {
    const context = await browser.newContext({ viewport: { width: 390, height: 844 } });
    const page = await context.newPage();
    await page.goto(appUrl("/testers"));
    await expect.poll(() => page.getByRole("heading", { level: 1 }).textContent()).toBe("Certified backflow assembly testers");
    expect(await page.content()).not.toMatch(/@testers\.example/);
    await screenshot(page, "public-testers-phone");
    await context.close();
  });
});
