// A field-test draft as the form holds it: what it still lacks, the credentials check made
// before any reading is typed, the repair question after a failure, and the body it submits.
import { describe, expect, test } from "vitest";
import { buildSubmission, checkCredentials, evaluateDraft, inputFromSubmission, isSameName, newDraft, parseDraft, parseLinePressure, readingsForSubmission, type DraftContext, type FieldTestDraft } from "@/lib/forms/field-test-draft";
import { reportSubmissionSchema } from "@/lib/forms/report-submission";
import { addDays, addMonths, defaultRuleSet } from "@/lib/rules";

const TODAY = "2026-12-01";
const context = (overrides: Partial<DraftContext> = {}): DraftContext => ({
  ruleSet: defaultRuleSet,
  today: TODAY,
  kitPolicy: "refuse",
  installedOn: "2020-05-04",
  removedOn: null,
  testerName: "Dana Whitlock-Ray",
  certification: { expiresOn: "2027-11-06", issuedOn: "2024-11-06" },
  kits: [
    { id: 1, lastVerifiedOn: "2026-09-06", verificationResult: "passed" },
    { id: 2, lastVerifiedOn: "2025-11-20", verificationResult: "passed" },
    { id: 3, lastVerifiedOn: "2026-10-01", verificationResult: "failed" },
  ],
  ...overrides,
});

function completeRp(mutate: (draft: FieldTestDraft) => void = () => {}): FieldTestDraft {
  const draft = newDraft({ assemblyId: 7, kind: "RP", unit: "psid", testedOn: TODAY, testedTime: "10:42", kitId: 1, reason: "annual" });
  draft.linePressure = "62";
  draft.orientationApproved = true;
  draft.reliefPortAirGapOk = true;
  draft.initial = { text: { reliefValveOpeningPoint: "2.6", check1Differential: "6.1" }, flags: { check1ClosedTight: true, check2ClosedTight: true, shutoff2Tight: true }, didNotOpen: {} };
  draft.attestationName = "dana  whitlock-ray";
  draft.attestationConfirmed = true;
  mutate(draft);
  return draft;
}

describe("a complete passing RP", () => {
  test("can be submitted; its body passes the server's schema and carries the readings as typed", () => {
    const draft = completeRp();
    const evaluation = evaluateDraft(draft, context());
    expect(evaluation.errors).toEqual({});
    expect(evaluation.canSubmit).toBe(true);
    expect(evaluation.finalOutcome).toBe("pass");
    const body = buildSubmission(draft, context(), { idempotencyKey: "a".repeat(32), draftKey: "b".repeat(32) });
    const parsed = reportSubmissionSchema.safeParse(body);
    expect(parsed.success, JSON.stringify(parsed.error?.issues)).toBe(true);
    expect(body).toMatchObject({ assemblyId: 7, kitId: 1, testedOn: TODAY, testedTime: "10:42", linePressure: 62, unit: "psid", retest: null, repairs: [] });
    expect(body.initial).toEqual({ reliefValveOpeningPoint: 2.6, check1Differential: 6.1, check1ClosedTight: true, check2ClosedTight: true, shutoff2Tight: true });
    expect(body.attestation).toEqual({ name: "dana  whitlock-ray", confirmed: true });
  });
});

