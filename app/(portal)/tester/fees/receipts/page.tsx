import type { Metadata } from "next";
import { Badge } from "@/components/ui/badge";
import { ButtonLink } from "@/components/ui/button";
import { Card, PageHeader } from "@/components/ui/card";
import { requirePermission } from "@/lib/auth/guards";
import { listFeeReceipts } from "@/lib/data/fees";
import { formatMoney } from "@/lib/payments/money";

export const metadata: Metadata = { title: "Fee receipts" };

const itemWords = { paid: null, refunded: "refunded", unapplied: "already settled, refunded", pending: null, released: null } as const;

export default async function FeeReceiptsPage() {
  const actor = await requirePermission("fees.pay");
  const receipts = await listFeeReceipts(actor);
  return (
    <>
      <PageHeader
        title="Fee receipts"
        description="Every confirmed payment of filing fees, newest first. Each receipt was also e-mailed to whoever paid it."
        actions={
          <ButtonLink href="/tester/fees" variant="secondary">
            Outstanding fees
          </ButtonLink>
        }
      />
      {receipts.length === 0 ? (
        <Card>
          <p className="text-ink-700">No payments yet.</p>
        </Card>
      ) : (
        <div className="space-y-4">
          {receipts.map((r) => (
            <Card
              key={r.id}
              title={
                <span className="flex flex-wrap items-center gap-2">
                  Receipt {r.receiptNumber}
                  {r.refundedCents > 0 ? <Badge tone="caution">{r.refundedCents >= r.amountCents ? "refunded" : `${formatMoney(r.refundedCents, r.currency)} refunded`}</Badge> : <Badge tone="pass">paid</Badge>}
                </span>
              }
              actions={<span className="text-lg font-bold tabular-nums">{formatMoney(r.amountCents, r.currency)}</span>}
            >
              <p className="text-sm text-ink-600">
                {r.programName} · paid {r.paidAt ? new Date(r.paidAt).toLocaleString("en-US", { year: "numeric", month: "short", day: "numeric", hour: "numeric", minute: "2-digit", timeZone: r.timezone, timeZoneName: "short" }) : ""} · by {r.isOwnPayment ? "you" : r.payerName}
              </p>
              <ul className="mt-2 divide-y divide-ink-100 text-sm">
                {r.items.map((i) => (
                  <li key={i.reportId} className="flex flex-wrap items-center justify-between gap-2 py-1.5">
                    <span>
                      <span className="font-semibold">{i.report}</span> · {i.assembly} · {i.testerName}
                    </span>
                    <span className="flex items-center gap-2 tabular-nums">
                      {formatMoney(i.amountCents, r.currency)}
                      {itemWords[i.itemStatus] ? <Badge tone="caution">{itemWords[i.itemStatus]}</Badge> : null}
                      {i.refundPending ? <Badge tone="muted">refund on its way</Badge> : null}
                    </span>
                  </li>
                ))}
              </ul>
            </Card>
          ))}
          <p className="text-sm text-ink-600">A refunded fee does not take the report out of review or change the inspector&apos;s decision on it.</p>
        </div>
      )}
    </>
  );
}
