// The demo tester on a phone: finds an RP, files a test that fails, records the repair,
// retests, survives a lost connection and a reload, signs, submits and downloads the PDF.
import { execFileSync } from "node:child_process";
import type { Browser } from "playwright-core";
import { afterAll, beforeAll, describe, expect, test } from "vitest";
import { DEMO_PASSWORD, demoAccounts } from "@/db/seed/demo-accounts";
import { closeTestDb } from "../helpers/db";
import { appUrl, launchBrowser, screenshot, signInWithBrowser } from "../helpers/browser";
import { pickUntestedRp, today } from "../integration/tester-fixtures";

let browser: Browser;
beforeAll(async () => {
  browser = await launchBrowser();
});
afterAll(async () => {
  await browser?.close();
  await closeTestDb();
});

describe("a field test on a phone", () => {
  test("RP fails, is repaired and retested, submitted, and the PDF says so", async () => {
    const assembly = await pickUntestedRp();
    const context = await browser.newContext({ viewport: { width: 390, height: 844 }, hasTouch: true, isMobile: true });
    const page = await signInWithBrowser(context, demoAccounts.tester, DEMO_PASSWORD);

    // Find it the way a tester would: program first, then the serial as it is typed.
    await page.goto(appUrl("/tester/assemblies"));
    await page.getByRole("radio", { name: /Quillmere Valley Water District/ }).click();
    await page.getByLabel("Serial number, street address or account number").fill(assembly.serial.slice(0, 6));
    const result = page.locator(`[data-assembly="${assembly.id}"]`);
    await result.waitFor();
    await screenshot(page, "tester-find-phone");
    await Promise.all([page.waitForURL(/\/tester\/reports\/new\?assembly=/), result.getByRole("link", { name: "Start a test" }).click()]);

    await page.getByText("Gaugewright DG-5").click();
    await page.getByRole("radio", { name: "As approved", exact: true }).click();
    await page.getByRole("radio", { name: "Air gap present" }).click();
    await page.getByLabel(/Line pressure/).fill("63");
    // The minimum shows before anything is typed.
    await expect.poll(() => page.locator("#initial-reliefValveOpeningPoint-grade").textContent()).toMatch(/Held to ≥ 2\.0 psid/i);
    await page.locator("#initial-reliefValveOpeningPoint").fill("1.7");
    await expect.poll(() => page.locator("#initial-reliefValveOpeningPoint-grade").textContent()).toMatch(/✗ Fail · held to ≥ 2\.0 psid; not opening fails/);
    await expect.poll(() => page.locator("#initial-reliefValveOpeningPoint-grade").textContent()).toMatch(/EPA Cross-Connection Control Manual/);
    await page.locator("#initial-check1Differential").fill("6,2");
    await expect.poll(() => page.locator("#initial-check1Differential-grade").textContent()).toMatch(/✓ Pass · held to ≥ 5\.0 psid/);
    await page.locator("#initial-check1ClosedTight").getByRole("radio", { name: "Closed tight" }).click();
    await page.locator("#initial-check2ClosedTight").getByRole("radio", { name: "Held tight" }).click();
    await page.locator("#initial-shutoff2Tight").getByRole("radio", { name: "Tight", exact: true }).click();
    await expect.poll(() => page.getByTestId("initial-outcome").getAttribute("data-outcome")).toBe("fail");

    // The repair section opens with the safety cautions.
    await expect.poll(() => page.getByRole("note").textContent()).toMatch(/spring-loaded/);
    await page.getByRole("radio", { name: "Yes: record the repair and retest" }).click();
    await page.getByRole("button", { name: /Relief valve/ }).click();
    await page.getByRole("group", { name: "Relief valve: Diaphragm" }).getByRole("button", { name: "Replaced" }).click();
    await page.locator("#retest-reliefValveOpeningPoint").fill("2.6");
    await page.locator("#retest-check1Differential").fill("6.0");
    await page.locator("#retest-check1ClosedTight").getByRole("radio", { name: "Closed tight" }).click();
    await page.locator("#retest-check2ClosedTight").getByRole("radio", { name: "Held tight" }).click();
    await page.locator("#retest-shutoff2Tight").getByRole("radio", { name: "Tight", exact: true }).click();
    await expect.poll(() => page.getByTestId("final-outcome").textContent()).toBe("Passed after repair");
    await expect.poll(() => page.getByTestId("save-status").getAttribute("data-server"), { timeout: 15_000 }).toBe("saved");

    // No signal in the meter vault: typing goes on, the phone keeps it, the server gets it later.
    await context.setOffline(true);
    await page.locator("#field-remarks").fill("Relief valve diaphragm torn; replaced from the maker's repair kit.");
    await expect.poll(() => page.getByTestId("save-status").textContent(), { timeout: 15_000 }).toMatch(/^Offline · saved on this phone/);
    await context.setOffline(false);
    await expect.poll(() => page.getByTestId("save-status").getAttribute("data-server"), { timeout: 20_000 }).toBe("saved");

    // A reload brings the test back as it was.
    await page.reload();
    await expect.poll(() => page.getByText(/Continuing the test saved on this/).count()).toBe(1);
    expect(await page.locator("#initial-reliefValveOpeningPoint").inputValue()).toBe("1.7");
    expect(await page.locator("#field-remarks").inputValue()).toMatch(/diaphragm torn/);

    await page.locator("#field-attestationName").fill("Dana Whitlock-Ray");
    await page.getByLabel("The readings are true and were taken by me.").check();
    await screenshot(page, "tester-form-phone");
    await page.setViewportSize({ width: 1280, height: 860 });
    await screenshot(page, "tester-form-desktop");
    await page.setViewportSize({ width: 390, height: 844 });

    await Promise.all([page.waitForURL(/\/tester\/reports\/\d+\?filed=1/, { timeout: 30_000 }), page.getByTestId("submit-report").click()]);
    await expect.poll(() => page.getByText("Report filed").count()).toBe(1);
    await screenshot(page, "tester-report-filed-phone");
    const reportId = Number(new URL(page.url()).pathname.split("/").pop());
    const reportNumber = (await page.getByRole("heading", { level: 1 }).textContent())!.replace("Report ", "").trim();

    const pdf = await page.request.get(appUrl(`/api/reports/${reportId}/pdf`));
    expect(pdf.status()).toBe(200);
    expect(pdf.headers()["content-type"]).toBe("application/pdf");
    const text = execFileSync("pdftotext", ["-layout", "-", "-"], { input: await pdf.body() }).toString("utf8");
    expect(text).toContain(reportNumber);
    expect(text).toContain("Result: Passed after repair");
    expect(text).toMatch(/Relief valve opening point\s+1\.7 psid\s+at least 2\.0 psid; not opening fails \[1\]\s+Fail/);
    expect(text).toMatch(/Check #1 differential\s+6\.2 psid\s+at least 5\.0 psid \[2\]\s+Pass/);
    expect(text).toMatch(/Relief valve opening point\s+2\.6 psid\s+at least 2\.0 psid; not opening fails \[1\]\s+Pass/);
    expect(text).toMatch(/Relief valve\s+Diaphragm\s+Replaced/);
    expect(text).toContain("Initial test: Fail");
    expect(text).toContain("Retest after repair: Pass");
    expect(text).toContain("Dana Whitlock-Ray");
    expect(text).toContain("diaphragm torn");
    await context.close();
  });

  test("the form refuses to submit an incomplete test and lists what is missing", async () => {
    const assembly = await pickUntestedRp(1);
    const context = await browser.newContext({ viewport: { width: 390, height: 844 } });
    const page = await signInWithBrowser(context, demoAccounts.tester, DEMO_PASSWORD);
    await page.goto(appUrl(`/tester/reports/new?assembly=${assembly.id}`));
    await page.locator("#initial-check1Differential").fill("abc");
    await expect.poll(() => page.locator("#initial-check1Differential-error").textContent()).toMatch(/Numbers only/);
    await page.getByTestId("submit-report").click();
    await expect.poll(() => page.getByText(/Still to do before submitting/).count()).toBe(1);
    expect(await page.getByText("Enter the line pressure.").count()).toBeGreaterThan(0);
    expect(page.url()).toContain("/tester/reports/new");
    await screenshot(page, "tester-form-incomplete-phone");
    await context.close();
  });

  test("a kit is added with its accuracy record dropped on the credentials page", async () => {
    const context = await browser.newContext({ viewport: { width: 1280, height: 860 } });
    const page = await signInWithBrowser(context, demoAccounts.tester, DEMO_PASSWORD);
    await page.goto(appUrl("/tester/credentials"));
    await page.getByRole("button", { name: "Add a kit" }).click();
    const serial = `BG-${Date.now().toString(36).toUpperCase()}`;
    await page.getByLabel("Make").fill("Brassling Gauge Works");
    await page.getByLabel("Model").fill("BG-12");
    await page.getByLabel("Serial number").fill(serial);
    await page.getByLabel("Accuracy checked on").fill(today());
    await page.getByTestId("kit-new-document-input").setInputFiles({ name: "bench-check.pdf", mimeType: "application/pdf", buffer: Buffer.from("%PDF-1.4\n%%EOF\n", "latin1") });
    await expect.poll(() => page.getByText("bench-check.pdf").count()).toBe(1);
    await page.getByRole("button", { name: "Add the kit" }).click();
    await expect.poll(() => page.getByText("The kit is added.").count()).toBe(1);
    await expect.poll(() => page.getByText(`Serial ${serial}`, { exact: false }).count()).toBe(1);
    await screenshot(page, "tester-credentials-desktop");
    await context.close();
  });
});
