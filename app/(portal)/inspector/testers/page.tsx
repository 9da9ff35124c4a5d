import type { Metadata } from "next";
import { formatDay, formatInstant } from "@/components/inspector/format";
import { Badge } from "@/components/ui/badge";
import { Card, PageHeader } from "@/components/ui/card";
import { requirePermission } from "@/lib/auth/guards";
import { getStaffProgramContext } from "@/lib/data/settings";
import { listTesterRoster } from "@/lib/data/testers";
import { decisionsFor } from "@/components/inspector/tester-decisions";
import { DecisionForm } from "./decision-form";

export const metadata: Metadata = { title: "Testers" };

const tone = { approved: "pass", pending: "caution", rejected: "fail", suspended: "fail" } as const;
const statusWord = { approved: "Approved", pending: "Waiting for a decision", rejected: "Rejected", suspended: "Suspended" } as const;

const statuses = ["pending", "approved", "suspended", "rejected"] as const;

export default async function TestersPage({ searchParams }: { searchParams: Promise<{ status?: string; q?: string }> }) {
  const actor = await requirePermission("testers.review");
  const params = await searchParams;
  const status = statuses.find((s) => s === params.status);
  const q = (params.q ?? "").slice(0, 100);
  const [{ rows, today }, all, context] = await Promise.all([listTesterRoster(actor, { status, q }), listTesterRoster(actor), getStaffProgramContext(actor)]);
  const countOf = (s: string) => all.rows.filter((r) => r.status === s).length;
  const pending = rows.filter((r) => r.status === "pending");
  const others = rows.filter((r) => r.status !== "pending");
  const renderRow = (r: (typeof rows)[number]) => (
    <li key={r.approvalId} className="space-y-2 py-4">
      <div className="flex flex-wrap items-center gap-2">
        <a href={`/inspector/testers/${r.approvalId}`} className="font-semibold">
          {r.name}
        </a>
        <Badge tone={tone[r.status]}>{statusWord[r.status]}</Badge>
        {r.status === "approved" && !r.isCertificationValid ? <Badge tone="fail">Certification expired</Badge> : null}
        <span className="text-sm text-ink-600">
          {r.company ? `${r.company} · ` : ""}
          {r.phone} · {r.email}
        </span>
      </div>
      <p className="text-sm text-ink-800">
        {r.certification ? (
          <>
            Certificate {r.certification.number} from {r.certification.body},{" "}
            <span className={r.isCertificationValid ? "" : "font-semibold text-fail-700"}>
              {r.isCertificationValid ? "valid until" : "expired"} {formatDay(r.certification.expiresOn)}
            </span>
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
      <p className="text-xs text-ink-600">
        {r.kits.length ? `Kits: ${r.kits.map((k) => `${k.serial} (verified ${formatDay(k.lastVerifiedOn)}${k.isCurrent ? "" : ", overdue"})`).join(", ")}` : "No test kit on file."} · {r.reportsLast12Months} report{r.reportsLast12Months === 1 ? "" : "s"} in the last 12 months · registered {formatInstant(r.requestedAt.toISOString(), context.timezone)}
      </p>
      {r.reason ? <p className="text-sm text-ink-600">Reason given: {r.reason}</p> : null}
      {r.status === "approved" ? (
        // The roster stays readable: suspending is one click away, not a form on every line.
        <details>
          <summary className="cursor-pointer text-sm font-semibold text-fail-700">Suspend…</summary>
          <div className="mt-2">
            <DecisionForm approvalId={r.approvalId} decisions={decisionsFor(r.status)} testerName={r.name} />
          </div>
        </details>
      ) : (
        <DecisionForm approvalId={r.approvalId} decisions={decisionsFor(r.status)} testerName={r.name} />
      )}
    </li>
  );
  return (
    <>
      <PageHeader title="Tester roster" description={`Check each registration's certificate before approving it. Every decision is e-mailed to the tester and kept in the audit log. Certificate validity is judged on ${formatDay(today)}.`} actions={<a href="/testers">The public list owners see</a>} />
      <nav className="mb-4 flex flex-wrap gap-2 text-sm" aria-label="Filter by status">
        <a href={`/inspector/testers${q ? `?q=${encodeURIComponent(q)}` : ""}`} aria-current={!status ? "page" : undefined} className={`rounded-full border px-3 py-1 no-underline ${!status ? "border-estuary-700 bg-estuary-700 text-white" : "border-ink-200 bg-white"}`}>
          All ({all.rows.length})
        </a>
        {statuses.map((s) => (
          <a key={s} href={`/inspector/testers?status=${s}${q ? `&q=${encodeURIComponent(q)}` : ""}`} aria-current={status === s ? "page" : undefined} className={`rounded-full border px-3 py-1 no-underline ${status === s ? "border-estuary-700 bg-estuary-700 text-white" : "border-ink-200 bg-white"}`}>
            {statusWord[s]} ({countOf(s)})
          </a>
        ))}
        <form className="ml-auto flex gap-2" action="/inspector/testers">
          {status ? <input type="hidden" name="status" value={status} /> : null}
          <label htmlFor="tester-q" className="sr-only">
            Search testers
          </label>
          <input id="tester-q" name="q" type="search" defaultValue={q} placeholder="Name, company, e-mail or certificate" className="rounded-md border border-ink-200 px-3 py-1.5" />
          <button className="rounded-md border border-ink-200 bg-white px-3 font-semibold">Search</button>
        </form>
      </nav>
      <div className="space-y-6">
        {pending.length || status === "pending" ? (
          <Card title={`Waiting for a decision (${pending.length})`}>{pending.length ? <ul className="divide-y divide-ink-100">{pending.map(renderRow)}</ul> : <p className="text-ink-600">No registrations are waiting.</p>}</Card>
        ) : null}
        {status !== "pending" ? (
          <Card title={`Roster (${others.length})`}>{others.length ? <ul className="divide-y divide-ink-100">{others.map(renderRow)}</ul> : <p className="text-ink-600">Nobody matches.</p>}</Card>
        ) : null}
      </div>
    </>
  );
}
