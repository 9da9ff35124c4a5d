// The field-test form's readings: typed text → readings, the fields each kind records, and the
// live grade beside each field (lib/rules, the same module the server grades with).
import { describe, expect, test } from "vitest";
import { emptyPhase, gaugeRangeIn, gradePhase, minimumsFor, parseReadingText, phaseFromInput, phaseToInput, readingFieldsFor, type PhaseDraft } from "@/lib/forms/readings";
import { bufferRuleSet, check2FlowRuleSet, defaultRuleSet, type FieldTestField } from "@/lib/rules";

const phase = (text: Partial<Record<FieldTestField, string>>, flags: Partial<Record<FieldTestField, boolean>> = {}, didNotOpen: Partial<Record<FieldTestField, boolean>> = {}): PhaseDraft => ({ text, flags, didNotOpen });
const tight = { check1ClosedTight: true, check2ClosedTight: true, shutoff2Tight: true };

describe("typed text → a reading", () => {
  test.each([
    { label: "empty", text: "", expected: { state: "empty" } },
    { label: "spaces only", text: "   ", expected: { state: "empty" } },
    { label: "one decimal", text: "2.4", expected: { state: "ok", value: 2.4 } },
    { label: "a decimal comma (some phone keypads)", text: "2,4", expected: { state: "ok", value: 2.4 } },
    { label: "a whole number", text: "5", expected: { state: "ok", value: 5 } },
    { label: "a trailing point while typing", text: "5.", expected: { state: "ok", value: 5 } },
    { label: "a leading point", text: ".8", expected: { state: "ok", value: 0.8 } },
    { label: "zero", text: "0.0", expected: { state: "ok", value: 0 } },
    { label: "the top of the 0–15 psid range (trade article [S])", text: "15.0", expected: { state: "ok", value: 15 } },
  ])("accepted: $label", ({ text, expected }) => {
    expect(parseReadingText(text, "differential", "psid", defaultRuleSet)).toEqual(expected);
  });

  test.each([
    { label: "two decimals", text: "2.45", message: /One decimal place/ },
    { label: "letters", text: "2.4a", message: /Numbers only/ },
    { label: "a word", text: "ok", message: /Numbers only/ },
    { label: "a negative reading", text: "-1.0", message: /cannot be negative/ },
    { label: "two points", text: "2.4.1", message: /Enter a number/ },
    { label: "above the 15 psid range", text: "15.1", message: /Above the gauge's range of 15\.0 psid/ },
  ])("refused: $label", ({ text, message }) => {
    const parsed = parseReadingText(text, "differential", "psid", defaultRuleSet);
    expect(parsed.state).toBe("error");
    expect(parsed.state === "error" ? parsed.message : "").toMatch(message);
  });

  test("kPa readings are range-checked after the exact conversion (NIST SP 811, App. B.8)", () => {
    // 15 psid = 103.42 kPa: 103.4 fits, 103.5 does not.
    expect(gaugeRangeIn("kPa", defaultRuleSet)).toBe(103.4);
    expect(parseReadingText("103.4", "differential", "kPa", defaultRuleSet)).toEqual({ state: "ok", value: 103.4 });
    expect(parseReadingText("103.5", "differential", "kPa", defaultRuleSet).state).toBe("error");
  });

  test("inches take two decimals and a sane upper bound", () => {
    expect(parseReadingText("1.25", "inches", "psid", defaultRuleSet)).toEqual({ state: "ok", value: 1.25 });
    expect(parseReadingText("1.255", "inches", "psid", defaultRuleSet).state).toBe("error");
    expect(parseReadingText("1001", "inches", "psid", defaultRuleSet).state).toBe("error");
  });
});

describe("the fields each kind records", () => {
  test.each([
    { kind: "RP" as const, fields: ["reliefValveOpeningPoint", "check1Differential", "check1ClosedTight", "check2ClosedTight", "check2Differential", "shutoff2Tight"] },
    { kind: "RPDA" as const, fields: ["reliefValveOpeningPoint", "check1Differential", "check1ClosedTight", "check2ClosedTight", "check2Differential", "shutoff2Tight"] },
    { kind: "DC" as const, fields: ["check1Differential", "check1ClosedTight", "check2Differential", "check2ClosedTight", "shutoff2Tight"] },
    { kind: "PVB" as const, fields: ["airInletOpeningPoint", "airInletFullyOpen", "checkDifferential", "checkClosedTight"] },
    { kind: "SVB" as const, fields: ["airInletOpeningPoint", "airInletFullyOpen", "checkDifferential", "checkClosedTight"] },
    { kind: "AG" as const, fields: ["supplyPipeDiameterInches", "airGapInches", "nearSideWall"] },
  ])("$kind", ({ kind, fields }) => {
    expect(readingFieldsFor(kind, defaultRuleSet).map((f) => f.field)).toEqual(fields);
  });

  test("an RP's check #2 differential is optional unless the rule set grades it", () => {
    expect(readingFieldsFor("RP", defaultRuleSet).find((f) => f.field === "check2Differential")?.isRequired).toBe(false);
    expect(readingFieldsFor("RP", check2FlowRuleSet).find((f) => f.field === "check2Differential")?.isRequired).toBe(true);
  });

  test("only opening points can be recorded as 'did not open'", () => {
    const openable = readingFieldsFor("RP", defaultRuleSet).filter((f) => f.canFailToOpen).map((f) => f.field);
    expect(openable).toEqual(["reliefValveOpeningPoint"]);
    expect(readingFieldsFor("PVB", defaultRuleSet).filter((f) => f.canFailToOpen).map((f) => f.field)).toEqual(["airInletOpeningPoint"]);
  });
});

describe("live grading, field by field (the published worked cases)", () => {
  test("case 1: RP relief 2.5, check #1 6.0, check #2 tight → pass", () => {
    // EPA Cross-Connection Control Manual (EPA 816-R-03-002, 2003), Fig. 39–40.
    const graded = gradePhase("RP", "psid", phase({ reliefValveOpeningPoint: "2.5", check1Differential: "6.0" }, tight), defaultRuleSet);
    expect(graded.outcome).toBe("pass");
    expect(graded.missing).toEqual([]);
  });

  test("case 2: RP relief 1.8 → fail beside the relief valve field, with its minimum and source", () => {
    // EPA 816-R-03-002 (2003), ch. 5, Fig. 39: relief opening point ≥ 2.0 psid.
    const graded = gradePhase("RP", "psid", phase({ reliefValveOpeningPoint: "1.8", check1Differential: "6.5" }, tight), defaultRuleSet);
    expect(graded.outcome).toBe("fail");
    const [finding] = graded.findingsByField.reliefValveOpeningPoint!;
    expect(finding).toMatchObject({ rule: "rp.relief.min", passed: false, observed: 1.8 });
    expect(finding!.required).toMatch(/≥ 2\.0 psid/);
    expect(finding!.source).toMatch(/EPA 816-R-03-002/);
  });

  test("case 3: relief at exactly 2.0 passes; check #1 4.9 fails", () => {
    // EPA 816-R-03-002 (2003), Fig. 39, step 1: check #1 ≥ 5.0 psid; "at least" is inclusive.
    const graded = gradePhase("RP", "psid", phase({ reliefValveOpeningPoint: "2.0", check1Differential: "4.9" }, tight), defaultRuleSet);
    expect(graded.findingsByField.reliefValveOpeningPoint?.[0]?.passed).toBe(true);
    expect(graded.findingsByField.check1Differential?.find((f) => f.rule === "rp.check1.min")?.passed).toBe(false);
  });

  test("case 4: check #2 leaked → fail beside that field", () => {
    // EPA 816-R-03-002 (2003), Fig. 40: check #2 tight against backpressure.
    const graded = gradePhase("RP", "psid", phase({ reliefValveOpeningPoint: "2.4", check1Differential: "6.0" }, { ...tight, check2ClosedTight: false }), defaultRuleSet);
    expect(graded.outcome).toBe("fail");
    expect(graded.findingsByField.check2ClosedTight?.[0]).toMatchObject({ rule: "rp.check2.tight", passed: false });
  });

  test("cases 5–6: DC each check ≥ 1.0 psid, inclusive", () => {
    // EPA 816-R-03-002 (2003), Fig. 41; New England Water Works Assn. field test procedures (2010).
    expect(gradePhase("DC", "psid", phase({ check1Differential: "1.4", check2Differential: "0.8" }, { check1ClosedTight: true, shutoff2Tight: true }), defaultRuleSet).outcome).toBe("fail");
    expect(gradePhase("DC", "psid", phase({ check1Differential: "1.0", check2Differential: "2.3" }, { check1ClosedTight: true, shutoff2Tight: true }), defaultRuleSet).outcome).toBe("pass");
  });

  test("cases 7–9: PVB and SVB air inlet ≥ 1.0 psid and opened fully", () => {
    // City PVB/SVB test form; public SVB one-hose procedure [S].
    expect(gradePhase("PVB", "psid", phase({ airInletOpeningPoint: "1.2", checkDifferential: "1.5" }, { airInletFullyOpen: true, checkClosedTight: true }), defaultRuleSet).outcome).toBe("pass");
    expect(gradePhase("PVB", "psid", phase({ airInletOpeningPoint: "0.7", checkDifferential: "2.0" }, { airInletFullyOpen: true, checkClosedTight: true }), defaultRuleSet).outcome).toBe("fail");
    expect(gradePhase("SVB", "psid", phase({ airInletOpeningPoint: "1.3", checkDifferential: "1.1" }, { airInletFullyOpen: false, checkClosedTight: true }), defaultRuleSet).outcome).toBe("fail");
  });

  test("a relief valve that did not open fails at once, whatever else is still to come", () => {
    const graded = gradePhase("RP", "psid", phase({}, {}, { reliefValveOpeningPoint: true }), defaultRuleSet);
    expect(graded.outcome).toBe("fail");
    expect(graded.findingsByField.reliefValveOpeningPoint?.[0]).toMatchObject({ passed: false, observed: null });
  });

  test("an unfinished phase is incomplete and says which readings are still to come, in form order", () => {
    const graded = gradePhase("RP", "psid", phase({ reliefValveOpeningPoint: "2.5" }), defaultRuleSet);
    expect(graded.outcome).toBe("incomplete");
    expect(graded.missing).toEqual(["check1Differential", "check1ClosedTight", "check2ClosedTight", "shutoff2Tight"]);
  });

  test("a mistyped reading is reported beside its field; the others are still graded", () => {
    const graded = gradePhase("RP", "psid", phase({ reliefValveOpeningPoint: "2.5", check1Differential: "6..0" }, tight), defaultRuleSet);
    expect(graded.errors.check1Differential).toMatch(/Enter a number/);
    expect(graded.findingsByField.reliefValveOpeningPoint?.[0]?.passed).toBe(true);
    expect(graded.outcome).toBe("incomplete");
    expect(graded.missing).toContain("check1Differential");
  });

  test("kPa readings are graded after the exact conversion: 13.8 kPa meets 2.0 psid, 13.7 does not", () => {
    // 2.0 psid = 13.7895 kPa (NIST SP 811, 2008, App. B.8–B.9).
    expect(gradePhase("RP", "kPa", phase({ reliefValveOpeningPoint: "13.8", check1Differential: "41.4" }, tight), defaultRuleSet).outcome).toBe("pass");
    expect(gradePhase("RP", "kPa", phase({ reliefValveOpeningPoint: "13.7", check1Differential: "41.4" }, tight), defaultRuleSet).outcome).toBe("fail");
  });

  test("the optional 3.0 psid buffer rule shows beside check #1 when the rule set has it on", () => {
    // USC Manual 9th ed. criteria via a public summary [S]; off in the published-current edition.
    const graded = gradePhase("RP", "psid", phase({ reliefValveOpeningPoint: "3.0", check1Differential: "5.5" }, tight), bufferRuleSet);
    expect(graded.findingsByField.check1Differential?.map((f) => f.rule)).toEqual(["rp.check1.min", "rp.check1.exceedsRelief", "rp.buffer.min"]);
    expect(graded.outcome).toBe("fail");
  });

  test("an air gap is held to twice the pipe diameter, never under 1 in. (WAC 246-290-010)", () => {
    expect(gradePhase("AG", "psid", phase({ supplyPipeDiameterInches: "0.75", airGapInches: "1.5" }, { nearSideWall: false }), defaultRuleSet).outcome).toBe("pass");
    expect(gradePhase("AG", "psid", phase({ supplyPipeDiameterInches: "0.75", airGapInches: "1.4" }, { nearSideWall: false }), defaultRuleSet).outcome).toBe("fail");
    expect(gradePhase("AG", "psid", phase({ supplyPipeDiameterInches: "0", airGapInches: "1.4" }, { nearSideWall: false }), defaultRuleSet).errors.supplyPipeDiameterInches).toMatch(/more than 0/);
  });
});

describe("minimums shown before anything is typed", () => {
  test("every graded RP field shows its minimum and source from lib/rules", () => {
    const minimums = minimumsFor("RP", "psid", defaultRuleSet);
    expect(minimums.reliefValveOpeningPoint?.[0]).toMatchObject({ rule: "rp.relief.min", required: expect.stringMatching(/≥ 2\.0 psid/), source: expect.stringMatching(/Fig\. 39/) });
    expect(minimums.check1Differential?.map((m) => m.rule)).toEqual(["rp.check1.min", "rp.check1.exceedsRelief"]);
    expect(minimums.check2Differential).toBeUndefined();
  });

  test("in kPa the minimum is shown in kPa with the psid value beside it", () => {
    expect(minimumsFor("DC", "kPa", defaultRuleSet).check1Differential?.[0]?.required).toBe("≥ 6.9 kPa (1.0 psid)");
  });

  test("an air gap's minimum follows the pipe diameter and the side wall", () => {
    expect(minimumsFor("AG", "psid", defaultRuleSet, { pipeDiameterInches: 1, isNearSideWall: true }).airGapInches?.[0]?.required).toMatch(/≥ 3\.0 in\./);
  });
});

describe("a filed phase back into the form (to correct a returned report)", () => {
  test("round trip: readings, yes/no answers and 'did not open'", () => {
    const input = { kind: "RP" as const, unit: "psid" as const, reliefValveOpeningPoint: null, check1Differential: 6, check1ClosedTight: true, check2ClosedTight: false, shutoff2Tight: true };
    const back = phaseFromInput(input);
    expect(back.text.check1Differential).toBe("6.0");
    expect(back.didNotOpen.reliefValveOpeningPoint).toBe(true);
    expect(phaseToInput("RP", "psid", back, defaultRuleSet)).toEqual({ input, errors: {} });
    expect(phaseFromInput(null)).toEqual(emptyPhase());
  });
});
