import { Badge } from "@/components/ui/badge";
import { reportStatusLabels, reportStatusTones, type ReportStatusName } from "@/lib/forms/report-status";

export function ReportStatusBadge({ status }: { status: ReportStatusName }) {
  return <Badge tone={reportStatusTones[status]}>{reportStatusLabels[status]}</Badge>;
}

export function OutcomeBadge({ finalOutcome, wasRepaired }: { finalOutcome: "pass" | "fail"; wasRepaired: boolean }) {
  return <Badge tone={finalOutcome === "pass" ? "pass" : "fail"}>{finalOutcome === "pass" ? (wasRepaired ? "✓ Passed after repair" : "✓ Passed") : wasRepaired ? "✗ Failed after repair" : "✗ Failed"}</Badge>;
}
