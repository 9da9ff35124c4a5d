import type { Metadata } from "next";
import { forbidden } from "next/navigation";
import { ButtonLink } from "@/components/ui/button";
import { Card, PageHeader, StatTile } from "@/components/ui/card";
import { inputClass } from "@/components/ui/field";
import { requirePermission } from "@/lib/auth/guards";
import { isCompanyBillingManager } from "@/lib/data/fees";
import { getCompanyStatement } from "@/lib/data/fees-statement";
import { formatMoney } from "@/lib/payments/money";
import { isMonth, monthLabel, monthOf, recentMonths } from "@/lib/payments/periods";

export const metadata: Metadata = { title: "Company statement" };

export default async function CompanyStatementPage({ searchParams }: { searchParams: Promise<Record<string, string | undefined>> }) {
  const actor = await requirePermission("fees.pay_company");
  // The permission belongs to every tester; only the company's billing manager has the flag.
  if (!isCompanyBillingManager(actor)) forbidden();
  const params = await searchParams;
  const thisMonth = monthOf(new Date(), "UTC");
  const month = params.month && isMonth(params.month) ? params.month : thisMonth;
  const statement = await getCompanyStatement(actor, actor.companyId, month);
  const pdfUrl = `/api/fees/statements/${actor.companyId}?month=${month}`;
  return (
    <>
      <PageHeader
        title="Company statement"
        description={`${statement.company.name}: the filing fees of every tester in the company, month by month.`}
        actions={
          <>
            <ButtonLink href={pdfUrl} variant="primary">
              Open the PDF
            </ButtonLink>
            <ButtonLink href={`${pdfUrl}&download=1`} variant="secondary">
              Download
            </ButtonLink>
          </>
        }
      />
      <form className="mb-6 flex flex-wrap items-end gap-2" method="get">
        <label className="text-sm font-semibold text-ink-800">
          Month
          <select name="month" defaultValue={month} className={`${inputClass} mt-1 min-w-48`}>
            {recentMonths(thisMonth, 24).map((m) => (
              <option key={m} value={m}>
                {monthLabel(m)}
              </option>
            ))}
          </select>
        </label>
        <button className="rounded-md border border-ink-200 bg-white px-4 py-2.5 font-semibold">Show</button>
      </form>
      {statement.sections.length === 0 ? (
        <Card>
          <p className="text-ink-700">No filing fees have been charged to your company&apos;s testers.</p>
        </Card>
      ) : (
        <div className="space-y-6">
          {statement.sections.map((s) => (
            <Card key={s.programId} title={`${s.programName} · ${statement.monthLabel}`}>
              <div className="grid grid-cols-2 gap-3 md:grid-cols-5">
                <StatTile label="Charged" value={formatMoney(s.totals.charged, s.currency)} />
                <StatTile label="Paid" value={formatMoney(s.totals.paid, s.currency)} tone="pass" />
                <StatTile label="Refunded" value={formatMoney(s.totals.refunded, s.currency)} />
                <StatTile label="Waived" value={formatMoney(s.totals.waived, s.currency)} />
                <StatTile label="Outstanding now" value={formatMoney(s.totals.outstanding, s.currency)} tone={s.totals.outstanding > 0 ? "caution" : "neutral"} />
              </div>
              <p className="mt-3 text-sm text-ink-600">
                {s.charged.length} {s.charged.length === 1 ? "report" : "reports"} filed with a fee this month · {s.payments.length} {s.payments.length === 1 ? "payment" : "payments"} · {s.outstanding.length} {s.outstanding.length === 1 ? "fee" : "fees"} outstanding.
                {s.outstanding.length ? (
                  <>
                    {" "}
                    <a href="/tester/fees?scope=company">Pay outstanding fees</a>
                  </>
                ) : null}
              </p>
            </Card>
          ))}
        </div>
      )}
    </>
  );
}
