import { Document, Page, StyleSheet, Text, View } from "@react-pdf/renderer";
import { formatMoney } from "@/lib/payments/money";
import { pdfColors, pdfStyles } from "./theme";

/** What the statement shows: plain data gathered by the data layer. */
export interface StatementLine {
  date: string;
  reference: string;
  description: string;
  who: string;
  amountCents: number;
  note?: string;
}

export interface StatementSection {
  programId: number;
  programName: string;
  programAddress: string;
  programPhone: string;
  currency: string;
  charged: StatementLine[];
  payments: StatementLine[];
  refunds: StatementLine[];
  waivers: StatementLine[];
  outstanding: StatementLine[];
  totals: { charged: number; paid: number; refunded: number; waived: number; outstanding: number };
}

export interface CompanyStatement {
  company: { id: number; name: string; address: string; email: string; phone: string };
  month: string;
  monthLabel: string;
  generatedOn: string;
  sections: StatementSection[];
  /** True when the actor sees only one program's part (a program admin). */
  isProgramView: boolean;
}

const styles = StyleSheet.create({
  header: { flexDirection: "row", justifyContent: "space-between", marginBottom: 10 },
  box: { borderWidth: 0.75, borderColor: pdfColors.rule, borderRadius: 3, padding: 8, marginTop: 6 },
  summaryRow: { flexDirection: "row", justifyContent: "space-between", paddingVertical: 1.5 },
  summaryTotal: { flexDirection: "row", justifyContent: "space-between", paddingTop: 3, marginTop: 2, borderTopWidth: 0.75, borderColor: pdfColors.brand },
  table: { marginTop: 3, borderTopWidth: 0.75, borderColor: pdfColors.rule },
  headRow: { flexDirection: "row", backgroundColor: pdfColors.brandLight, borderBottomWidth: 0.75, borderColor: pdfColors.rule },
  row: { flexDirection: "row", borderBottomWidth: 0.5, borderColor: pdfColors.rule },
  totalRow: { flexDirection: "row", borderBottomWidth: 0.75, borderColor: pdfColors.brand },
  date: { width: 62, padding: 3 },
  reference: { width: 110, padding: 3 },
  description: { flex: 1, padding: 3 },
  who: { width: 110, padding: 3 },
  note: { width: 58, padding: 3 },
  amount: { width: 64, padding: 3, textAlign: "right" },
  head: { fontSize: 7.5, fontWeight: 700, color: pdfColors.brand },
  bold: { fontWeight: 700 },
  empty: { padding: 3, color: pdfColors.muted },
  caveat: { fontSize: 8, color: pdfColors.muted, marginTop: 4 },
});

function LineTable({ title, lines, currency, whoLabel, showNote = false }: { title: string; lines: StatementLine[]; currency: string; whoLabel: string; showNote?: boolean }) {
  const total = lines.reduce((sum, l) => sum + l.amountCents, 0);
  return (
    <View>
      <Text style={pdfStyles.h2}>{title}</Text>
      <View style={styles.table}>
        <View style={styles.headRow} fixed>
          <Text style={[styles.date, styles.head]}>Date</Text>
          <Text style={[styles.reference, styles.head]}>Reference</Text>
          <Text style={[styles.description, styles.head]}>Details</Text>
          <Text style={[styles.who, styles.head]}>{whoLabel}</Text>
          {showNote ? <Text style={[styles.note, styles.head]}>Fee now</Text> : null}
          <Text style={[styles.amount, styles.head]}>Amount</Text>
        </View>
        {lines.length === 0 ? <Text style={styles.empty}>None.</Text> : null}
        {lines.map((l, i) => (
          <View key={`${l.reference}-${i}`} style={styles.row} wrap={false}>
            <Text style={styles.date}>{l.date}</Text>
            <Text style={styles.reference}>{l.reference}</Text>
            <Text style={styles.description}>{l.description}</Text>
            <Text style={styles.who}>{l.who}</Text>
            {showNote ? <Text style={styles.note}>{l.note ?? ""}</Text> : null}
            <Text style={styles.amount}>{formatMoney(l.amountCents, currency)}</Text>
          </View>
        ))}
        {lines.length > 0 ? (
          <View style={styles.totalRow} wrap={false}>
            <Text style={[styles.description, styles.bold]}>
              Total ({lines.length} {lines.length === 1 ? "line" : "lines"})
            </Text>
            <Text style={[styles.amount, styles.bold]}>{formatMoney(total, currency)}</Text>
          </View>
        ) : null}
      </View>
    </View>
  );
}

