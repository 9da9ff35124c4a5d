import { Document, Page, StyleSheet, Text, View } from "@react-pdf/renderer";
import type { ReactNode } from "react";
import type { ReportDetail } from "@/lib/data/report-detail";
import { fieldOfRule, readingFieldsFor } from "@/lib/forms/readings";
import { actionLabels, componentLabels, partLabels, type RepairAction, type RepairComponent, type RepairPart } from "@/lib/forms/repairs";
import { describeObserved, describeRequired } from "@/lib/forms/report-display";
import { describeOutcome, reportStatusLabels } from "@/lib/forms/report-status";
import { installationLabels, reasonLabels, type TestReason } from "@/lib/forms/report-options";
import { assemblyKindLabels, defaultRuleSet, fieldLabels, formatPsid, formatReading, hazardLabels, psidToKpa, type FieldTestField, type FieldTestInput, type Hazard } from "@/lib/rules";
import type { DisplayPhase } from "@/lib/reports/grade-storage";
import { pdfColors, pdfStyles } from "./theme";

export interface ReportDocumentProps {
  report: ReportDetail;
  program: { name: string; phone: string; mailingAddress: string; contactEmail: string };
  /** Printed on the document, e.g. 2026-12-01. */
  generatedOn: string;
}

const styles = StyleSheet.create({
  header: { flexDirection: "row", justifyContent: "space-between", borderBottomWidth: 2, borderColor: pdfColors.brand, paddingBottom: 6 },
  headerLeft: { flex: 1, paddingRight: 12 },
  numberBox: { width: 170, alignItems: "flex-end" },
  sourceList: { marginTop: 2 },
  sourceItem: { flexDirection: "row", fontSize: 7, color: pdfColors.muted, marginBottom: 1 },
  sourceNumber: { width: 14 },
  reportNumber: { fontSize: 13, fontWeight: 700 },
  banner: { marginTop: 8, paddingVertical: 6, paddingHorizontal: 10, borderRadius: 3, flexDirection: "row", justifyContent: "space-between", alignItems: "center" },
  bannerText: { fontSize: 14, fontWeight: 700 },
  columns: { flexDirection: "row", marginTop: 6 },
  column: { flex: 1, paddingRight: 10 },
  section: { fontSize: 10, fontWeight: 700, color: pdfColors.brand, marginTop: 9, marginBottom: 3, borderBottomWidth: 0.5, borderColor: pdfColors.rule, paddingBottom: 1 },
  pair: { flexDirection: "row", marginBottom: 1.5 },
  pairLabel: { width: 92, color: pdfColors.muted, fontSize: 8.5 },
  pairValue: { flex: 1, fontSize: 9 },
  table: { borderTopWidth: 0.75, borderColor: pdfColors.rule },
  headRow: { flexDirection: "row", backgroundColor: pdfColors.brandLight, borderBottomWidth: 0.75, borderColor: pdfColors.rule },
  row: { borderBottomWidth: 0.5, borderColor: pdfColors.rule, paddingVertical: 2.5 },
  rowMain: { flexDirection: "row" },
  cellCheck: { width: "36%", paddingHorizontal: 3 },
  cellValue: { width: "18%", paddingHorizontal: 3 },
  cellRequired: { width: "34%", paddingHorizontal: 3 },
  cellResult: { width: "12%", paddingHorizontal: 3, fontWeight: 700 },
  headText: { fontSize: 7.5, fontWeight: 700, color: pdfColors.brand, paddingVertical: 2.5 },
  phaseOutcome: { marginTop: 3, fontSize: 9, fontWeight: 700 },
  note: { fontSize: 8, color: pdfColors.muted, marginTop: 2 },
  attest: { marginTop: 4, padding: 6, borderWidth: 0.75, borderColor: pdfColors.rule, borderRadius: 3 },
  caution: { marginTop: 3, fontSize: 7.5, color: pdfColors.caution },
});

function Pair({ label, children }: { label: string; children: ReactNode }) {
  return (
    <View style={styles.pair}>
      <Text style={styles.pairLabel}>{label}</Text>
      <Text style={styles.pairValue}>{children}</Text>
    </View>
  );
}

const yesNo = (value: boolean | null | undefined, yes = "Yes", no = "No") => (value === true ? yes : value === false ? no : "Not recorded");

