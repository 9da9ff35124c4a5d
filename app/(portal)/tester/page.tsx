import type { Metadata } from "next";
import { ComingDueList } from "@/components/tester/coming-due-list";
import { Alert } from "@/components/ui/alert";
import { Badge } from "@/components/ui/badge";
import { ButtonLink } from "@/components/ui/button";
import { Card, PageHeader } from "@/components/ui/card";
import { requirePermission } from "@/lib/auth/guards";
import { getTesterHome } from "@/lib/data/tester-home";
import { draftHref } from "@/lib/forms/draft-sync";

export const metadata: Metadata = { title: "Tester home" };

const approvalTone = { approved: "pass", pending: "caution", rejected: "fail", suspended: "fail" } as const;
const approvalWords = { approved: "Approved to file", pending: "Waiting for approval", rejected: "Not approved", suspended: "Suspended" } as const;

function QuickLink({ href, title, detail, tone = "neutral" }: { href: string; title: string; detail: string; tone?: "neutral" | "fail" | "caution" }) {
  const ring = tone === "fail" ? "border-fail-600/40" : tone === "caution" ? "border-caution-600/40" : "border-ink-200";
  return (
    <a href={href} className={`block min-h-20 rounded-lg border-2 ${ring} bg-white px-4 py-3 text-ink-900 no-underline shadow-sm hover:border-estuary-400 hover:no-underline`}>
      <span className="block text-lg font-bold text-estuary-800">{title}</span>
      <span className="block text-sm text-ink-600">{detail}</span>
    </a>
  );
}

export default async function TesterHome({ searchParams }: { searchParams: Promise<Record<string, string | undefined>> }) {
  const actor = await requirePermission("tester.home");
  const params = await searchParams;
  const home = await getTesterHome(actor);
  const waiting = (home.counts.queued ?? 0) + (home.counts.awaiting_fee ?? 0);
  const isApprovedSomewhere = home.approvals.some((a) => a.status === "approved");
  return (
    <>
      <PageHeader
        title={`Hello, ${actor.name.split(" ")[0]}`}
        description="Your tests, reports, credentials and the assemblies coming due."
        actions={
          isApprovedSomewhere ? (
            <ButtonLink href="/tester/assemblies" size="lg">
              Start a test
            </ButtonLink>
          ) : null
        }
      />
      {params.registered ? (
        <div className="mb-6">
          <Alert tone="success" title="Registration received">
            Each program you picked will check your certificate and approve you. Meanwhile you can add your test kits and upload your documents.
          </Alert>
        </div>
      ) : null}

      {home.credentials.warnings.length ? (
        <div className="mb-6 space-y-2">
          {home.credentials.warnings.map((warning) => (
            <Alert key={warning.message} tone={warning.tone === "danger" ? "danger" : "warning"}>
              {warning.message} <a href="/tester/credentials">Update credentials and kits</a>
            </Alert>
          ))}
        </div>
      ) : null}

      <nav aria-label="Quick links" className="mb-6 grid grid-cols-1 gap-3 sm:grid-cols-2 lg:grid-cols-3">
        <QuickLink href="/tester/assemblies" title="Find an assembly" detail="By serial, street address or account number; or register a new one." />
        <QuickLink href="/tester/reports?status=open" title="My reports" detail={waiting ? `${waiting} waiting for review` : "Everything you filed, with its status."} />
        <QuickLink href="/tester/reports?status=returned" title="Returned to me" detail={home.returned.length ? `${home.returned.length} to correct` : "Nothing to correct."} tone={home.returned.length ? "fail" : "neutral"} />
        <QuickLink href="/tester/coming-due" title="Coming due" detail={`${home.comingDue.rows.length} of your customers' assemblies in the next 60 days or awaiting repair.`} />
        <QuickLink href="/tester/credentials" title="Credentials and kits" detail={home.credentials.warnings.length ? `${home.credentials.warnings.length} need attention` : "Certification and gauges up to date."} tone={home.credentials.warnings.some((w) => w.tone === "danger") ? "fail" : home.credentials.warnings.length ? "caution" : "neutral"} />
        <QuickLink href="/tester/assemblies?tags=1" title="Print tags" detail="Label sheets with a QR code that opens a new test." />
      </nav>

      <div className="grid gap-6 lg:grid-cols-2">
        {home.returned.length ? (
          <Card title="Returned reports to correct" className="lg:col-span-2">
            <ul className="divide-y divide-ink-100">
              {home.returned.map((r) => (
                <li key={r.id} className="flex flex-wrap items-start justify-between gap-3 py-3">
                  <div className="min-w-0">
                    <p className="font-semibold">
                      {r.reportNumber} rev. {r.revision} · {r.kind} {r.serial} · {r.addressLine1}, {r.city}
                    </p>
                    <p className="text-sm text-fail-700">{r.reasons.join("; ") || "Returned"}</p>
                    {r.note ? <p className="text-sm text-ink-600">“{r.note}”</p> : null}
                  </div>
                  <ButtonLink href={`/tester/reports/new?corrects=${r.id}`} variant="secondary">
                    Correct
                  </ButtonLink>
                </li>
              ))}
            </ul>
          </Card>
        ) : null}

        {home.drafts.length ? (
          <Card title="Unfinished tests">
            <ul className="divide-y divide-ink-100">
              {home.drafts.map((d) => (
                <li key={d.clientKey} className="flex flex-wrap items-center justify-between gap-2 py-2.5">
                  <span>
                    <span className="font-semibold">
                      {d.kind ?? "Assembly"} {d.serial ?? ""}
                    </span>
                    <span className="block text-sm text-ink-600">
                      {d.addressLine1 ? `${d.addressLine1}, ${d.city} · ` : ""}
                      {d.correctsReportId ? "correction · " : d.amendsReportId ? "amendment · " : ""}saved {d.updatedAt.slice(0, 16).replace("T", " ")} UTC
                    </span>
                  </span>
                  <ButtonLink href={draftHref(d)} variant="secondary">
                    Continue
                  </ButtonLink>
                </li>
              ))}
            </ul>
          </Card>
        ) : null}

        <Card title="Coming due" actions={<a href="/tester/coming-due">All {home.comingDue.rows.length}</a>}>
          <ComingDueList rows={home.comingDue.rows.slice(0, 6)} isCompact />
        </Card>

        <Card title="Programs">
          <ul className="divide-y divide-ink-100">
            {home.approvals.map((a) => (
              <li key={a.programId} className="flex flex-wrap items-center justify-between gap-2 py-2">
                <span className="font-semibold">{a.programName}</span>
                <Badge tone={approvalTone[a.status]}>{approvalWords[a.status]}</Badge>
                {a.reason && a.status !== "approved" ? <p className="w-full text-sm text-ink-600">Reason: {a.reason}</p> : null}
              </li>
            ))}
          </ul>
          {home.approvals.length === 0 ? <p className="text-sm text-ink-600">You have not applied to any program yet.</p> : null}
        </Card>
      </div>
    </>
  );
}
