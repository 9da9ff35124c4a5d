// The submission's shape, checked the same way in the browser and on the server.
import { describe, expect, test } from "vitest";
import { reportSubmissionSchema } from "@/lib/forms/report-submission";

const valid = {
  idempotencyKey: "0123456789abcdef0123456789abcdef",
  assemblyId: 12,
  kitId: 3,
  testedOn: "2026-11-30",
  testedTime: "14:05",
  reason: "annual",
  unit: "psid",
  linePressure: 64,
  initial: { reliefValveOpeningPoint: 2.5, check1Differential: 6.0, check1ClosedTight: true, check2ClosedTight: true, shutoff2Tight: true },
  attestation: { name: "Dana Whitlock-Ray", confirmed: true },
};

const issuesOf = (value: unknown) => {
  const result = reportSubmissionSchema.safeParse(value);
  return result.success ? [] : result.error.issues.map((i) => [i.path.join("."), i.message]);
};

describe("the submission schema", () => {
  test("a complete body parses, with defaults filled in", () => {
    const parsed = reportSubmissionSchema.parse(valid);
    expect(parsed).toMatchObject({ repairs: [], retest: null, remarks: "", installation: "existing", correctsReportId: null, amendsReportId: null });
  });

  test.each([
    { label: "letters in a reading", patch: { initial: { ...valid.initial, check1Differential: "six" } }, path: "initial.check1Differential" },
    { label: "two decimals", patch: { initial: { ...valid.initial, check1Differential: 6.05 } }, path: "initial.check1Differential" },
    { label: "a negative reading", patch: { initial: { ...valid.initial, check1Differential: -1 } }, path: "initial.check1Differential" },
    { label: "'did not open' for a check", patch: { initial: { ...valid.initial, check1Differential: "did_not_open" } }, path: "initial.check1Differential" },
    { label: "an unknown reading", patch: { initial: { ...valid.initial, colour: "red" } }, path: "initial" },
    { label: "an impossible date", patch: { testedOn: "2026-02-30" }, path: "testedOn" },
    { label: "a time of 25:00", patch: { testedTime: "25:00" }, path: "testedTime" },
    { label: "no kit", patch: { kitId: null }, path: "kitId" },
    { label: "an unconfirmed attestation", patch: { attestation: { name: "Dana", confirmed: false } }, path: "attestation.confirmed" },
    { label: "an empty signature", patch: { attestation: { name: "  ", confirmed: true } }, path: "attestation.name" },
    { label: "'other' with no note", patch: { reason: "other" }, path: "reasonNote" },
    { label: "a replacement with no previous serial", patch: { installation: "replacement" }, path: "previousSerial" },
    { label: "a retest with no repair", patch: { retest: valid.initial }, path: "repairs" },
    { label: "a repair with no retest", patch: { repairs: [{ component: "check1", part: "spring", action: "replaced" }] }, path: "retest" },
    { label: "an unknown part", patch: { repairs: [{ component: "check1", part: "gasket", action: "replaced" }], retest: valid.initial }, path: "repairs.0.part" },
    { label: "both a correction and an amendment", patch: { correctsReportId: 1, amendsReportId: 2 }, path: "amendsReportId" },
    { label: "a short key", patch: { idempotencyKey: "abc" }, path: "idempotencyKey" },
  ])("refused: $label", ({ patch, path }) => {
    const issues = issuesOf({ ...valid, ...patch });
    expect(issues.map(([p]) => p)).toContain(path);
    for (const [, message] of issues) expect(message).not.toMatch(/^Invalid|expected/);
  });

  test("an opening point may be 'did_not_open'", () => {
    expect(issuesOf({ ...valid, initial: { ...valid.initial, reliefValveOpeningPoint: "did_not_open" } })).toEqual([]);
  });
});
