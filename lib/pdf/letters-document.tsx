import { Document, Page, Text, View } from "@react-pdf/renderer";
import { renderPdf } from "./render";
import { pdfColors, pdfStyles } from "./theme";

/** One printed notice: the same wording as the e-mail, plus how to sign in without one. */
export interface LetterPage {
  /** "reminder" | "overdue" | "final" | "repair_reminder". */
  kind: string;
  headline: string;
  intro: string[];
  action: string[];
  caution?: string;
  items: { assembly: string; location: string; site: string; accountNumber: string; dueLine: string }[];
  recipientName: string;
  recipientAddress: string;
  accountNumber: string;
  /** The one-time sign-in code, printed "ABCDE-FGHJK"; null when the letter goes to "the owner or occupant" (no account to sign in to). */
  code: string | null;
  codeExpiresOn: string;
  accessUrl: string;
  testersUrl: string;
  /** Printed small at the foot, so the office can find the notice rows from a returned letter. */
  reference: string;
}

export interface LettersInput {
  programName: string;
  programAddress: string;
  programPhone: string;
  programReplyTo: string;
  /** The notice date, written out. */
  date: string;
  pages: LetterPage[];
}

const s = {
  letterhead: { borderBottomWidth: 2, borderBottomColor: pdfColors.brand, paddingBottom: 8, marginBottom: 18, flexDirection: "row" as const, justifyContent: "space-between" as const },
  programName: { fontSize: 14, lineHeight: 1.3, fontWeight: 700, color: pdfColors.brand, marginBottom: 2 },
  address: { marginBottom: 16 },
  headline: { fontSize: 15, lineHeight: 1.3, fontWeight: 700, color: pdfColors.brand, marginBottom: 10 },
  finalHeadline: { fontSize: 15, lineHeight: 1.3, fontWeight: 700, color: pdfColors.fail, marginBottom: 10 },
  paragraph: { fontSize: 10, marginBottom: 7 },
  item: { borderWidth: 1, borderColor: pdfColors.rule, borderRadius: 3, padding: 7, marginBottom: 6 },
  itemTitle: { fontSize: 10, fontWeight: 700 },
  itemLine: { fontSize: 9, color: pdfColors.ink },
  caution: { backgroundColor: "#fff7e6", borderWidth: 1, borderColor: "#e8c27a", padding: 7, color: pdfColors.caution, fontSize: 9, marginBottom: 8 },
  codeBox: { borderWidth: 1.5, borderColor: pdfColors.brand, backgroundColor: pdfColors.brandLight, borderRadius: 4, padding: 10, marginTop: 6, marginBottom: 8 },
  codeLabel: { fontSize: 8, color: pdfColors.muted, textTransform: "uppercase" as const, letterSpacing: 0.4 },
  // Large text sets its own line height: react-pdf would otherwise inherit the page's in points.
  codeValue: { fontSize: 15, lineHeight: 1.3, fontWeight: 700, letterSpacing: 0.8 },
};

function Letter({ input, page }: { input: LettersInput; page: LetterPage }) {
  return (
    <Page size="LETTER" style={pdfStyles.page}>
      <View style={s.letterhead}>
        <View>
          <Text style={s.programName}>{input.programName}</Text>
          <Text style={pdfStyles.small}>{input.programAddress}</Text>
          <Text style={pdfStyles.small}>
            {input.programPhone} · {input.programReplyTo}
          </Text>
        </View>
        <Text style={pdfStyles.small}>{input.date}</Text>
      </View>
      <View style={s.address}>
        <Text>{page.recipientName}</Text>
        <Text>{page.recipientAddress}</Text>
      </View>
      <Text style={page.kind === "final" ? s.finalHeadline : s.headline}>{page.headline}</Text>
      <Text style={s.paragraph}>Dear {page.recipientName},</Text>
      {page.intro.map((paragraph, i) => (
        <Text key={`i${i}`} style={s.paragraph}>
          {paragraph}
        </Text>
      ))}
      {page.items.map((item, i) => (
        <View key={`a${i}`} style={s.item} wrap={false}>
          <Text style={s.itemTitle}>{item.assembly}</Text>
          <Text style={s.itemLine}>Location: {item.location}</Text>
          <Text style={s.itemLine}>
            Site: {item.site} (account {item.accountNumber})
          </Text>
          <Text style={s.itemLine}>{item.dueLine}</Text>
        </View>
      ))}
      {page.action.map((paragraph, i) => (
        <Text key={`x${i}`} style={s.paragraph}>
          {paragraph}
        </Text>
      ))}
      {page.caution ? <Text style={s.caution}>{page.caution}</Text> : null}
      {page.code ? (
        <View style={s.codeBox} wrap={false}>
          <Text style={s.codeLabel}>See your assemblies online</Text>
          <Text style={pdfStyles.value}>Go to {page.accessUrl} and enter:</Text>
          <View style={{ flexDirection: "row", marginTop: 4, marginBottom: 4 }}>
            <View style={{ width: 180 }}>
              <Text style={s.codeLabel}>Account number</Text>
              <Text style={s.codeValue}>{page.accountNumber}</Text>
            </View>
            <View>
              <Text style={s.codeLabel}>One-time code</Text>
              <Text style={s.codeValue}>{page.code}</Text>
            </View>
          </View>
          <Text style={pdfStyles.small}>The code works once, until {page.codeExpiresOn}. Keep this letter private: the code opens your property&apos;s page.</Text>
        </View>
      ) : (
        <Text style={s.paragraph}>To see this property&apos;s assemblies online, call the program office at {input.programPhone} for a sign-in code.</Text>
      )}
      <Text style={s.paragraph}>Find a tester certified to work in this program: {page.testersUrl}</Text>
      <Text style={pdfStyles.small}>Questions about this notice? Call {input.programPhone} or write to {input.programReplyTo}.</Text>
      <View style={pdfStyles.footer} fixed>
        <Text>{input.programName} · official compliance notice under its cross-connection control program, not marketing</Text>
        <Text>Ref. {page.reference}</Text>
      </View>
    </Page>
  );
}

export function LettersDocument({ input }: { input: LettersInput }) {
  return (
    <Document title={`${input.programName}: notices to print, ${input.date}`} author={input.programName} creator="Zoneward" producer="Zoneward">
      {input.pages.map((page, i) => (
        <Letter key={i} input={input} page={page} />
      ))}
    </Document>
  );
}

/** All of a run's letters as one PDF, one letter per page. */
export function renderLettersPdf(input: LettersInput): Promise<Buffer> {
  return renderPdf(<LettersDocument input={input} />);
}
