import type { Metadata } from "next";
import { Alert } from "@/components/ui/alert";
import { Badge } from "@/components/ui/badge";
import { Card, PageHeader, StatTile } from "@/components/ui/card";
import { requirePermission } from "@/lib/auth/guards";
import { getProgramFees, listProgramCompanies, type FeeView } from "@/lib/data/fees-admin";
import { formatMoney } from "@/lib/payments/money";
import { dateInZone, monthOf, recentMonths } from "@/lib/payments/periods";
import { FeeActionForm } from "./_components/fee-action-form";
import { StatementPicker } from "./_components/statement-picker";

export const metadata: Metadata = { title: "Filing fees" };

const views: { value: FeeView; label: string }[] = [
  { value: "owed", label: "Owed" },
  { value: "paid", label: "Paid" },
  { value: "refunded", label: "Refunds" },
  { value: "waived", label: "Waived" },
];

const reportStatusWords: Record<string, string> = { awaiting_fee: "waiting for its fee", queued: "in review queue", accepted: "accepted", returned: "returned", superseded: "superseded" };

export default async function AdminFeesPage({ searchParams }: { searchParams: Promise<Record<string, string | undefined>> }) {
  const actor = await requirePermission("fees.manage");
  const params = await searchParams;
  const view = views.find((v) => v.value === params.view)?.value ?? "owed";
  const [{ totals, rows, feeCents, programCurrency, isStandIn, timezone }, companies] = await Promise.all([getProgramFees(actor, view), listProgramCompanies(actor)]);
  const money = (cents: number, currency = totals.currency) => formatMoney(cents, currency);
  const dateOf = (iso: string) => (iso ? dateInZone(new Date(iso), timezone) : "");
  return (
    <>
      <PageHeader
        title="Filing fees"
        description={feeCents > 0 ? `The program charges ${money(feeCents, programCurrency)} per report (set in the program settings). Each report keeps the fee in force when it was filed.` : "The program charges no filing fee at present (set one in the program settings). Fees already owed stay owed."}
      />
      <div className="space-y-6">
        {isStandIn ? (
          <Alert tone="warning" title="Local payments stand-in">
            Payments and refunds go to the local stand-in of the payments service: no card is charged and no money moves.
          </Alert>
        ) : null}
        <div className="grid grid-cols-2 gap-3 lg:grid-cols-4">
          <StatTile label={`Owed (${totals.owed.count})`} value={money(totals.owed.cents)} tone={totals.owed.count ? "caution" : "neutral"} href="/admin/fees?view=owed" />
          <StatTile label={`Paid (${totals.paid.count})`} value={money(totals.paid.cents)} tone="pass" href="/admin/fees?view=paid" />
          <StatTile label={`Refunded (${totals.refunded.count})`} value={money(totals.refunded.cents)} href="/admin/fees?view=refunded" />
          <StatTile label={`Waived (${totals.waived.count})`} value={money(totals.waived.cents)} href="/admin/fees?view=waived" />
        </div>
        {totals.refundsPending > 0 ? (
          <Alert tone="info">
            {totals.refundsPending} {totals.refundsPending === 1 ? "refund is" : "refunds are"} waiting for the payment service&apos;s confirmation.
          </Alert>
        ) : null}
        <nav aria-label="Fee views" className="flex flex-wrap gap-2">
          {views.map((v) => (
            <a
              key={v.value}
              href={`/admin/fees?view=${v.value}`}
              aria-current={v.value === view ? "page" : undefined}
              className={`rounded-md px-3 py-1.5 text-sm font-semibold no-underline ${v.value === view ? "bg-estuary-700 text-white" : "border border-ink-200 bg-white text-ink-800 hover:bg-ink-50"}`}
            >
              {v.label}
            </a>
          ))}
        </nav>
        <Card title={`${views.find((v) => v.value === view)!.label} · newest ${rows.length}`}>
          {view === "paid" ? <p className="mb-3 text-sm text-ink-600">A refund returns the fee through the payment service. It does not take the report out of the review queue or undo an inspector&apos;s decision.</p> : null}
          {view === "owed" ? <p className="mb-3 text-sm text-ink-600">Waiving a fee sends the report to the review queue as if paid. The reason is kept in the audit log.</p> : null}
          {rows.length === 0 ? (
            <p className="text-ink-600">Nothing here.</p>
          ) : (
            <ul className="divide-y divide-ink-100">
              {rows.map((r, i) => (
                <li key={`${r.reportId}-${i}`} className="space-y-2 py-3">
                  <div className="flex flex-wrap items-center justify-between gap-2">
                    <span className="flex flex-wrap items-center gap-2">
                      <a href={`/inspector/reports/${r.reportId}`} className="font-semibold">
                        {r.report}
                      </a>
                      <span className="text-sm text-ink-600">
                        {r.testerName}
                        {r.companyName ? ` (${r.companyName})` : ""} · {reportStatusWords[r.reportStatus] ?? r.reportStatus}
                      </span>
                      {r.isInOpenCheckout ? <Badge tone="caution">checkout open</Badge> : null}
                      {r.refundStatus === "pending" ? <Badge tone="muted">refund pending</Badge> : null}
                      {r.refundStatus === "failed" ? <Badge tone="fail">refund failed</Badge> : null}
                      {r.refundStatus === "succeeded" ? <Badge tone="pass">refunded</Badge> : null}
                    </span>
                    <span className="font-semibold tabular-nums">{money(r.amountCents, r.currency)}</span>
                  </div>
                  <p className="text-sm text-ink-600">
                    {r.assembly} · {view === "owed" ? "filed" : view === "paid" ? "paid" : view === "waived" ? "waived" : "refund"} {dateOf(r.at)}
                    {r.receiptNumber ? ` · receipt ${r.receiptNumber}` : ""}
                    {r.paidBy ? ` · paid by ${r.paidBy}` : ""}
                  </p>
                  {r.note ? <p className="text-sm text-ink-800">Reason: {r.note}</p> : null}
                  {view === "owed" ? <FeeActionForm reportId={r.reportId} report={r.report} action="waive" /> : null}
                  {view === "paid" && r.refundStatus !== "pending" ? <FeeActionForm reportId={r.reportId} report={r.report} action="refund" /> : null}
                </li>
              ))}
            </ul>
          )}
        </Card>
        <Card title="Company statements">
          <p className="mb-3 text-sm text-ink-600">The monthly statement of a testing company&apos;s filing fees in this program (PDF).</p>
          <StatementPicker companies={companies} months={recentMonths(monthOf(new Date(), timezone), 24)} />
        </Card>
      </div>
    </>
  );
}
