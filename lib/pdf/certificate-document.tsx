import { Document, Image, Page, Text, View } from "@react-pdf/renderer";
import QRCode from "qrcode";
import { renderPdf } from "./render";
import { pdfColors, pdfStyles } from "./theme";

/** What a compliance certificate prints (plain strings, prepared by lib/data). */
export interface CertificateInput {
  codeGrouped: string;
  verifyUrl: string;
  isSuperseded: boolean;
  programName: string;
  programPhone: string;
  programAddress: string;
  programEmail: string;
  site: { name: string; address: string; accountNumber: string };
  assembly: { kindLabel: string; make: string; model: string; size: string; serial: string; location: string };
  test: { reportNumber: string; testedOnWords: string; resultWords: string; acceptedOnWords: string | null; testerName: string; testerCompany: string | null; certifyingBody: string; certificationNumber: string };
  nextDueOnWords: string;
  issuedOnWords: string;
}

const s = {
  page: { ...pdfStyles.page, paddingTop: 44, paddingHorizontal: 48, fontSize: 10.5 },
  frame: { borderWidth: 2, borderColor: pdfColors.brand, borderRadius: 6, padding: 22, flexGrow: 1 },
  program: { fontSize: 11, fontWeight: 700, color: pdfColors.brand, letterSpacing: 0.5, textTransform: "uppercase" as const },
  // Large text sets its own line height: react-pdf would otherwise inherit the page's in points.
  title: { fontSize: 20, lineHeight: 1.25, fontWeight: 700, color: pdfColors.ink, marginTop: 6, marginBottom: 8 },
  lead: { fontSize: 11, lineHeight: 1.4, color: pdfColors.ink, marginBottom: 14 },
  section: { marginBottom: 12 },
  sectionTitle: { ...pdfStyles.label, marginBottom: 3 },
  grid: { flexDirection: "row" as const, flexWrap: "wrap" as const },
  cell: { width: "50%", marginBottom: 6, paddingRight: 8 },
  value: { fontSize: 11 },
  strong: { fontSize: 11, fontWeight: 700 },
  due: { backgroundColor: pdfColors.passBg, borderRadius: 4, padding: 10, marginBottom: 14, flexDirection: "row" as const, justifyContent: "space-between" as const },
  verify: { flexDirection: "row" as const, borderTopWidth: 1, borderTopColor: pdfColors.rule, paddingTop: 12, marginTop: 4 },
  code: { fontSize: 18, lineHeight: 1.3, fontWeight: 700, letterSpacing: 1.5, color: pdfColors.brand, marginTop: 2, marginBottom: 6 },
  replaced: { backgroundColor: pdfColors.failBg, color: pdfColors.fail, fontWeight: 700, fontSize: 12, lineHeight: 1.3, padding: 8, marginBottom: 12, textAlign: "center" as const },
};

function Field({ label, value }: { label: string; value: string }) {
  return (
    <View style={s.cell}>
      <Text style={pdfStyles.label}>{label}</Text>
      <Text style={s.value}>{value || "not recorded"}</Text>
    </View>
  );
}

export function CertificateDocument({ input, qrDataUrl }: { input: CertificateInput; qrDataUrl: string }) {
  const a = input.assembly;
  const t = input.test;
  return (
    <Document title={`Compliance certificate ${input.codeGrouped}`} author={input.programName} creator="Zoneward" producer="Zoneward">
      <Page size="LETTER" style={s.page}>
        <View style={s.frame}>
          <Text style={s.program}>{input.programName}</Text>
          <Text style={s.title}>Certificate of backflow assembly test compliance</Text>
          {input.isSuperseded ? <Text style={s.replaced}>REPLACED BY A NEWER CERTIFICATE: NOT VALID AS PROOF OF COMPLIANCE</Text> : null}
          <Text style={s.lead}>
            The backflow prevention assembly below passed its field test on {t.testedOnWords}. The test report was reviewed and accepted by {input.programName}
            {t.acceptedOnWords ? ` on ${t.acceptedOnWords}` : ""}.
          </Text>
          <View style={s.section}>
            <Text style={s.sectionTitle}>Site</Text>
            <Text style={s.strong}>{input.site.name}</Text>
            <Text style={s.value}>
              {input.site.address} · account {input.site.accountNumber}
            </Text>
          </View>
          <View style={s.section}>
            <Text style={s.sectionTitle}>Assembly</Text>
            <View style={s.grid}>
              <Field label="Kind" value={a.kindLabel} />
              <Field label="Location" value={a.location} />
              <Field label="Make and model" value={[a.make, a.model].filter(Boolean).join(" ")} />
              <Field label="Size" value={a.size} />
              <Field label="Serial number" value={a.serial} />
            </View>
          </View>
          <View style={s.section}>
            <Text style={s.sectionTitle}>Test</Text>
            <View style={s.grid}>
              <Field label="Test date" value={t.testedOnWords} />
              <Field label="Result" value={t.resultWords} />
              <Field label="Tester" value={[t.testerName, t.testerCompany].filter(Boolean).join(", ")} />
              <Field label="Tester's certificate" value={[t.certificationNumber, t.certifyingBody].filter(Boolean).join(", ")} />
              <Field label="Report number" value={t.reportNumber} />
            </View>
          </View>
          <View style={s.due}>
            <Text style={s.strong}>Next test due by</Text>
            <Text style={s.strong}>{input.nextDueOnWords}</Text>
          </View>
          <View style={s.verify}>
            <Image src={qrDataUrl} style={{ width: 96, height: 96, marginRight: 14 }} />
            <View style={{ flex: 1 }}>
              <Text style={pdfStyles.label}>Verification code</Text>
              <Text style={s.code}>{input.codeGrouped}</Text>
              <Text style={s.value}>Scan the QR code, or open the address below, to check that this certificate is genuine and still current:</Text>
              <Text style={{ ...s.value, color: pdfColors.brand }}>{input.verifyUrl}</Text>
              <Text style={{ ...pdfStyles.small, marginTop: 4 }}>A later failed test, a missed due date or a re-issued certificate shows there.</Text>
            </View>
          </View>
        </View>
        <View style={{ ...pdfStyles.footer, flexDirection: "column", bottom: 16 }} fixed>
          <Text>
            Issued {input.issuedOnWords} by {input.programName} · {input.programPhone} · {input.programEmail}
          </Text>
          <Text>Field tests are graded against published minimums; local codes, the assembly maker&apos;s instructions and licensed practice govern.</Text>
        </View>
      </Page>
    </Document>
  );
}

/** The certificate as a one-page PDF, with a QR code of its verification address. */
export async function renderCertificatePdf(input: CertificateInput): Promise<Buffer> {
  const qrDataUrl = await QRCode.toDataURL(input.verifyUrl, { errorCorrectionLevel: "M", margin: 1, width: 300, color: { dark: "#0d434a", light: "#ffffff" } });
  return renderPdf(<CertificateDocument input={input} qrDataUrl={qrDataUrl} />);
}
