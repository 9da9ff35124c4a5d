"use client";

import { useEffect, useRef, useState } from "react";
import useSWR from "swr";
import { Alert } from "@/components/ui/alert";
import { Badge } from "@/components/ui/badge";
import { ButtonLink } from "@/components/ui/button";
import { Card } from "@/components/ui/card";
import type { FeePaymentView } from "@/lib/data/fees";
import { formatMoney } from "@/lib/payments/money";

const fetchPayment = async (url: string): Promise<FeePaymentView> => {
  const response = await fetch(url, { cache: "no-store" });
  if (!response.ok) throw new Error(`status ${response.status}`);
  return (await response.json()) as FeePaymentView;
};

const reportStatusWords: Record<string, { label: string; tone: "pass" | "caution" | "brand" | "fail" | "muted" }> = {
  awaiting_fee: { label: "Waiting for its fee", tone: "caution" },
  queued: { label: "Queued for review", tone: "brand" },
  accepted: { label: "Accepted", tone: "pass" },
  returned: { label: "Returned", tone: "fail" },
  superseded: { label: "Superseded", tone: "muted" },
};

type CancelResult = FeePaymentView & { isBeingConfirmed?: boolean };

/**
 * Polls the payment until the webhook has confirmed (or closed) it. Coming back through the
 * cancel link closes the checkout first; if the service says it was paid after all, it polls.
 */
export function PaymentStatus({ initial, isCanceled }: { initial: FeePaymentView; isCanceled: boolean }) {
  const [cancelResult, setCancelResult] = useState<CancelResult | null>(null);
  const [polls, setPolls] = useState(0);
  const cancelSent = useRef(false);
  const isWaitingForCancel = isCanceled && initial.status === "pending" && cancelResult === null;
  const isPaidAfterAll = cancelResult?.isBeingConfirmed === true;
  const shouldPoll = !isWaitingForCancel && (!isCanceled || isPaidAfterAll) && initial.status !== "paid";
  const { data } = useSWR(shouldPoll ? `/api/fees/payments/${initial.id}` : null, fetchPayment, {
    fallbackData: initial,
    refreshInterval: (latest) => (latest && latest.status === "paid" ? 0 : latest && latest.status !== "pending" && !isPaidAfterAll ? 0 : polls > 40 ? 5000 : 1500),
    onSuccess: () => setPolls((n) => n + 1),
    revalidateOnFocus: true,
  });

  useEffect(() => {
    if (!isCanceled || cancelSent.current || initial.status !== "pending") return;
    cancelSent.current = true;
    void fetch(`/api/fees/payments/${initial.id}/cancel`, { method: "POST" })
      .then((r) => (r.ok ? (r.json() as Promise<CancelResult>) : null))
      .then((p) => setCancelResult(p ?? initial))
      .catch(() => setCancelResult(initial));
  }, [isCanceled, initial]);

  const latest = shouldPoll ? (data ?? initial) : (cancelResult ?? initial);
  const payment = latest.status === "paid" ? latest : isPaidAfterAll ? { ...latest, status: "pending" as const } : latest;
  const total = formatMoney(payment.amountCents, payment.currency);
  return (
    <div className="space-y-6">
      {payment.status === "paid" ? (
        <Alert tone="success" title="Payment confirmed" live>
          {total} was received. {payment.items.length === 1 ? "The report is" : "The reports are"} now in the inspectors&apos; review queue, and a receipt is on its way to your e-mail.
        </Alert>
      ) : isWaitingForCancel ? (
        <Alert tone="info" title="Closing the checkout…" live>
          One moment.
        </Alert>
      ) : payment.status === "pending" ? (
        <Alert tone="info" title="Payment being confirmed" live>
          <p>
            {isPaidAfterAll ? "The payment service says this checkout was paid, so it was not canceled. " : "Thank you. "}
            We are waiting for the payment service to confirm {total}; this usually takes a few seconds and this page updates by itself. You can also leave: the receipt comes by e-mail.
          </p>
          {polls > 40 ? <p className="mt-1">This is taking longer than usual. Your payment is safe; check your receipts later or contact the program office.</p> : null}
        </Alert>
      ) : (
        <Alert tone="info" title={payment.status === "canceled" ? "Checkout canceled" : payment.status === "expired" ? "Checkout expired" : "Checkout not completed"} live>
          Nothing was charged. The fees are still outstanding; you can pay them from your fees page.
        </Alert>
      )}
      <Card title={`${payment.items.length} ${payment.items.length === 1 ? "report" : "reports"} · ${total}`}>
        <ul className="divide-y divide-ink-100">
          {payment.items.map((item) => {
            const status = reportStatusWords[item.reportStatus] ?? { label: item.reportStatus, tone: "muted" as const };
            return (
              <li key={item.reportId} className="flex flex-wrap items-center justify-between gap-2 py-2">
                <span>
                  <span className="font-semibold">{item.report}</span> <span className="text-sm text-ink-600">· {item.assembly}</span>
                </span>
                <span className="flex items-center gap-3">
                  <span className="tabular-nums">{formatMoney(item.amountCents, payment.currency)}</span>
                  <Badge tone={status.tone}>{status.label}</Badge>
                </span>
              </li>
            );
          })}
        </ul>
      </Card>
      <div className="flex flex-wrap gap-2">
        <ButtonLink href="/tester/fees" variant={payment.status === "paid" ? "secondary" : "primary"}>
          Back to filing fees
        </ButtonLink>
        {payment.status === "paid" ? (
          <ButtonLink href="/tester/fees/receipts" variant="secondary">
            Receipts
          </ButtonLink>
        ) : null}
      </div>
    </div>
  );
}
