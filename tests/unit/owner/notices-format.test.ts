// The plain-words helpers of the owner's pages, notices and certificates, and the retry
// back-off of the notice batch.
import { describe, expect, test } from "vitest";
import { formatCertificateCode, formatLongDate, formatOwnerCode, normalizeReadableCode, serialTail } from "@/lib/data/notices-format";
import { MAX_NOTICE_ATTEMPTS, retryDelayMinutes } from "@/lib/data/notices-run";

describe("dates as owners read them", () => {
  test.each([
    ["2026-03-03", "3 March 2026"],
    ["2026-12-31", "31 December 2026"],
    ["2024-02-29", "29 February 2024"],
    ["2027-01-01", "1 January 2027"],
  ])("%s → %s (from the digits: no time zone can move it)", (iso, words) => {
    expect(formatLongDate(iso)).toBe(words);
  });

  test.each(["2026-13-01", "03/03/2026", "", "2026-3-3"])("%j is refused loudly", (bad) => {
    expect(() => formatLongDate(bad)).toThrow(/Not a calendar date/);
  });
});

describe("codes typed from paper", () => {
  test.each([
    { label: "as printed", input: "ABCD-EFGH-JKMN", length: 12, expected: "ABCDEFGHJKMN" },
    { label: "lower case with spaces", input: " abcd efgh jkmn ", length: 12, expected: "ABCDEFGHJKMN" },
    { label: "a letter code", input: "k7mqz-3xpa9", length: 10, expected: "K7MQZ3XPA9" },
    { label: "too short", input: "ABCD-EFGH", length: 12, expected: null },
    { label: "look-alikes never issued (O, 0, I, 1, L)", input: "ABCD-EFGH-JKM0", length: 12, expected: null },
    { label: "markup", input: "<script>", length: 8, expected: null },
    { label: "not a string", input: 42, length: 12, expected: null },
    { label: "very long", input: "A".repeat(500), length: 12, expected: null },
  ])("$label", ({ input, length, expected }) => {
    expect(normalizeReadableCode(input, length)).toBe(expected);
  });

  test("printed in groups", () => {
    expect(formatCertificateCode("ABCDEFGHJKMN")).toBe("ABCD-EFGH-JKMN");
    expect(formatOwnerCode("K7MQZ3XPA9")).toBe("K7MQZ-3XPA9");
  });

  test("the public page shows only the end of a serial", () => {
    expect(serialTail("TA123456")).toBe("…3456");
    expect(serialTail("AB1")).toBe("AB1");
    expect(serialTail("  ")).toBe("no serial recorded");
  });
});

describe("retry back-off of a refused batch [M: common practice for a mail service]", () => {
  test.each([
    [1, 15],
    [2, 60],
    [3, 240],
    [4, 720],
    [5, 1440],
    [7, 1440],
  ])("after attempt %i, wait %i minutes", (attempts, minutes) => {
    expect(retryDelayMinutes(attempts)).toBe(minutes);
  });

  test("the delays never shrink, and the attempts are bounded", () => {
    for (let n = 1; n < MAX_NOTICE_ATTEMPTS; n++) expect(retryDelayMinutes(n + 1)).toBeGreaterThanOrEqual(retryDelayMinutes(n));
    expect(MAX_NOTICE_ATTEMPTS).toBeGreaterThan(3);
  });
});