function recordedValue(input: FieldTestInput, field: FieldTestField, unit: "psid" | "kPa"): string {
  const value = input[field];
  if (value === null) return "Did not open";
  if (typeof value === "boolean") return value ? "Yes" : "No";
  if (typeof value !== "number") return "—";
  return field === "airGapInches" || field === "supplyPipeDiameterInches" ? `${value} in.` : formatReading(value, unit);
}

function PhaseTable({ title, phase, input, unit, kind, sourceNumber }: { title: string; phase: DisplayPhase; input: FieldTestInput; unit: "psid" | "kPa"; kind: ReportDetail["assembly"]["kind"]; sourceNumber: (source: string) => number }) {
  // Readings the procedure records but no rule grades (e.g. an RP's check #2 differential).
  const extras = readingFieldsFor(kind, defaultRuleSet)
    .map((spec) => spec.field)
    .filter((field) => input[field] !== undefined && !phase.findings.some((f) => fieldOfRule[f.rule] === field));
  const outcomeWord = phase.outcome === "pass" ? "Pass" : phase.outcome === "fail" ? "Fail" : "Incomplete";
  return (
    <View wrap={false}>
      <Text style={styles.section}>{title}</Text>
      <View style={styles.table}>
        <View style={[styles.headRow, styles.rowMain]}>
          <Text style={[styles.cellCheck, styles.headText]}>Check</Text>
          <Text style={[styles.cellValue, styles.headText]}>Recorded</Text>
          <Text style={[styles.cellRequired, styles.headText]}>Held to</Text>
          <Text style={[styles.cellResult, styles.headText]}>Result</Text>
        </View>
        {phase.findings.map((finding, index) => (
          <View key={`${finding.rule}-${index}`} style={styles.row}>
            <View style={styles.rowMain}>
              <Text style={styles.cellCheck}>{finding.label}</Text>
              <Text style={styles.cellValue}>{describeObserved(finding, unit)}</Text>
              <Text style={styles.cellRequired}>
                {describeRequired(finding.required)}
                {finding.source ? ` [${sourceNumber(finding.source)}]` : ""}
              </Text>
              <Text style={[styles.cellResult, { color: finding.passed ? pdfColors.pass : pdfColors.fail }]}>{finding.passed ? "Pass" : "Fail"}</Text>
            </View>
          </View>
        ))}
        {extras.map((field) => (
          <View key={field} style={styles.row}>
            <View style={styles.rowMain}>
              <Text style={styles.cellCheck}>{fieldLabels[field]}</Text>
              <Text style={styles.cellValue}>{recordedValue(input, field, unit)}</Text>
              <Text style={styles.cellRequired}>Recorded; not graded by this rule set</Text>
              <Text style={styles.cellResult}>—</Text>
            </View>
          </View>
        ))}
      </View>
      <Text style={[styles.phaseOutcome, { color: phase.outcome === "pass" ? pdfColors.pass : pdfColors.fail }]}>
        {title}: {outcomeWord}
        {phase.missing.length ? ` (missing: ${phase.missing.map((m) => fieldLabels[m as FieldTestField] ?? m).join(", ")})` : ""}
      </Text>
    </View>
  );
}

function linePressureText(psi: number | null, unit: "psid" | "kPa"): string {
  if (psi === null) return "Not recorded";
  return unit === "kPa" ? `${Math.round(psidToKpa(psi))} kPa (${formatPsid(psi)} psi)` : `${formatPsid(psi)} psi`;
}

const pageStyle = { ...pdfStyles.page, paddingTop: 30, paddingHorizontal: 36 };

/**
 * The field-test report as a document: the site, the assembly, the tester and kit, every
 * reading with the minimum it was held to and its source, repairs and the retest, the
 * attestation, the report number and the verification code. One or two Letter pages.
 */
