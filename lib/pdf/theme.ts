import { StyleSheet } from "@react-pdf/renderer";
import { pdfFontFamily } from "./fonts";

/** Colours and text styles shared by every Zoneward PDF (reports, certificates, letters, summaries). */
export const pdfColors = {
  brand: "#0e5a63",
  brandLight: "#eef7f7",
  ink: "#1c2423",
  muted: "#5b6664",
  rule: "#d9e0dd",
  pass: "#17602f",
  passBg: "#ecf7ef",
  fail: "#912018",
  failBg: "#fcefee",
  caution: "#7f4900",
};

export const pdfStyles = StyleSheet.create({
  page: { fontFamily: pdfFontFamily, fontSize: 9.5, color: pdfColors.ink, paddingTop: 36, paddingBottom: 48, paddingHorizontal: 40 },
  // No lineHeight on the page: react-pdf 4.9 then drops fixed footers (page numbers) entirely.
  body: { lineHeight: 1.35 },
  h1: { fontSize: 17, fontWeight: 700, color: pdfColors.brand },
  h2: { fontSize: 11, fontWeight: 700, color: pdfColors.brand, marginTop: 12, marginBottom: 4 },
  small: { fontSize: 8, color: pdfColors.muted },
  label: { fontSize: 7.5, color: pdfColors.muted, textTransform: "uppercase", letterSpacing: 0.4 },
  value: { fontSize: 10 },
  row: { flexDirection: "row" },
  footer: { position: "absolute", bottom: 22, left: 40, right: 40, fontSize: 7.5, color: pdfColors.muted, flexDirection: "row", justifyContent: "space-between" },
});