describe("what still blocks a submission", () => {
  test.each([
    { label: "a missing reading", mutate: (d: FieldTestDraft) => delete d.initial.text.check1Differential, key: "initial.check1Differential", message: /Enter the reading/ },
    { label: "an unanswered yes/no", mutate: (d: FieldTestDraft) => delete d.initial.flags.shutoff2Tight, key: "initial.shutoff2Tight", message: /Choose one/ },
    { label: "no opening point", mutate: (d: FieldTestDraft) => delete d.initial.text.reliefValveOpeningPoint, key: "initial.reliefValveOpeningPoint", message: /did not open/ },
    { label: "letters in a reading", mutate: (d: FieldTestDraft) => (d.initial.text.check1Differential = "6.1x"), key: "initial.check1Differential", message: /Numbers only/ },
    { label: "a test date in the future", mutate: (d: FieldTestDraft) => (d.testedOn = addDays(TODAY, 1)), key: "testedOn", message: /after today/ },
    { label: "a test date before the installation", mutate: (d: FieldTestDraft) => (d.testedOn = "2019-01-01"), key: "testedOn", message: /before the assembly was installed/ },
    { label: "no test time", mutate: (d: FieldTestDraft) => (d.testedTime = ""), key: "testedTime", message: /time/ },
    { label: "no reason", mutate: (d: FieldTestDraft) => (d.reason = ""), key: "reason", message: /Say why/ },
    { label: "'other' without saying what", mutate: (d: FieldTestDraft) => (d.reason = "other"), key: "reasonNote", message: /Say what/ },
    { label: "a replacement without the old serial", mutate: (d: FieldTestDraft) => (d.installation = "replacement"), key: "previousSerial", message: /replaces/ },
    { label: "no line pressure", mutate: (d: FieldTestDraft) => (d.linePressure = ""), key: "linePressure", message: /line pressure/ },
    { label: "letters for the line pressure", mutate: (d: FieldTestDraft) => (d.linePressure = "sixty"), key: "linePressure", message: /Numbers only/ },
    { label: "no kit", mutate: (d: FieldTestDraft) => (d.kitId = null), key: "kitId", message: /Pick the test kit/ },
    { label: "a kit no longer in the list", mutate: (d: FieldTestDraft) => (d.kitId = 99), key: "kitId", message: /no longer in your list/ },
    { label: "a kit that failed its accuracy check", mutate: (d: FieldTestDraft) => (d.kitId = 3), key: "kitId", message: /failed its last accuracy check/ },
    { label: "another name in the attestation", mutate: (d: FieldTestDraft) => (d.attestationName = "Someone Else"), key: "attestationName", message: /as it is on your account: Dana Whitlock-Ray/ },
    { label: "the attestation not confirmed", mutate: (d: FieldTestDraft) => (d.attestationConfirmed = false), key: "attestationConfirmed", message: /Confirm/ },
  ])("$label", ({ mutate, key, message }) => {
    const evaluation = evaluateDraft(completeRp(mutate), context());
    expect(evaluation.canSubmit).toBe(false);
    expect(evaluation.errors[key]).toMatch(message);
  });

  test("an air gap asks for no line pressure and no relief-port answer", () => {
    const draft = newDraft({ assemblyId: 9, kind: "AG", unit: "kPa", testedOn: TODAY, testedTime: "08:00", kitId: 1, reason: "annual" });
    draft.initial = { text: { supplyPipeDiameterInches: "1", airGapInches: "2.5" }, flags: { nearSideWall: false }, didNotOpen: {} };
    draft.attestationName = "Dana Whitlock-Ray";
    draft.attestationConfirmed = true;
    expect(draft.unit).toBe("psid");
    expect(evaluateDraft(draft, context()).errors).toEqual({});
  });
});

describe("the certification and kit, judged on the test date before any reading is typed", () => {
  test("an expired certification blocks the report (an expired certificate may not test: Utah R309-305-8)", () => {
    const status = checkCredentials({ testedOn: TODAY, today: TODAY, kitId: 1, context: context({ certification: { expiresOn: addDays(TODAY, -1), issuedOn: null } }) });
    expect(status.blocking).toEqual([expect.objectContaining({ field: "certification", message: expect.stringMatching(/expired/) })]);
    const onExpiryDay = checkCredentials({ testedOn: TODAY, today: TODAY, kitId: 1, context: context({ certification: { expiresOn: TODAY, issuedOn: null } }) });
    expect(onExpiryDay.blocking).toEqual([]);
  });

  test("worked case 10: kit verified 2023-03-01, test on 2024-03-15 → refused, or flagged under a 'flag' policy", () => {
    // Kit verified within 12 months: Texas city policy citing state practice [S]; Oregon OAR 333-061-0070(6) [P].
    const kits = [{ id: 5, lastVerifiedOn: "2023-03-01", verificationResult: "passed" as const }];
    const refused = checkCredentials({ testedOn: "2024-03-15", today: "2024-03-20", kitId: 5, context: context({ kits, certification: { expiresOn: "2026-01-01", issuedOn: null } }) });
    expect(refused.blocking.map((b) => b.field)).toEqual(["kitId"]);
    const flagged = checkCredentials({ testedOn: "2024-03-15", today: "2024-03-20", kitId: 5, context: context({ kits, kitPolicy: "flag", certification: { expiresOn: "2026-01-01", issuedOn: null } }) });
    expect(flagged.blocking).toEqual([]);
    expect(flagged.warnings.map((w) => w.field)).toEqual(["kitId"]);
    // The same day 12 calendar months later is still covered.
    expect(checkCredentials({ testedOn: "2024-03-01", today: "2024-03-20", kitId: 5, context: context({ kits, certification: { expiresOn: "2026-01-01", issuedOn: null } }) }).blocking).toEqual([]);
  });

  test("the form shows until when the kit's check covers tests", () => {
    expect(checkCredentials({ testedOn: TODAY, today: TODAY, kitId: 1, context: context() }).kitValidUntil).toBe(addMonths("2026-09-06", 12));
  });

  test("the blocking message reaches the draft's errors", () => {
    const evaluation = evaluateDraft(completeRp((d) => (d.kitId = 2)), context({ today: "2026-12-01" }));
    expect(evaluation.errors.kitId).toMatch(/more than 12 months/);
  });
});

