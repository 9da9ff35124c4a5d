import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { PageHeader } from "@/components/ui/card";
import { requirePermission } from "@/lib/auth/guards";
import { getFeePayment } from "@/lib/data/fees";
import { NotFoundError } from "@/lib/errors";
import { PaymentStatus } from "../_components/payment-status";

export const metadata: Metadata = { title: "Payment" };

/**
 * Where the payment service sends the payer back. Coming back proves nothing: the page shows
 * the payment as being confirmed until the service's signed webhook has been applied.
 */
export default async function FeeReturnPage({ searchParams }: { searchParams: Promise<Record<string, string | undefined>> }) {
  const actor = await requirePermission("fees.pay");
  const params = await searchParams;
  const id = Number(params.payment);
  if (!Number.isSafeInteger(id) || id <= 0) notFound();
  const payment = await getFeePayment(actor, id).catch((error: unknown) => {
    if (error instanceof NotFoundError) notFound();
    throw error;
  });
  return (
    <>
      <PageHeader title={`Payment ${payment.receiptNumber}`} description={payment.programName} />
      <PaymentStatus initial={payment} isCanceled={params.canceled === "1"} />
    </>
  );
}
