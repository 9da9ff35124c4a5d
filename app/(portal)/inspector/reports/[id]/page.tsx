import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { AssemblyHistoryView } from "@/components/inspector/assembly-history";
import { DecisionPanel } from "@/components/inspector/decision-panel";
import { formatDay, formatInstant, stateLabel, stateTone } from "@/components/inspector/format";
import { ReportStatusBadge, ReportView } from "@/components/inspector/report-view";
import { Alert } from "@/components/ui/alert";
import { Badge } from "@/components/ui/badge";
import { Card, PageHeader } from "@/components/ui/card";
import { requirePermission } from "@/lib/auth/guards";
import { NotFoundError } from "@/lib/errors";
import { getAssemblyForStaff } from "@/lib/data/inventory-assemblies";
import { getReportDetail } from "@/lib/data/report-detail";
import { findNextQueuedReport } from "@/lib/data/review-queue";
import { getStaffProgramContext, listReturnReasons } from "@/lib/data/settings";

export const metadata: Metadata = { title: "Review a report" };

async function loadOrNotFound<T>(work: Promise<T>): Promise<T> {
  try {
    return await work;
  } catch (error) {
    if (error instanceof NotFoundError) notFound();
    throw error;
  }
}

export default async function ReviewReportPage({ params }: { params: Promise<{ id: string }> }) {
  const actor = await requirePermission("reports.review");
  const id = Number((await params).id);
  if (!Number.isInteger(id) || id <= 0) notFound();
  const report = await loadOrNotFound(getReportDetail(actor, id));
  if (report.programId !== actor.programId) notFound();
  const [assembly, reasons, nextId, context] = await Promise.all([getAssemblyForStaff(actor, report.assemblyId), listReturnReasons(actor), findNextQueuedReport(actor, report.id), getStaffProgramContext(actor)]);
  const findings = report.signals.length + report.validity.length;
  return (
    <>
      <p className="mb-2 text-sm">
        <a href="/inspector/reports">← Review queue</a>
      </p>
      <PageHeader
        title={
          <span className="flex flex-wrap items-center gap-3">
            Report {report.reportNumber}
            {report.revision > 1 ? <span className="text-lg font-semibold text-ink-600">revision {report.revision}</span> : null}
            <ReportStatusBadge status={report.status} />
          </span>
        }
        description={`${report.assembly.kind} at ${report.assembly.siteName}, ${report.assembly.address} · tested ${formatDay(report.testedOn)} by ${report.tester.name} · filed ${formatInstant(report.submittedAt, context.timezone)}`}
        actions={
          <a href={`/api/reports/${report.id}/pdf`} className="rounded-md border border-ink-200 bg-white px-3 py-1.5 text-sm font-semibold no-underline hover:bg-ink-50">
            Report PDF
          </a>
        }
      />
      <div className="grid gap-6 lg:grid-cols-[minmax(0,1fr)_28rem]">
        <ReportView report={report} timezone={context.timezone} />
        <div className="space-y-4">
          <Card title="Decision">
            {report.status === "queued" ? (
              <DecisionPanel reportId={report.id} reportNumber={report.reportNumber} reasons={reasons.map((r) => ({ id: r.id, label: r.label, guidance: r.guidance }))} findingsCount={findings} isPass={report.finalOutcome === "pass"} nextReportId={nextId} />
            ) : report.decision ? (
              <div className="space-y-2 text-sm">
                <p>
                  <Badge tone={report.decision.decision === "accepted" ? "pass" : "fail"}>{report.decision.decision === "accepted" ? "Accepted" : "Returned"}</Badge>{" "}
                  Report {report.reportNumber} {report.decision.decision === "accepted" ? "accepted" : "returned to the tester"} by <strong>{report.decision.inspectorName}</strong> on {formatInstant(report.decision.decidedAt, context.timezone)}.
                </p>
                {report.decision.reasons.length ? (
                  <ul className="list-inside list-disc">
                    {report.decision.reasons.map((r) => (
                      <li key={r}>{r}</li>
                    ))}
                  </ul>
                ) : null}
                {report.decision.note ? <p>Note to the tester: {report.decision.note}</p> : null}
                {report.certificate ? <p>Compliance certificate {report.certificate.code} issued.</p> : null}
                {nextId ? <a href={`/inspector/reports/${nextId}`}>Next waiting report →</a> : null}
              </div>
            ) : (
              <p className="text-sm text-ink-600">{report.status === "awaiting_fee" ? "This report can be decided once its filing fee is paid." : "This revision was replaced by a corrected one."}</p>
            )}
          </Card>
          <Card title="The assembly now" actions={<a href={`/inspector/assemblies/${assembly.id}`}>Open the assembly</a>}>
            {assembly.status === "awaiting_confirmation" ? (
              <div className="mb-3">
                <Alert tone="info" title="Registered from the field">
                  {assembly.registeredBy ?? "The tester"} added this assembly. <a href={`/inspector/assemblies/${assembly.id}`}>Confirm it or merge it</a> into one already on file.
                </Alert>
              </div>
            ) : null}
            <dl className="grid grid-cols-2 gap-3 text-sm">
              <div>
                <dt className="text-xs font-semibold uppercase text-ink-600">Compliance today</dt>
                <dd>
                  <Badge tone={stateTone[assembly.state]}>{stateLabel[assembly.state]}</Badge>
                </dd>
              </div>
              <div>
                <dt className="text-xs font-semibold uppercase text-ink-600">Next test due</dt>
                <dd>{formatDay(assembly.nextDueOn) || "—"}</dd>
              </div>
              <div>
                <dt className="text-xs font-semibold uppercase text-ink-600">Installed</dt>
                <dd>{formatDay(assembly.installedOn) || "unknown"}</dd>
              </div>
              <div>
                <dt className="text-xs font-semibold uppercase text-ink-600">Hazard</dt>
                <dd>{assembly.hazard}</dd>
              </div>
            </dl>
            {assembly.warnings.length ? (
              <ul className="mt-3 space-y-1 text-sm text-caution-700">
                {assembly.warnings.map((w) => (
                  <li key={w}>⚠ {w}</li>
                ))}
              </ul>
            ) : null}
          </Card>
          <Card title="History of this assembly">
            <AssemblyHistoryView history={assembly.history} currentReportId={report.id} isNarrow />
          </Card>
        </div>
      </div>
    </>
  );
}
