import { Document, Image, Page, StyleSheet, Text, View } from "@react-pdf/renderer";
import { assemblyKindLabels, type AssemblyKind } from "@/lib/rules";
import { pdfColors } from "./theme";
import { pdfFontFamily } from "./fonts";

export interface TagLabel {
  tagNumber: string;
  kind: AssemblyKind;
  make: string;
  model: string;
  size: string;
  serial: string;
  location: string;
  addressLine1: string;
  city: string;
  programName: string;
  /** The address the QR code opens (APP_URL/a/<id>). */
  url: string;
  /** The QR code as a PNG data URL. */
  qrDataUrl: string;
}

// A Letter sheet of ten 4 × 2 in. labels (two across, five down), the common office label size.
const INCH = 72;
const LABEL_WIDTH = 4 * INCH;
const LABEL_HEIGHT = 2 * INCH;

const styles = StyleSheet.create({
  page: { fontFamily: pdfFontFamily, color: pdfColors.ink, paddingTop: 0.5 * INCH, paddingLeft: 0.16 * INCH, paddingRight: 0.16 * INCH, flexDirection: "row", flexWrap: "wrap" },
  label: { width: LABEL_WIDTH, height: LABEL_HEIGHT, padding: 9, flexDirection: "row", borderWidth: 0.5, borderColor: pdfColors.rule, borderStyle: "dashed" },
  gutter: { marginRight: 0.15 * INCH },
  qr: { width: 1.4 * INCH, height: 1.4 * INCH },
  qrBox: { alignItems: "center" },
  scan: { fontSize: 6.5, color: pdfColors.muted, marginTop: 1, textAlign: "center", width: 1.4 * INCH },
  text: { flex: 1, paddingLeft: 8 },
  program: { fontSize: 7, color: pdfColors.brand, fontWeight: 700, textTransform: "uppercase", letterSpacing: 0.4 },
  number: { fontSize: 15, fontWeight: 700, marginTop: 2 },
  kind: { fontSize: 8.5, fontWeight: 600, marginTop: 1 },
  line: { fontSize: 8, marginTop: 1.5 },
  muted: { fontSize: 7, color: pdfColors.muted, marginTop: 2 },
});

/** The tag sheet: one label per assembly, each with a QR code that opens a new test for it. */
export function TagsDocument({ labels, programName }: { labels: TagLabel[]; programName: string }) {
  return (
    <Document title={`Assembly tags (${labels.length})`} author={programName} creator="Zoneward">
      <Page size="LETTER" style={styles.page} wrap>
        {labels.map((label, index) => (
          <View key={`${label.tagNumber}-${index}`} style={index % 2 === 0 ? [styles.label, styles.gutter] : styles.label} wrap={false}>
            <View style={styles.qrBox}>
              <Image src={label.qrDataUrl} style={styles.qr} />
              <Text style={styles.scan}>Scan to start a test</Text>
            </View>
            <View style={styles.text}>
              <Text style={styles.program}>{label.programName} · backflow assembly</Text>
              <Text style={styles.number}>{label.tagNumber}</Text>
              <Text style={styles.kind}>
                {label.kind} · {assemblyKindLabels[label.kind]}
              </Text>
              <Text style={styles.line}>Serial {label.serial || "—"}</Text>
              <Text style={styles.line}>{[label.make, label.model, label.size].filter(Boolean).join(" · ") || "—"}</Text>
              <Text style={styles.muted}>
                {label.addressLine1}, {label.city}
                {label.location ? ` — ${label.location}` : ""}
              </Text>
              <Text style={styles.muted}>{label.url}</Text>
            </View>
          </View>
        ))}
      </Page>
    </Document>
  );
}
