import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { OutcomeBadge, ReportStatusBadge } from "@/components/tester/report-status-badge";
import { ReportPhaseTable } from "@/components/tester/report-phase-table";
import { Alert } from "@/components/ui/alert";
import { ButtonLink } from "@/components/ui/button";
import { Card, PageHeader } from "@/components/ui/card";
import { requirePermission } from "@/lib/auth/guards";
import { getReportDetail, type ReportDetail } from "@/lib/data/report-detail";
import { getMyReportHistory } from "@/lib/data/tester-reports";
import { NotFoundError } from "@/lib/errors";
import { actionLabels, componentLabels, partLabels, type RepairAction, type RepairComponent, type RepairPart } from "@/lib/forms/repairs";
import { reportStatusLabels } from "@/lib/forms/report-status";
import { installationLabels, reasonLabels, type TestReason } from "@/lib/forms/report-options";
import { assemblyKindLabels, formatPsid, psidToKpa } from "@/lib/rules";

export const metadata: Metadata = { title: "Report" };

export default async function TesterReportPage({ params, searchParams }: { params: Promise<{ id: string }>; searchParams: Promise<Record<string, string | undefined>> }) {
  const actor = await requirePermission("reports.read_own");
  const { id } = await params;
  const query = await searchParams;
  if (!/^\d{1,10}$/.test(id)) notFound();
  let report: ReportDetail;
  try {
    report = await getReportDetail(actor, Number(id));
    // A tester sees only the reports they filed, whatever else the role could read.
    if (report.testerId !== actor.id) throw new NotFoundError();
  } catch (error) {
    if (error instanceof NotFoundError) notFound();
    throw error;
  }
  const history = await getMyReportHistory(actor, report.id);
  const newerRevision = history.find((h) => h.relation === "revision" && h.revision > report.revision);
  const a = report.assembly;
  const number = `${report.reportNumber}${report.revision > 1 ? ` rev. ${report.revision}` : ""}`;
  const linePressure = report.linePressurePsi === null ? "—" : report.unit === "kPa" ? `${Math.round(psidToKpa(report.linePressurePsi))} kPa (${formatPsid(report.linePressurePsi)} psi)` : `${formatPsid(report.linePressurePsi)} psi`;
  const warnings = report.validity.filter((issue) => issue.severity === "warning");

  return (
    <div className="mx-auto max-w-4xl">
      <PageHeader
        title={`Report ${number}`}
        description={`${a.kind} ${a.serial || ""} at ${a.address} · tested ${report.testedAt}`}
        actions={
          <>
            <ButtonLink href={`/api/reports/${report.id}/pdf`} variant="primary" size="lg" data-testid="download-pdf">
              Download PDF
            </ButtonLink>
            {report.status === "returned" && !newerRevision ? (
              <ButtonLink href={`/tester/reports/new?corrects=${report.id}`} variant="secondary" size="lg">
                Correct and resubmit
              </ButtonLink>
            ) : null}
            {report.status === "accepted" ? (
              <ButtonLink href={`/tester/reports/new?amends=${report.id}`} variant="secondary" size="lg">
                File an amendment
              </ButtonLink>
            ) : null}
          </>
        }
      />

      {query.filed ? (
        <div className="mb-5">
          <Alert tone="success" title="Report filed" live>
            {report.reportNumber} is {report.status === "awaiting_fee" ? "filed; the program's filing fee is owed before review" : "waiting for the program's review"}.
            {report.status === "awaiting_fee" ? (
              <>
                {" "}
                <a href="/tester/fees">Pay it on the Fees page.</a>
              </>
            ) : null}
            {report.finalOutcome === "fail" && !report.wasRepaired ? " The assembly stands failed: the program's repair deadline runs from the test date." : ""}
          </Alert>
        </div>
      ) : null}

      {report.status === "returned" && report.decision ? (
        <div className="mb-5">
          <Alert tone="danger" title={`Returned by ${report.decision.inspectorName} on ${report.decision.decidedAt.slice(0, 10)}`}>
            {report.decision.reasons.length ? (
              <ul className="list-disc pl-5">
                {report.decision.reasons.map((reason) => (
                  <li key={reason}>{reason}</li>
                ))}
              </ul>
            ) : null}
            {report.decision.note ? <p className="mt-1">“{report.decision.note}”</p> : null}
            {newerRevision ? <p className="mt-1">Corrected as revision {newerRevision.revision}.</p> : <p className="mt-1 font-semibold">Correct it and submit again: both revisions stay on record.</p>}
          </Alert>
        </div>
      ) : null}
      {report.status === "superseded" && newerRevision ? (
        <div className="mb-5">
          <Alert tone="info">
            This revision was replaced by <a href={`/tester/reports/${newerRevision.id}`}>revision {newerRevision.revision}</a>.
          </Alert>
        </div>
      ) : null}
      {report.status === "accepted" ? (
        <div className="mb-5">
          <Alert tone="success">Accepted{report.decision ? ` by ${report.decision.inspectorName} on ${report.decision.decidedAt.slice(0, 10)}` : ""}. An accepted report cannot be edited; a correction is filed as an amendment linked to it.</Alert>
        </div>
      ) : null}

      <div className="mb-5 flex flex-wrap items-center gap-2">
        <ReportStatusBadge status={report.status} />
        <OutcomeBadge finalOutcome={report.finalOutcome} wasRepaired={report.wasRepaired} />
        <span className="text-sm text-ink-600">Verification code {report.verificationCode}</span>
      </div>

      <div className="grid gap-4 md:grid-cols-2">
        <Card title="Assembly and site">
          <dl className="space-y-1 text-sm">
            <div>
              <dt className="inline text-ink-600">Kind: </dt>
              <dd className="inline">
                {assemblyKindLabels[a.kind]} ({a.kind})
              </dd>
            </div>
            <div>
              <dt className="inline text-ink-600">Make / model / size / serial: </dt>
              <dd className="inline">{[a.make, a.model, a.size, a.serial].filter(Boolean).join(" · ")}</dd>
            </div>
            <div>
              <dt className="inline text-ink-600">Location: </dt>
              <dd className="inline">{a.location}</dd>
            </div>
            <div>
              <dt className="inline text-ink-600">Site: </dt>
              <dd className="inline">
                {a.siteName}, {a.address} (account {a.accountNumber})
              </dd>
            </div>
            <div>
              <dt className="inline text-ink-600">Installation: </dt>
              <dd className="inline">
                {installationLabels[report.installation as keyof typeof installationLabels] ?? report.installation}
                {report.previousSerial ? `, replaces ${report.previousSerial}` : ""}
              </dd>
            </div>
          </dl>
        </Card>
        <Card title="Test">
          <dl className="space-y-1 text-sm">
            <div>
              <dt className="inline text-ink-600">Tested: </dt>
              <dd className="inline">
                {report.testedAt} · {reasonLabels[report.reason as TestReason] ?? report.reason}
                {report.reasonNote ? ` (${report.reasonNote})` : ""}
              </dd>
            </div>
            <div>
              <dt className="inline text-ink-600">Kit: </dt>
              <dd className="inline">{report.kit ? `${report.kit.make} ${report.kit.model}, ${report.kit.serial}, checked ${report.kit.lastVerifiedOn}` : "—"}</dd>
            </div>
            <div>
              <dt className="inline text-ink-600">Line pressure: </dt>
              <dd className="inline">{linePressure}</dd>
            </div>
            <div>
              <dt className="inline text-ink-600">Rule set: </dt>
              <dd className="inline">{report.ruleSetLabel}</dd>
            </div>
            <div>
              <dt className="inline text-ink-600">Signed: </dt>
              <dd className="inline">
                {report.attestedName}, {report.attestedAt.slice(0, 16).replace("T", " ")} UTC
              </dd>
            </div>
          </dl>
        </Card>
      </div>

      <div className="mt-5 space-y-4">
        <ReportPhaseTable title="Initial test" phase={report.grade.initial} unit={report.unit} />
        {report.repairs.length ? (
          <Card title="Repairs">
            <ul className="divide-y divide-ink-100 text-sm">
              {report.repairs.map((repair, index) => (
                <li key={index} className="py-1.5">
                  <span className="font-semibold">{componentLabels[repair.component as RepairComponent] ?? repair.component}</span>: {partLabels[repair.part as RepairPart] ?? repair.part} {(actionLabels[repair.action as RepairAction] ?? repair.action).toLowerCase()}
                  {repair.note ? <span className="text-ink-600"> · {repair.note}</span> : null}
                </li>
              ))}
            </ul>
          </Card>
        ) : null}
        {report.grade.retest ? <ReportPhaseTable title="Retest after repair" phase={report.grade.retest} unit={report.unit} /> : null}
        {report.remarks ? (
          <Card title="Remarks">
            <p className="whitespace-pre-line text-sm">{report.remarks}</p>
          </Card>
        ) : null}
        {warnings.length ? (
          <Card title="Notes for the reviewer">
            <ul className="list-disc space-y-1 pl-5 text-sm text-caution-700">
              {warnings.map((w) => (
                <li key={`${w.code}-${w.field ?? ""}`}>{w.message}</li>
              ))}
            </ul>
          </Card>
        ) : null}
        {history.length > 1 ? (
          <Card title="History">
            <ul className="space-y-1 text-sm">
              {history.map((h) => (
                <li key={h.id}>
                  {h.id === report.id ? (
                    <span className="font-semibold">
                      {h.reportNumber} rev. {h.revision} (this one)
                    </span>
                  ) : (
                    <a href={`/tester/reports/${h.id}`}>
                      {h.reportNumber} rev. {h.revision}
                    </a>
                  )}{" "}
                  · {h.relation === "amendment" ? "amendment" : h.relation === "amended" ? "amended by this report" : "revision"} · {reportStatusLabels[h.status]} · filed {h.submittedAt.slice(0, 10)}
                </li>
              ))}
            </ul>
          </Card>
        ) : null}
      </div>
    </div>
  );
}
