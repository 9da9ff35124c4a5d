import { Button, Section, Text } from "@react-email/components";
import { buttonStyle, EmailLayout, smallStyle, textStyle } from "./components/email-layout";

export interface FeeReceiptLine {
  /** e.g. "QV-2026-000123" or "QV-2026-000123 rev. 2". */
  report: string;
  assembly: string;
  tester: string;
  amount: string;
  /** False when the fee had been settled otherwise and this amount is being refunded. */
  isApplied: boolean;
}

export interface FeeReceiptEmailProps {
  payerName: string;
  programName: string;
  programPhone?: string;
  replyTo?: string;
  receiptNumber: string;
  /** YYYY-MM-DD. */
  paidAt: string;
  total: string;
  paymentReference: string;
  lines: FeeReceiptLine[];
  receiptsUrl: string;
}

export function subjectOfFeeReceipt({ programName, receiptNumber }: Pick<FeeReceiptEmailProps, "programName" | "receiptNumber">): string {
  return `Receipt ${receiptNumber}: filing fees paid to ${programName}`;
}

/** The receipt for one payment of filing fees: what was paid, for which reports, and what happens next. */
export default function FeeReceiptEmail({ payerName, programName, programPhone, replyTo, receiptNumber, paidAt, total, paymentReference, lines, receiptsUrl }: FeeReceiptEmailProps) {
  const unapplied = lines.filter((l) => !l.isApplied);
  const many = lines.length > 1;
  return (
    <EmailLayout
      preview={`${total} paid for ${lines.length} ${many ? "reports" : "report"}`}
      senderName={programName}
      footer={`${programName} sent this receipt because you paid filing fees in its cross-connection control program.${replyTo ? ` Reply to this message to reach the program office (${replyTo}).` : ""}`}
    >
      <Text style={textStyle}>Hello {payerName},</Text>
      <Text style={textStyle}>
        We received your payment of {total}. {many ? "The reports below are" : "The report below is"} now in the inspectors&apos; review queue.
      </Text>
      <Section>
        <Text style={{ ...textStyle, fontWeight: 600, margin: "0 0 6px" }}>Receipt {receiptNumber}</Text>
        <Text style={smallStyle}>
          Paid on {paidAt}
          {paymentReference ? ` · payment reference ${paymentReference}` : ""}
        </Text>
        {lines.map((line) => (
          <Text key={line.report} style={{ ...smallStyle, color: "#1c2423" }}>
            {line.report} · {line.assembly} · filed by {line.tester} · {line.amount}
            {line.isApplied ? "" : " (already settled: this amount is being refunded)"}
          </Text>
        ))}
        <Text style={{ ...textStyle, fontWeight: 600 }}>Total paid: {total}</Text>
      </Section>
      {unapplied.length > 0 ? (
        <Text style={textStyle}>
          {unapplied.length === 1 ? "One fee" : `${unapplied.length} fees`} in this payment had already been settled, so the amount is being refunded to the card you paid with.
        </Text>
      ) : null}
      <Button href={receiptsUrl} style={buttonStyle}>
        See your receipts
      </Button>
      {programPhone ? <Text style={smallStyle}>Questions about fees: call the program office at {programPhone}.</Text> : null}
    </EmailLayout>
  );
}
