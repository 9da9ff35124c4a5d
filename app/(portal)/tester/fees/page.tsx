import type { Metadata } from "next";
import { Alert } from "@/components/ui/alert";
import { ButtonLink } from "@/components/ui/button";
import { Card, PageHeader } from "@/components/ui/card";
import { requirePermission } from "@/lib/auth/guards";
import { isCompanyBillingManager, listOpenCheckouts, listOutstandingFees, type FeeScope } from "@/lib/data/fees";
import { formatMoney } from "@/lib/payments/money";
import { PayFeesForm } from "./_components/pay-fees-form";

export const metadata: Metadata = { title: "Filing fees" };

export default async function TesterFeesPage({ searchParams }: { searchParams: Promise<Record<string, string | undefined>> }) {
  const actor = await requirePermission("fees.pay");
  const params = await searchParams;
  const isManager = isCompanyBillingManager(actor);
  const scope: FeeScope = isManager && params.scope !== "mine" ? "company" : "mine";
  const [fees, openCheckouts] = await Promise.all([listOutstandingFees(actor, scope), listOpenCheckouts(actor)]);
  const tab = (value: FeeScope, label: string) => (
    <a
      href={`/tester/fees?scope=${value}`}
      aria-current={scope === value ? "page" : undefined}
      className={`rounded-md px-3 py-1.5 text-sm font-semibold no-underline ${scope === value ? "bg-estuary-700 text-white" : "border border-ink-200 bg-white text-ink-800 hover:bg-ink-50"}`}
    >
      {label}
    </a>
  );
  return (
    <>
      <PageHeader
        title="Filing fees"
        description="Where a program charges a filing fee, a report goes to the inspectors' review queue once its fee is paid. The fee is the one in force when the report was filed."
        actions={
          <>
            <ButtonLink href="/tester/fees/receipts" variant="secondary">
              Receipts
            </ButtonLink>
            {isManager ? (
              <ButtonLink href="/tester/fees/statement" variant="secondary">
                Company statement
              </ButtonLink>
            ) : null}
          </>
        }
      />
      <div className="space-y-6">
        {params.canceled ? (
          <Alert tone="info" title="Checkout canceled">
            Nothing was charged. The fees below are still outstanding.
          </Alert>
        ) : null}
        {openCheckouts.length > 0 ? (
          <Alert tone="warning" title={openCheckouts.length === 1 ? "A checkout is still open" : `${openCheckouts.length} checkouts are still open`}>
            <ul className="mt-1 space-y-1">
              {openCheckouts.map((c) => (
                <li key={c.id}>
                  {formatMoney(c.amountCents, c.currency)} for {c.items.length} {c.items.length === 1 ? "report" : "reports"} ({c.programName}), started {new Date(c.createdAt).toLocaleString("en-US", { dateStyle: "medium", timeStyle: "short", timeZone: c.timezone })}
                  {c.isOwnPayment ? "" : ` by ${c.payerName}`}.{" "}
                  {c.checkoutUrl && c.isOwnPayment ? <a href={c.checkoutUrl}>Continue paying</a> : null}
                </li>
              ))}
            </ul>
            <p className="mt-1">Starting a new checkout for the same reports closes the open one first, so nothing is paid twice.</p>
          </Alert>
        ) : null}
        {isManager ? (
          <nav aria-label="Whose fees" className="flex flex-wrap gap-2">
            {tab("company", "Everyone in my company")}
            {tab("mine", "My reports only")}
          </nav>
        ) : null}
        {fees.length === 0 ? (
          <Card>
            <p className="text-ink-700">{scope === "company" ? "No filing fees are outstanding for your company." : "You have no outstanding filing fees."}</p>
          </Card>
        ) : (
          <PayFeesForm fees={fees} showTester={scope === "company"} />
        )}
        {!isManager && actor.companyId !== null ? <p className="text-sm text-ink-600">Your company&apos;s billing manager can also pay your fees from their account.</p> : null}
      </div>
    </>
  );
}