function Section({ section, monthLabel }: { section: StatementSection; monthLabel: string }) {
  const c = section.currency;
  const t = section.totals;
  return (
    <View>
      <Text style={[pdfStyles.h2, { fontSize: 13, marginTop: 14 }]}>{section.programName}</Text>
      <Text style={pdfStyles.small}>
        {[section.programAddress, section.programPhone].filter(Boolean).join(" · ")} · amounts in {c}
      </Text>
      <View style={styles.box} wrap={false}>
        <View style={styles.summaryRow}>
          <Text>Filing fees charged in {monthLabel}</Text>
          <Text>{formatMoney(t.charged, c)}</Text>
        </View>
        <View style={styles.summaryRow}>
          <Text>Payments received in {monthLabel}</Text>
          <Text>{formatMoney(t.paid, c)}</Text>
        </View>
        <View style={styles.summaryRow}>
          <Text>Refunds made in {monthLabel}</Text>
          <Text>{formatMoney(t.refunded, c)}</Text>
        </View>
        <View style={styles.summaryRow}>
          <Text>Fees waived in {monthLabel}</Text>
          <Text>{formatMoney(t.waived, c)}</Text>
        </View>
        <View style={styles.summaryTotal}>
          <Text style={styles.bold}>Outstanding now (all months)</Text>
          <Text style={styles.bold}>{formatMoney(t.outstanding, c)}</Text>
        </View>
      </View>
      <LineTable title="Fees charged" lines={section.charged} currency={c} whoLabel="Tester" showNote />
      <LineTable title="Payments received" lines={section.payments} currency={c} whoLabel="Paid by" />
      {section.refunds.length ? <LineTable title="Refunds" lines={section.refunds} currency={c} whoLabel="Tester" /> : null}
      {section.waivers.length ? <LineTable title="Fees waived" lines={section.waivers} currency={c} whoLabel="Tester" /> : null}
      <LineTable title="Outstanding fees" lines={section.outstanding} currency={c} whoLabel="Tester" />
    </View>
  );
}

/** The monthly statement of a testing company's filing fees, one section per program. */
export function StatementDocument({ statement }: { statement: CompanyStatement }) {
  const { company } = statement;
  return (
    <Document title={`Filing fee statement, ${company.name}, ${statement.monthLabel}`} author="Zoneward" subject="Monthly filing fee statement" creator="Zoneward">
      <Page size="LETTER" style={pdfStyles.page}>
        <View style={styles.header}>
          <View>
            <Text style={pdfStyles.h1}>Filing fee statement</Text>
            <Text style={{ fontSize: 11, marginTop: 6 }}>{statement.monthLabel}</Text>
          </View>
          <View style={{ alignItems: "flex-end", maxWidth: 240 }}>
            <Text style={styles.bold}>{company.name}</Text>
            {company.address ? <Text>{company.address}</Text> : null}
            {company.email ? <Text>{company.email}</Text> : null}
            {company.phone ? <Text>{company.phone}</Text> : null}
          </View>
        </View>
        <Text style={pdfStyles.small}>
          Prepared {statement.generatedOn}. Each program&apos;s month runs in that program&apos;s own time zone. Fees are fixed when a report is filed; a later change of a program&apos;s fee does not change them.
          {statement.isProgramView ? " This copy shows one program's part of the company's statement." : ""}
        </Text>
        {statement.sections.length === 0 ? <Text style={{ marginTop: 16 }}>No filing fees were charged to this company&apos;s testers.</Text> : null}
        {statement.sections.map((s) => (
          <Section key={s.programId} section={s} monthLabel={statement.monthLabel} />
        ))}
        <Text style={styles.caveat}>A refund returns the fee; it does not withdraw the report or change the inspector&apos;s decision on it.</Text>
        <View style={pdfStyles.footer} fixed>
          <Text>
            {company.name} · {statement.monthLabel}
          </Text>
          <Text render={({ pageNumber, totalPages }) => `Page ${pageNumber} of ${totalPages}`} />
        </View>
      </Page>
    </Document>
  );
}
