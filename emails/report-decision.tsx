import { Button, Link, Section, Text } from "@react-email/components";
import { buttonStyle, EmailLayout, smallStyle, textStyle } from "./components/email-layout";

export interface DecidedReportLine {
  reportNumber: string;
  revision: number;
  /** e.g. "RP, serial TA123456, meter vault at the street". */
  assembly: string;
  /** Site name and service address. */
  site: string;
  testedOn: string;
  url: string;
  certificateCode?: string | null;
}

export interface ReportDecisionEmailProps {
  testerName: string;
  programName: string;
  programPhone?: string;
  replyTo?: string;
  decision: "accepted" | "returned";
  reports: DecidedReportLine[];
  /** Returned: the reasons picked and written by the inspector. */
  reasons?: string[];
  note?: string | null;
  inspectorName: string;
}

const numberOf = (r: DecidedReportLine) => (r.revision > 1 ? `${r.reportNumber} (revision ${r.revision})` : r.reportNumber);

export function subjectOfReportDecision({ programName, decision, reports }: Pick<ReportDecisionEmailProps, "programName" | "decision" | "reports">): string {
  if (reports.length === 1) {
    const only = reports[0]!;
    return decision === "accepted" ? `${programName} accepted report ${numberOf(only)}` : `${programName} returned report ${numberOf(only)} for correction`;
  }
  return decision === "accepted" ? `${programName} accepted ${reports.length} of your reports` : `${programName} returned ${reports.length} of your reports for correction`;
}

/** The inspector's decision on one or more of a tester's reports, with what to do next. */
export default function ReportDecisionEmail({ testerName, programName, programPhone, replyTo, decision, reports, reasons = [], note, inspectorName }: ReportDecisionEmailProps) {
  const isAccepted = decision === "accepted";
  const many = reports.length > 1;
  return (
    <EmailLayout
      preview={subjectOfReportDecision({ programName, decision, reports })}
      senderName={programName}
      footer={`${programName} sent this message because you filed ${many ? "these field-test reports" : "this field-test report"} in its cross-connection control program.${replyTo ? ` Reply to this message to reach the program office (${replyTo}).` : ""}`}
    >
      <Text style={textStyle}>Hello {testerName},</Text>
      <Text style={textStyle}>
        {isAccepted
          ? `${inspectorName} accepted ${many ? `${reports.length} of your reports` : "your report"}. ${many ? "They are" : "It is"} now part of the assembly's record.`
          : `${inspectorName} returned ${many ? "these reports" : "your report"} for correction. Please correct ${many ? "them" : "it"} and file again; the test itself does not need repeating unless the reasons say so.`}
      </Text>
      {!isAccepted && reasons.length > 0 ? (
        <Section>
          <Text style={{ ...textStyle, fontWeight: 600, margin: "0 0 6px" }}>{reasons.length === 1 ? "Reason" : "Reasons"}</Text>
          {reasons.map((reason) => (
            <Text key={reason} style={{ ...textStyle, margin: "0 0 6px" }}>
              • {reason}
            </Text>
          ))}
        </Section>
      ) : null}
      {note ? <Text style={textStyle}>Note from the inspector: {note}</Text> : null}
      <Section>
        {reports.map((r) => (
          <Text key={`${r.reportNumber}-${r.revision}`} style={smallStyle}>
            <Link href={r.url}>{numberOf(r)}</Link> · tested {r.testedOn} · {r.assembly} · {r.site}
            {r.certificateCode ? ` · compliance certificate ${r.certificateCode}` : ""}
          </Text>
        ))}
      </Section>
      {reports.length === 1 ? (
        <Button href={reports[0]!.url} style={buttonStyle}>
          {isAccepted ? "Open the report" : "Correct the report"}
        </Button>
      ) : null}
      {programPhone ? <Text style={smallStyle}>Questions: call the program office at {programPhone}.</Text> : null}
    </EmailLayout>
  );
}
