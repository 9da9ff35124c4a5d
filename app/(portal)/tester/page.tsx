import type { Metadata } from "next";
import { Alert } from "@/components/ui/alert";
import { Badge } from "@/components/ui/badge";
import { Card, PageHeader } from "@/components/ui/card";
import { requirePermission } from "@/lib/auth/guards";
import { listMyProgramApprovals } from "@/lib/data/testers";

export const metadata: Metadata = { title: "Tester home" };

const approvalTone = { approved: "pass", pending: "caution", rejected: "fail", suspended: "fail" } as const;
const approvalWords = { approved: "Approved to file", pending: "Waiting for approval", rejected: "Not approved", suspended: "Suspended" } as const;

export default async function TesterHome({ searchParams }: { searchParams: Promise<Record<string, string | undefined>> }) {
  const actor = await requirePermission("tester.home");
  const params = await searchParams;
  const approvals = await listMyProgramApprovals(actor);
  return (
    <>
      <PageHeader title={`Hello, ${actor.name.split(" ")[0]}`} description="Your programs, credentials and reports." />
      {params.registered ? (
        <div className="mb-6">
          <Alert tone="success" title="Registration received">
            Each program you picked will check your certificate and approve you. Meanwhile you can add your test kits and upload your documents.
          </Alert>
        </div>
      ) : null}
      <Card title="Programs">
        <ul className="divide-y divide-ink-100">
          {approvals.map((a) => (
            <li key={a.programId} className="flex flex-wrap items-center justify-between gap-2 py-2">
              <span className="font-semibold">{a.programName}</span>
              <Badge tone={approvalTone[a.status]}>{approvalWords[a.status]}</Badge>
              {a.reason && a.status !== "approved" ? <p className="w-full text-sm text-ink-600">Reason: {a.reason}</p> : null}
            </li>
          ))}
        </ul>
      </Card>
    </>
  );
}