export function ReportDocument({ report, program, generatedOn }: ReportDocumentProps) {
  const a = report.assembly;
  const outcome = describeOutcome(report);
  const isPass = report.finalOutcome === "pass";
  const unit = report.unit;
  const isAirGap = a.kind === "AG";
  const title = `Backflow assembly field test report ${report.reportNumber}`;
  // Each published source once, numbered in order of first use; the tables cite the numbers.
  const sources: string[] = [];
  for (const finding of [...report.grade.initial.findings, ...(report.grade.retest?.findings ?? [])]) if (finding.source && !sources.includes(finding.source)) sources.push(finding.source);
  const sourceNumber = (source: string) => sources.indexOf(source) + 1;
  return (
    <Document title={title} author={program.name} subject={`${a.kind} ${a.serial} at ${a.address}`} creator="Zoneward">
      <Page size="LETTER" style={pageStyle}>
        <View style={styles.header}>
          <View style={styles.headerLeft}>
            <Text style={[pdfStyles.h1, { lineHeight: 1.2 }]}>{program.name}</Text>
            <Text style={{ fontSize: 11, fontWeight: 600, marginTop: 2 }}>Backflow prevention assembly field test report</Text>
            <Text style={pdfStyles.small}>{[program.mailingAddress, program.phone, program.contactEmail].filter(Boolean).join(" · ")}</Text>
          </View>
          <View style={styles.numberBox}>
            <Text style={pdfStyles.label}>Report number</Text>
            <Text style={styles.reportNumber}>
              {report.reportNumber}
              {report.revision > 1 ? ` rev. ${report.revision}` : ""}
            </Text>
            <Text style={pdfStyles.small}>Status: {reportStatusLabels[report.status]}</Text>
            <Text style={pdfStyles.small}>Verification code: {report.verificationCode}</Text>
          </View>
        </View>

        <View style={[styles.banner, { backgroundColor: isPass ? pdfColors.passBg : pdfColors.failBg }]}>
          <Text style={[styles.bannerText, { color: isPass ? pdfColors.pass : pdfColors.fail }]}>Result: {outcome}</Text>
          <Text style={{ fontSize: 9.5 }}>
            Tested {report.testedAt} · {reasonLabels[report.reason as TestReason] ?? report.reason}
          </Text>
        </View>
        {report.supersedesId ? <Text style={styles.note}>This revision corrects revision {report.revision - 1} of the same report, which the program returned.</Text> : null}
        {report.amendsId ? <Text style={styles.note}>This report amends an earlier accepted report for the same assembly.</Text> : null}

        <View style={styles.columns}>
          <View style={styles.column}>
            <Text style={styles.section}>Site</Text>
            <Pair label="Facility">{a.siteName}</Pair>
            <Pair label="Service address">{a.address}</Pair>
            <Pair label="Account">{a.accountNumber}</Pair>
            {a.contactName ? <Pair label="Contact">{[a.contactName, a.contactPhone].filter(Boolean).join(", ")}</Pair> : null}
            <Pair label="Degree of hazard">{hazardLabels[a.hazard as Hazard] ?? a.hazard}</Pair>
          </View>
          <View style={styles.column}>
            <Text style={styles.section}>Assembly</Text>
            <Pair label="Kind">
              {assemblyKindLabels[a.kind]} ({a.kind})
            </Pair>
            <Pair label="Make / model">{[a.make, a.model].filter(Boolean).join(" ") || "—"}</Pair>
            <Pair label="Size / serial">{`${a.size || "—"} / ${a.serial || "—"}`}</Pair>
            <Pair label="Location">{a.location || "—"}</Pair>
            <Pair label="Installation">
              {installationLabels[report.installation as keyof typeof installationLabels] ?? report.installation}
              {report.previousSerial ? ` (replaces serial ${report.previousSerial})` : ""}
            </Pair>
            <Pair label="Orientation">{yesNo(report.orientationApproved, "Installed as approved", "Not as approved")}</Pair>
            {a.kind === "RP" || a.kind === "RPDA" ? <Pair label="Relief port">{yesNo(report.reliefPortAirGapOk, "Air gap below the relief port", "No proper air gap below the relief port")}</Pair> : null}
          </View>
        </View>

        <View style={styles.columns}>
          <View style={styles.column}>
            <Text style={styles.section}>Tester</Text>
            <Pair label="Name">{report.tester.name}</Pair>
            {report.tester.company ? <Pair label="Company">{report.tester.company}</Pair> : null}
            <Pair label="Certified by">{report.tester.certifyingBody || "—"}</Pair>
            <Pair label="Certificate">{`${report.tester.certificationNumber || "—"}, expires ${report.tester.certificationExpiresOn || "—"}`}</Pair>
          </View>
          <View style={styles.column}>
            <Text style={styles.section}>Test kit and conditions</Text>
            <Pair label="Kit">{report.kit ? `${report.kit.make} ${report.kit.model}, serial ${report.kit.serial}` : "—"}</Pair>
            <Pair label="Accuracy check">{report.kit?.lastVerifiedOn ?? "—"}</Pair>
            {!isAirGap ? <Pair label="Line pressure">{linePressureText(report.linePressurePsi, unit)}</Pair> : null}
            <Pair label="Readings in">{isAirGap ? "inches" : unit}</Pair>
            <Pair label="Rule set">{report.ruleSetLabel}</Pair>
          </View>
        </View>

        <PhaseTable title="Initial test" phase={report.grade.initial} input={report.initial} unit={unit} kind={a.kind} sourceNumber={sourceNumber} />

        {report.initialOutcome === "fail" && !report.retest ? (
          <Text style={styles.note}>Not repaired at the time of the test: the assembly stands failed and the program&apos;s repair deadline applies.</Text>
        ) : null}

        {report.repairs.length ? (
          <View wrap={false}>
            <Text style={styles.section}>Repairs</Text>
            <View style={styles.table}>
              <View style={[styles.headRow, styles.rowMain]}>
                <Text style={[styles.cellCheck, styles.headText]}>Component</Text>
                <Text style={[styles.cellValue, styles.headText, { width: "26%" }]}>Part</Text>
                <Text style={[styles.cellValue, styles.headText]}>Work</Text>
                <Text style={[styles.cellResult, styles.headText, { width: "20%" }]}>Note</Text>
              </View>
              {report.repairs.map((repair, index) => (
                <View key={index} style={[styles.row, styles.rowMain]}>
                  <Text style={styles.cellCheck}>{componentLabels[repair.component as RepairComponent] ?? repair.component}</Text>
                  <Text style={[styles.cellValue, { width: "26%" }]}>{partLabels[repair.part as RepairPart] ?? repair.part}</Text>
                  <Text style={styles.cellValue}>{actionLabels[repair.action as RepairAction] ?? repair.action}</Text>
                  <Text style={[styles.cellResult, { width: "20%", fontWeight: 400 }]}>{repair.note}</Text>
                </View>
              ))}
            </View>
          </View>
        ) : null}

        {report.retest && report.grade.retest ? <PhaseTable title="Retest after repair" phase={report.grade.retest} input={report.retest} unit={unit} kind={a.kind} sourceNumber={sourceNumber} /> : null}

        {report.remarks ? (
          <View wrap={false}>
            <Text style={styles.section}>Remarks</Text>
            <Text>{report.remarks}</Text>
          </View>
        ) : null}

        {report.decision ? (
          <View wrap={false}>
            <Text style={styles.section}>Review</Text>
            <Text>
              {report.decision.decision === "accepted" ? "Accepted" : "Returned for correction"} by {report.decision.inspectorName} on {report.decision.decidedAt.slice(0, 10)}
              {report.decision.reasons.length ? `: ${report.decision.reasons.join("; ")}` : ""}
            </Text>
            {report.decision.note ? <Text style={styles.note}>{report.decision.note}</Text> : null}
          </View>
        ) : null}

        <View wrap={false}>
          <Text style={styles.section}>Attestation</Text>
          <View style={styles.attest}>
            <Text>I attest that I performed this test with the kit named above and that the readings recorded here are true.</Text>
            <Text style={{ marginTop: 3, fontWeight: 700 }}>
              {report.attestedName} · signed {report.attestedAt.slice(0, 16).replace("T", " ")} UTC
            </Text>
          </View>
          <Text style={styles.caution}>
            Graded by Zoneward against the published minimums of the rule set named above. Local codes, the assembly maker&apos;s instructions and licensed practice govern; a passing grade is not a licence to pass an assembly that is not sound.
          </Text>
        </View>

        {sources.length ? (
          <View wrap={false}>
            <Text style={styles.section}>Sources of the minimums</Text>
            <View style={styles.sourceList}>
              {sources.map((source, index) => (
                <View key={source} style={styles.sourceItem}>
                  <Text style={styles.sourceNumber}>[{index + 1}]</Text>
                  <Text style={{ flex: 1 }}>{source}</Text>
                </View>
              ))}
            </View>
          </View>
        ) : null}

        <View style={pdfStyles.footer} fixed>
          <Text>
            {report.reportNumber}
            {report.revision > 1 ? ` rev. ${report.revision}` : ""} · verification code {report.verificationCode} · printed {generatedOn}
          </Text>
          <Text render={({ pageNumber, totalPages }) => `Page ${pageNumber} of ${totalPages}`} />
        </View>
      </Page>
    </Document>
  );
}
