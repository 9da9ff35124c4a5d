import type { Metadata } from "next";
import { Badge } from "@/components/ui/badge";
import { Card, PageHeader } from "@/components/ui/card";
import { requirePermission } from "@/lib/auth/guards";
import { listTesterApprovals, type TesterApprovalRow } from "@/lib/data/testers";
import { DecisionForm } from "./decision-form";

export const metadata: Metadata = { title: "Testers" };

const tone = { approved: "pass", pending: "caution", rejected: "fail", suspended: "fail" } as const;

function decisionsFor(status: TesterApprovalRow["status"]) {
  switch (status) {
    case "pending":
      return ["approve", "reject"] as const;
    case "approved":
      return ["suspend"] as const;
    case "suspended":
      return ["reinstate"] as const;
    case "rejected":
      return ["approve"] as const;
  }
}

export default async function TestersPage() {
  const actor = await requirePermission("testers.review");
  const rows = await listTesterApprovals(actor);
  const pending = rows.filter((r) => r.status === "pending");
  const others = rows.filter((r) => r.status !== "pending");
  const renderRow = (r: TesterApprovalRow) => (
    <li key={r.approvalId} className="space-y-2 py-3">
      <div className="flex flex-wrap items-center gap-2">
        <span className="font-semibold">{r.name}</span>
        <Badge tone={tone[r.status]}>{r.status}</Badge>
        <span className="text-sm text-ink-600">
          {r.email} · {r.phone}
          {r.company ? ` · ${r.company}` : ""}
        </span>
      </div>
      <p className="text-sm text-ink-800">
        {r.certification ? (
          <>
            Certificate {r.certification.number} from {r.certification.body}, expires {r.certification.expiresOn}
            {r.certification.attachmentId ? (
              <>
                {" "}
                · <a href={`/api/files/${r.certification.attachmentId}`}>view the uploaded copy</a>
              </>
            ) : (
              " · no copy uploaded yet"
            )}
          </>
        ) : (
          "No certificate on file."
        )}
      </p>
      {r.reason ? <p className="text-sm text-ink-600">Reason: {r.reason}</p> : null}
      <DecisionForm approvalId={r.approvalId} decisions={[...decisionsFor(r.status)]} testerName={r.name} />
    </li>
  );
  return (
    <>
      <PageHeader title="Testers" description="Check each registration's certificate before approving it. Every decision is e-mailed to the tester and kept in the audit log." />
      <div className="space-y-6">
        <Card title={`Waiting for a decision (${pending.length})`}>
          {pending.length ? <ul className="divide-y divide-ink-100">{pending.map(renderRow)}</ul> : <p className="text-ink-600">No registrations are waiting.</p>}
        </Card>
        <Card title={`Roster (${others.length})`}>
          <ul className="divide-y divide-ink-100">{others.map(renderRow)}</ul>
        </Card>
      </div>
    </>
  );
}
