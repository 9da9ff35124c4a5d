import { Document, Page, StyleSheet, Text, View } from "@react-pdf/renderer";
import type { ReactNode } from "react";
import { assemblyKindLabels, assemblyKinds, hazardLabels, hazards, type AssemblyKind, type Hazard, type SummaryCounts } from "@/lib/rules";
import { pdfColors, pdfStyles } from "./theme";

/** What the yearly summary PDF shows (plain data: the summary's own figures). */
export interface SummaryDocumentProps {
  programName: string;
  year: number;
  generatedOn: string;
  preparedBy: string;
  contact: string;
  rows: (SummaryCounts & { kind: AssemblyKind; hazard: Hazard })[];
  byKind: Record<AssemblyKind, SummaryCounts>;
  byHazard: Record<Hazard, SummaryCounts>;
  totals: SummaryCounts;
  columns: { key: keyof SummaryCounts; label: string }[];
  notes: string[];
}

const styles = StyleSheet.create({
  table: { marginTop: 6, borderTopWidth: 1, borderColor: pdfColors.rule },
  headRow: { flexDirection: "row", backgroundColor: pdfColors.brandLight, borderBottomWidth: 1, borderColor: pdfColors.rule },
  row: { flexDirection: "row", borderBottomWidth: 0.5, borderColor: pdfColors.rule },
  subtotal: { flexDirection: "row", borderBottomWidth: 0.5, borderColor: pdfColors.rule, backgroundColor: "#f4f6f5" },
  total: { flexDirection: "row", borderTopWidth: 1, borderBottomWidth: 1, borderColor: pdfColors.brand, backgroundColor: pdfColors.brandLight },
  labelCell: { width: 215, paddingVertical: 3, paddingHorizontal: 4 },
  hazardCell: { width: 105, paddingVertical: 3, paddingHorizontal: 4 },
  numberCell: { flex: 1, paddingVertical: 3, paddingHorizontal: 4, textAlign: "right" },
  headText: { fontSize: 7.5, fontWeight: 700, color: pdfColors.brand },
  bold: { fontWeight: 700 },
  note: { fontSize: 8, color: pdfColors.muted, marginBottom: 2 },
});

function Row({ style, label, hazard, counts, columns, isBold = false }: { style: (typeof styles)[keyof typeof styles]; label: ReactNode; hazard: ReactNode; counts: SummaryCounts; columns: SummaryDocumentProps["columns"]; isBold?: boolean }) {
  return (
    <View style={style} wrap={false}>
      <Text style={[styles.labelCell, isBold ? styles.bold : {}]}>{label}</Text>
      <Text style={[styles.hazardCell, isBold ? styles.bold : {}]}>{hazard}</Text>
      {columns.map((c) => (
        <Text key={c.key} style={[styles.numberCell, isBold ? styles.bold : {}]}>
          {counts[c.key].toLocaleString("en-US")}
        </Text>
      ))}
    </View>
  );
}

/** The yearly program summary for the state drinking-water agency, one landscape table (US Letter turned: 792 × 612 pt). */
export function SummaryDocument(props: SummaryDocumentProps) {
  const { columns } = props;
  const kindsPresent = assemblyKinds.filter((k) => props.rows.some((r) => r.kind === k));
  const hazardsPresent = hazards.filter((h) => props.rows.some((r) => r.hazard === h));
  return (
    <Document title={`${props.programName} — cross-connection control summary ${props.year}`} author={props.programName} subject={`Yearly program summary ${props.year}`} creator="Zoneward">
      <Page size={[792, 612]} style={pdfStyles.page}>
        <Text style={pdfStyles.h1}>Cross-connection control program summary, {props.year}</Text>
        <Text style={{ fontSize: 11, marginTop: 6 }}>{props.programName}</Text>
        <Text style={[pdfStyles.small, { marginTop: 2 }]}>
          Prepared {props.generatedOn} by {props.preparedBy} · {props.contact}
        </Text>

        <Text style={pdfStyles.h2}>Backflow prevention assemblies by kind and degree of hazard</Text>
        <View style={styles.table}>
          <View style={styles.headRow} fixed>
            <Text style={[styles.labelCell, styles.headText]}>Assembly kind</Text>
            <Text style={[styles.hazardCell, styles.headText]}>Degree of hazard</Text>
            {columns.map((c) => (
              <Text key={c.key} style={[styles.numberCell, styles.headText]}>
                {c.label}
              </Text>
            ))}
          </View>
          {props.rows.map((r) => (
            <Row key={`${r.kind}-${r.hazard}`} style={styles.row} label={`${assemblyKindLabels[r.kind]} (${r.kind})`} hazard={hazardLabels[r.hazard]} counts={r} columns={columns} />
          ))}
          {props.rows.length === 0 ? (
            <View style={styles.row}>
              <Text style={[styles.labelCell, { width: 400 }]}>No assemblies in the inventory for this year.</Text>
            </View>
          ) : null}
          {kindsPresent.map((k) => (
            <Row key={`kind-${k}`} style={styles.subtotal} label={`${assemblyKindLabels[k]} (${k})`} hazard="All hazards" counts={props.byKind[k]} columns={columns} />
          ))}
          {hazardsPresent.map((h) => (
            <Row key={`hazard-${h}`} style={styles.subtotal} label="All kinds" hazard={hazardLabels[h]} counts={props.byHazard[h]} columns={columns} />
          ))}
          <Row style={styles.total} label="All assemblies" hazard="All hazards" counts={props.totals} columns={columns} isBold />
        </View>

        <Text style={pdfStyles.h2}>How the figures are counted</Text>
        {props.notes.map((note) => (
          <Text key={note} style={styles.note}>
            • {note}
          </Text>
        ))}

        <View style={pdfStyles.footer} fixed>
          <Text>
            {props.programName} · program summary {props.year} · generated by Zoneward on {props.generatedOn}
          </Text>
          <Text render={({ pageNumber, totalPages }) => `Page ${pageNumber} of ${totalPages}`} />
        </View>
      </Page>
    </Document>
  );
}
