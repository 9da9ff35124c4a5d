// Repairs (components, parts, rows), the draft's save status and resume rules, the answer to a
// submission, and the credential warnings shown 30 days ahead.
import { describe, expect, test } from "vitest";
import { repairComponents as schemaComponents, repairParts as schemaParts } from "@/db/schema/reports";
import { findCredentialWarnings, describeCertification, describeKit } from "@/lib/forms/credential-warnings";
import { describeSaveStatus, draftHref, findResumableDraft, interpretSubmitResponse, parseStoredDraft, pickFresherDraft, type StoredDraft } from "@/lib/forms/draft-sync";
import { newDraft, parseDraft } from "@/lib/forms/field-test-draft";
import { describeObserved, describeRequired, describeRequirement } from "@/lib/forms/report-display";
import { describeOutcome } from "@/lib/forms/report-status";
import { componentsFor, findRepairProblems, partsByComponent, repairActions, repairCautions, repairComponents, repairDraftsFromRows, repairParts, repairRowsFromDraft } from "@/lib/forms/repairs";

describe("repairs", () => {
  test("the form's lists are the ones the database keeps", () => {
    expect([...repairComponents]).toEqual([...schemaComponents]);
    expect([...repairParts]).toEqual([...schemaParts]);
    expect([...repairActions]).toEqual(["cleaned", "replaced"]);
  });

  test.each([
    { kind: "RP" as const, components: ["check1", "check2", "relief_valve", "shutoff1", "shutoff2", "other"] },
    { kind: "DCDA" as const, components: ["check1", "check2", "shutoff1", "shutoff2", "other"] },
    { kind: "SVB" as const, components: ["air_inlet", "check", "shutoff1", "shutoff2", "other"] },
    { kind: "AG" as const, components: ["other"] },
  ])("$kind is rebuilt component by component", ({ kind, components }) => {
    expect(componentsFor(kind)).toEqual(components);
  });

  test("each component offers its own parts (a relief valve has a diaphragm, a check has none)", () => {
    expect(partsByComponent.relief_valve).toContain("diaphragm");
    expect(partsByComponent.relief_valve).toContain("relief_disc");
    expect(partsByComponent.check1).not.toContain("diaphragm");
    expect(partsByComponent.check1).toEqual(expect.arrayContaining(["disc_rubber", "spring", "seat", "seat_o_ring", "cover_o_ring", "guide", "other"]));
  });

  test("grouped entries → one row per part and back", () => {
    const drafts = [
      { component: "check1" as const, parts: { disc_rubber: "replaced" as const, spring: "cleaned" as const }, note: "grit on the seat" },
      { component: "relief_valve" as const, parts: { diaphragm: "replaced" as const }, note: "" },
    ];
    const rows = repairRowsFromDraft(drafts);
    expect(rows).toEqual([
      { component: "check1", part: "disc_rubber", action: "replaced", note: "grit on the seat" },
      { component: "check1", part: "spring", action: "cleaned", note: "" },
      { component: "relief_valve", part: "diaphragm", action: "replaced", note: "" },
    ]);
    expect(repairDraftsFromRows(rows)).toEqual(drafts);
  });

  test.each([
    { label: "nothing recorded", drafts: [], key: "" },
    { label: "a component with no part marked", drafts: [{ component: "check1" as const, parts: {}, note: "" }], key: "check1" },
    { label: "an 'other' part without a note", drafts: [{ component: "check2" as const, parts: { other: "replaced" as const }, note: " " }], key: "check2" },
    { label: "a component the kind does not have", drafts: [{ component: "air_inlet" as const, parts: { spring: "replaced" as const }, note: "" }], key: "air_inlet" },
  ])("problem: $label", ({ drafts, key }) => {
    expect(findRepairProblems("RP", drafts)[key]).toBeDefined();
  });

  test("the cautions name spring-loaded covers, trapped pressure, the building's water and who governs", () => {
    const text = repairCautions.join(" ");
    expect(text).toMatch(/spring-loaded/);
    expect(text).toMatch(/trapped pressure/);
    expect(text).toMatch(/stops water to the building/);
    expect(text).toMatch(/Local codes, the maker's instructions and licensed practice govern/);
  });
});

const stored = (overrides: Partial<StoredDraft> = {}): StoredDraft => ({
  clientKey: "k".repeat(20),
  clientRevision: 3,
  savedAt: "2026-12-01T10:00:00.000Z",
  serverRevision: null,
  submitKey: "s".repeat(32),
  data: newDraft({ assemblyId: 4, kind: "DC", unit: "psid", testedOn: "2026-12-01", testedTime: "10:00" }),
  ...overrides,
});

describe("drafts on the phone and on the server", () => {
  test("the fresher copy wins; the phone's on a tie", () => {
    const phone = stored({ clientRevision: 5 });
    const server = stored({ clientRevision: 7 });
    expect(pickFresherDraft(phone, server)).toBe(server);
    expect(pickFresherDraft(server, phone)).toBe(server);
    expect(pickFresherDraft(phone, stored({ clientRevision: 5 }))).toBe(phone);
    expect(pickFresherDraft(null, server)).toBe(server);
    expect(pickFresherDraft(phone, null)).toBe(phone);
  });

  test("a new test resumes the latest draft for the same assembly and the same correction", () => {
    const older = stored({ clientKey: "a".repeat(20), savedAt: "2026-12-01T09:00:00.000Z" });
    const newer = stored({ clientKey: "b".repeat(20), savedAt: "2026-12-01T11:00:00.000Z" });
    const correction = stored({ clientKey: "c".repeat(20), data: { ...older.data, correctsReportId: 12 } });
    const elsewhere = stored({ clientKey: "d".repeat(20), data: { ...older.data, assemblyId: 5 } });
    expect(findResumableDraft([older, newer, correction, elsewhere], { assemblyId: 4, correctsReportId: null, amendsReportId: null })).toBe(newer);
    expect(findResumableDraft([older, newer, correction], { assemblyId: 4, correctsReportId: 12, amendsReportId: null })).toBe(correction);
    expect(findResumableDraft([elsewhere], { assemblyId: 4, correctsReportId: null, amendsReportId: null })).toBeNull();
  });

  test("a damaged local copy is ignored", () => {
    expect(parseStoredDraft(JSON.parse(JSON.stringify(stored())), parseDraft)).toEqual(stored());
    expect(parseStoredDraft({ ...stored(), submitKey: undefined }, parseDraft)).toBeNull();
    expect(parseStoredDraft({ ...stored(), data: { v: 9 } }, parseDraft)).toBeNull();
    expect(parseStoredDraft("nope", parseDraft)).toBeNull();
  });

  test.each([
    { server: "saved" as const, isDirty: false, text: /Saved on this phone · saved to the server/, tone: "pass" },
    { server: "saving" as const, isDirty: true, text: /saving to the server/, tone: "caution" },
    { server: "offline" as const, isDirty: true, text: /^Offline · saved on this phone/, tone: "caution" },
    { server: "failed" as const, isDirty: true, text: /did not answer; trying again/, tone: "caution" },
    { server: "signed_out" as const, isDirty: true, text: /sign in again/, tone: "fail" },
  ])("status when the server is $server", ({ server, isDirty, text, tone }) => {
    const status = describeSaveStatus({ hasLocalCopy: true, isLocalStorageAvailable: true, server, isDirty, lastServerSave: null });
    expect(status.text).toMatch(text);
    expect(status.tone).toBe(tone);
  });

  test("where an unfinished test is continued", () => {
    expect(draftHref({ assemblyId: 4, correctsReportId: null, amendsReportId: null })).toBe("/tester/reports/new?assembly=4");
    expect(draftHref({ assemblyId: 4, correctsReportId: 9, amendsReportId: null })).toBe("/tester/reports/new?corrects=9");
    expect(draftHref({ assemblyId: 4, correctsReportId: null, amendsReportId: 3 })).toBe("/tester/reports/new?amends=3");
  });
});

describe("the answer to a submission", () => {
  test.each([
    { label: "filed", status: 201, body: { id: 8, reportNumber: "QV-2026-000001" }, kind: "submitted" },
    { label: "already filed by an earlier try", status: 200, body: { id: 8, reportNumber: "QV-2026-000001", isReplay: true }, kind: "submitted" },
    { label: "refused input", status: 422, body: { error: "Check", fieldErrors: { testedOn: ["x"] } }, kind: "invalid" },
    { label: "a conflict", status: 409, body: { error: "Already corrected" }, kind: "invalid" },
    { label: "signed out", status: 401, body: { error: "Please sign in." }, kind: "signed_out" },
    { label: "the database briefly down", status: 503, body: { error: "The service is briefly unavailable." }, kind: "retry" },
    { label: "a server error", status: 500, body: null, kind: "retry" },
    { label: "no signal at all", status: null, body: null, kind: "retry" },
  ])("$label → $kind", ({ status, body, kind }) => {
    const outcome = interpretSubmitResponse(status, body);
    expect(outcome.kind).toBe(kind);
    if (outcome.kind === "retry") expect(outcome.message).toMatch(/saved on this phone|briefly unavailable/);
  });
});

describe("credential warnings, 30 days ahead", () => {
  const kit = { id: 1, make: "Gaugewright", model: "DG-5", serial: "DG5-1", verificationResult: "passed" as const, retiredAt: null };
  const today = "2026-12-01";

  test.each([
    { label: "expired", expiresOn: "2026-11-30", tone: "danger", message: /expired on 2026-11-30/ },
    { label: "expiring in 30 days", expiresOn: "2026-12-31", tone: "warning", message: /in 30 days/ },
    { label: "expiring tomorrow", expiresOn: "2026-12-02", tone: "warning", message: /tomorrow/ },
  ])("certification $label", ({ expiresOn, tone, message }) => {
    const [warning] = findCredentialWarnings({ certifications: [{ certifyingBody: "Board", number: "BT-1", expiresOn }], kits: [{ ...kit, lastVerifiedOn: "2026-10-01" }], today });
    expect(warning).toMatchObject({ tone, subject: "certification" });
    expect(warning!.message).toMatch(message);
  });

  test("a certification 31 days out and a recent kit need no warning", () => {
    expect(findCredentialWarnings({ certifications: [{ certifyingBody: "Board", number: "BT-1", expiresOn: "2027-01-01" }], kits: [{ ...kit, lastVerifiedOn: "2026-10-01" }], today })).toEqual([]);
  });

  test("the current certification is the one expiring last (a renewal clears the warning)", () => {
    const certifications = [{ certifyingBody: "Board", number: "BT-1", expiresOn: "2026-11-01" }, { certifyingBody: "Board", number: "BT-2", expiresOn: "2029-11-01" }];
    expect(findCredentialWarnings({ certifications, kits: [{ ...kit, lastVerifiedOn: "2026-10-01" }], today })).toEqual([]);
  });

  test("kits: overdue, due within 30 days, failed, none in service — dangers first", () => {
    const warnings = findCredentialWarnings({
      certifications: [{ certifyingBody: "Board", number: "BT-1", expiresOn: "2027-12-31" }],
      kits: [
        { ...kit, id: 1, lastVerifiedOn: "2025-12-20" },
        { ...kit, id: 2, lastVerifiedOn: "2025-11-30" },
        { ...kit, id: 3, lastVerifiedOn: "2026-10-01", verificationResult: "failed" },
      ],
      today,
    });
    expect(warnings.map((w) => [w.tone, w.kitId])).toEqual([
      ["danger", 2],
      ["danger", 3],
      ["warning", 1],
    ]);
    expect(findCredentialWarnings({ certifications: [{ certifyingBody: "B", number: "1", expiresOn: "2027-12-31" }], kits: [], today })[0]!.message).toMatch(/No test kit/);
    expect(findCredentialWarnings({ certifications: [], kits: [{ ...kit, lastVerifiedOn: "2026-10-01" }], today })[0]!.message).toMatch(/No certification/);
  });

  test("badges", () => {
    expect(describeCertification({ expiresOn: "2026-11-01" }, today).tone).toBe("fail");
    expect(describeCertification({ expiresOn: "2026-12-15" }, today).tone).toBe("caution");
    expect(describeKit({ validUntil: "2027-06-01", verificationResult: "passed" }, today)).toEqual({ tone: "pass", text: "Good until 2027-06-01" });
    expect(describeKit({ validUntil: "2027-06-01", verificationResult: "failed" }, today).tone).toBe("fail");
  });
});

describe("how a filed report reads", () => {
  test.each([
    { finding: { rule: "rp.relief.min", observed: 1.8 }, unit: "psid" as const, text: "1.8 psid" },
    { finding: { rule: "rp.relief.min", observed: null }, unit: "psid" as const, text: "Did not open" },
    { finding: { rule: "rp.check2.tight", observed: false }, unit: "psid" as const, text: "No" },
    { finding: { rule: "rp.check1.exceedsRelief", observed: 3.5 }, unit: "kPa" as const, text: "3.5 kPa margin" },
    { finding: { rule: "ag.gap.min", observed: 1.5 }, unit: "psid" as const, text: "1.5 in." },
  ])("$text", ({ finding, unit, text }) => {
    expect(describeObserved(finding, unit)).toBe(text);
  });

  test("minimums read in words on paper", () => {
    expect(describeRequired("≥ 2.0 psid; not opening fails")).toBe("at least 2.0 psid; not opening fails");
    expect(describeRequired("≥ 6.9 kPa (1.0 psid)")).toBe("at least 6.9 kPa (1.0 psid)");
  });

  test("the result in words", () => {
    expect(describeOutcome({ initialOutcome: "fail", finalOutcome: "pass", wasRepaired: true })).toBe("Passed after repair");
    expect(describeOutcome({ initialOutcome: "fail", finalOutcome: "fail", wasRepaired: false })).toBe("Failed");
  });
});

describe("what a finding was held to, in words", () => {
  test.each([
    ["≥ 2.0 psid; not opening fails", "held to ≥ 2.0 psid; not opening fails"],
    ["> 0.0 psid (check #1 greater than the relief valve opening point)", "held to > 0.0 psid (check #1 greater than the relief valve opening point)"],
    ["closed tight", "required: closed tight"],
    ["held tight against backpressure", "required: held tight against backpressure"],
  ])("%s", (required, text) => {
    expect(describeRequirement(required)).toBe(text);
  });
});
