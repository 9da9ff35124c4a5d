// Words and tones for a report's status, the same on every screen and in the PDF. Pure.
export type ReportStatusName = "awaiting_fee" | "queued" | "accepted" | "returned" | "superseded";

export const reportStatusLabels: Readonly<Record<ReportStatusName, string>> = Object.freeze({
  awaiting_fee: "Filing fee owed",
  queued: "Waiting for review",
  accepted: "Accepted",
  returned: "Returned for correction",
  superseded: "Replaced by a correction",
});

export const reportStatusTones: Readonly<Record<ReportStatusName, "caution" | "brand" | "pass" | "fail" | "muted">> = Object.freeze({
  awaiting_fee: "caution",
  queued: "brand",
  accepted: "pass",
  returned: "fail",
  superseded: "muted",
});

/** The result in words: "Passed", "Failed", "Passed after repair", "Failed after repair". */
export function describeOutcome(report: { initialOutcome: string; finalOutcome: "pass" | "fail"; wasRepaired: boolean }): string {
  if (report.wasRepaired) return report.finalOutcome === "pass" ? "Passed after repair" : "Failed after repair";
  return report.finalOutcome === "pass" ? "Passed" : "Failed";
}