describe("after a failed initial test", () => {
  const failing = () => completeRp((d) => (d.initial.text.reliefValveOpeningPoint = "1.6"));

  test("the repair question is asked and must be answered", () => {
    const evaluation = evaluateDraft(failing(), context());
    expect(evaluation.needsRepairChoice).toBe(true);
    expect(evaluation.isRetestShown).toBe(false);
    expect(evaluation.errors.repairChoice).toMatch(/repaired on the spot/);
  });

  test("not repaired on the spot: filed as failed, with no retest", () => {
    const draft = failing();
    draft.repairChoice = "not_repaired";
    const evaluation = evaluateDraft(draft, context());
    expect(evaluation.canSubmit).toBe(true);
    expect(evaluation.finalOutcome).toBe("fail");
    const body = buildSubmission(draft, context(), { idempotencyKey: "c".repeat(32) });
    expect(body.retest).toBeNull();
    expect(body.repairs).toEqual([]);
  });

  test("repaired: parts and a complete retest are needed; the report then passes after repair", () => {
    const draft = failing();
    draft.repairChoice = "repaired";
    let evaluation = evaluateDraft(draft, context());
    expect(evaluation.isRetestShown).toBe(true);
    expect(evaluation.errors.repairs).toMatch(/at least one part/);
    expect(evaluation.errors["retest.reliefValveOpeningPoint"]).toBeDefined();
    draft.repairs = [{ component: "relief_valve", parts: { diaphragm: "replaced", relief_disc: "cleaned" }, note: "debris on the disc" }];
    draft.retest = { text: { reliefValveOpeningPoint: "2.6", check1Differential: "6.0" }, flags: { check1ClosedTight: true, check2ClosedTight: true, shutoff2Tight: true }, didNotOpen: {} };
    evaluation = evaluateDraft(draft, context());
    expect(evaluation.errors).toEqual({});
    expect(evaluation.finalOutcome).toBe("pass");
    const body = buildSubmission(draft, context(), { idempotencyKey: "d".repeat(32) });
    expect(body.repairs).toEqual([
      { component: "relief_valve", part: "diaphragm", action: "replaced", note: "debris on the disc" },
      { component: "relief_valve", part: "relief_disc", action: "cleaned", note: "" },
    ]);
    expect(reportSubmissionSchema.safeParse(body).success).toBe(true);
  });

  test("a retest that fails again files a failed report", () => {
    const draft = failing();
    draft.repairChoice = "repaired";
    draft.repairs = [{ component: "relief_valve", parts: { spring: "replaced" }, note: "" }];
    draft.retest = { text: { reliefValveOpeningPoint: "1.9", check1Differential: "6.0" }, flags: { check1ClosedTight: true, check2ClosedTight: true, shutoff2Tight: true }, didNotOpen: {} };
    expect(evaluateDraft(draft, context()).finalOutcome).toBe("fail");
  });
});

describe("pieces", () => {
  test("names match whatever the case and spacing", () => {
    expect(isSameName("  DANA   Whitlock-Ray ", "Dana Whitlock-Ray")).toBe(true);
    expect(isSameName("Dana", "Dana Whitlock-Ray")).toBe(false);
    expect(isSameName("", "")).toBe(false);
  });

  test("line pressure in kPa is kept in psi for the record", () => {
    expect(parseLinePressure("410", "kPa")).toEqual({ state: "ok", value: 410, psi: 59.5 });
    expect(parseLinePressure("0", "psid").state).toBe("error");
    expect(parseLinePressure("400", "psid").state).toBe("error");
  });

  test("'did not open' travels as a word and comes back as null", () => {
    const input = { kind: "PVB" as const, unit: "psid" as const, airInletOpeningPoint: null, checkDifferential: 1.4, checkClosedTight: true };
    const sent = readingsForSubmission(input);
    expect(sent).toEqual({ airInletOpeningPoint: "did_not_open", checkDifferential: 1.4, checkClosedTight: true });
    expect(inputFromSubmission("PVB", "psid", sent)).toEqual(input);
  });

  test("a stored draft is read back, anything else is not", () => {
    const draft = completeRp();
    expect(parseDraft(JSON.parse(JSON.stringify(draft)))).toEqual(draft);
    expect(parseDraft({ ...draft, v: 2 })).toBeNull();
    expect(parseDraft({ ...draft, kind: "XX" })).toBeNull();
    expect(parseDraft("not a draft")).toBeNull();
  });
});
