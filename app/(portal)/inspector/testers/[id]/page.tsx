import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { formatDay, formatInstant } from "@/components/inspector/format";
import { decisionsFor } from "@/components/inspector/tester-decisions";
import { Badge } from "@/components/ui/badge";
import { Card, PageHeader } from "@/components/ui/card";
import { requirePermission } from "@/lib/auth/guards";
import { NotFoundError } from "@/lib/errors";
import { getStaffProgramContext } from "@/lib/data/settings";
import { getTesterForStaff } from "@/lib/data/testers";
import { DecisionForm } from "../decision-form";

export const metadata: Metadata = { title: "Tester" };

const tone = { approved: "pass", pending: "caution", rejected: "fail", suspended: "fail" } as const;
const actionWords: Record<string, string> = { "tester.approved": "Approved", "tester.rejected": "Rejected", "tester.suspended": "Suspended", "tester.reinstated": "Reinstated" };

export default async function TesterPage({ params }: { params: Promise<{ id: string }> }) {
  const actor = await requirePermission("testers.review");
  const id = Number((await params).id);
  if (!Number.isInteger(id) || id <= 0) notFound();
  const tester = await getTesterForStaff(actor, id).catch((error: unknown) => {
    if (error instanceof NotFoundError) notFound();
    throw error;
  });
  const context = await getStaffProgramContext(actor);
  return (
    <>
      <p className="mb-2 text-sm">
        <a href="/inspector/testers">← Tester roster</a>
      </p>
      <PageHeader
        title={
          <span className="flex flex-wrap items-center gap-3">
            {tester.name} <Badge tone={tone[tester.status]}>{tester.status}</Badge>
          </span>
        }
        description={[tester.company, tester.phone, tester.email, tester.accountStatus !== "active" ? `account ${tester.accountStatus}` : ""].filter(Boolean).join(" · ")}
      />
      <div className="grid gap-6 lg:grid-cols-[minmax(0,3fr)_minmax(0,2fr)]">
        <div className="space-y-6">
          <Card title="Certifications">
            {tester.certifications.length === 0 ? <p className="text-ink-600">None on file.</p> : null}
            <ul className="divide-y divide-ink-100">
              {tester.certifications.map((c) => (
                <li key={c.number + c.expiresOn} className="py-2 text-sm">
                  <span className="font-semibold">{c.number}</span> · {c.body} · {c.issuedOn ? `issued ${formatDay(c.issuedOn)}, ` : ""}
                  <span className={c.isValid ? "text-pass-700" : "font-semibold text-fail-700"}>
                    {c.isValid ? "valid until" : c.expiresOn < tester.today ? "expired on" : "not valid yet; expires"} {formatDay(c.expiresOn)}
                  </span>
                  {c.attachmentId ? (
                    <>
                      {" "}
                      · <a href={`/api/files/${c.attachmentId}`}>the uploaded certificate</a>
                    </>
                  ) : (
                    <span className="text-ink-600"> · no copy uploaded</span>
                  )}
                </li>
              ))}
            </ul>
          </Card>
          <Card title="Test kits">
            {tester.kits.length === 0 ? <p className="text-ink-600">None on file.</p> : null}
            <ul className="divide-y divide-ink-100">
              {tester.kits.map((k) => (
                <li key={k.serial} className="py-2 text-sm">
                  <span className="font-semibold">
                    {k.make} {k.model}
                  </span>{" "}
                  serial {k.serial} · accuracy verified {formatDay(k.lastVerifiedOn)} ({k.result}){" "}
                  {k.isRetired ? <Badge tone="muted">retired</Badge> : k.isCurrent ? <Badge tone="pass">current</Badge> : <Badge tone="fail">verification overdue</Badge>}
                  {k.attachmentId ? (
                    <>
                      {" "}
                      · <a href={`/api/files/${k.attachmentId}`}>verification record</a>
                    </>
                  ) : null}
                </li>
              ))}
            </ul>
          </Card>
          <Card title="Recent reports in this program">
            {tester.recentReports.length === 0 ? <p className="text-ink-600">No report filed here yet.</p> : null}
            <ul className="divide-y divide-ink-100 text-sm">
              {tester.recentReports.map((r) => (
                <li key={r.id} className="py-1.5">
                  <a href={`/inspector/reports/${r.id}`}>{r.reportNumber}</a> · tested {formatDay(r.testedOn)} · {r.siteName} · {r.finalOutcome} · {r.status}
                </li>
              ))}
            </ul>
          </Card>
        </div>
        <div className="space-y-6">
          <Card title="Decision">
            <p className="mb-3 text-sm text-ink-700">
              Registered {formatInstant(tester.requestedAt, context.timezone)}.
              {tester.decidedAt ? ` Last decided ${formatInstant(tester.decidedAt, context.timezone)}${tester.decidedBy ? ` by ${tester.decidedBy}` : ""}.` : ""}
              {tester.reason ? ` Reason: ${tester.reason}` : ""}
            </p>
            <DecisionForm approvalId={tester.approvalId} decisions={decisionsFor(tester.status)} testerName={tester.name} />
          </Card>
          <Card title="History">
            {tester.history.length === 0 ? <p className="text-sm text-ink-600">No decision recorded in the audit log yet.</p> : null}
            <ul className="space-y-1 text-sm">
              {tester.history.map((h, i) => (
                <li key={i}>
                  {formatInstant(h.at, context.timezone)} · {actionWords[h.action] ?? h.action}
                  {h.actorName ? ` by ${h.actorName}` : ""}
                  {h.reason ? ` — ${h.reason}` : ""}
                </li>
              ))}
            </ul>
          </Card>
          {tester.otherPrograms.length ? (
            <Card title="Other programs">
              <ul className="text-sm">
                {tester.otherPrograms.map((p) => (
                  <li key={p.name}>
                    {p.name}: {p.status}
                  </li>
                ))}
              </ul>
            </Card>
          ) : null}
        </div>
      </div>
    </>
  );
}
