import type { ReactNode } from "react";
import { Badge } from "@/components/ui/badge";
import { Card } from "@/components/ui/card";
import type { ReportDetail } from "@/lib/data/report-detail";
import { formatDay, formatInstant } from "./format";

const statusTone = { queued: "caution", accepted: "pass", returned: "fail", superseded: "muted", awaiting_fee: "caution" } as const;
const statusText = { queued: "Waiting for review", accepted: "Accepted", returned: "Returned to the tester", superseded: "Replaced by a corrected revision", awaiting_fee: "Waiting for the filing fee" } as const;

export function ReportStatusBadge({ status }: { status: ReportDetail["status"] }) {
  return <Badge tone={statusTone[status]}>{statusText[status]}</Badge>;
}

function Field({ label, children }: { label: string; children: ReactNode }) {
  return (
    <div>
      <dt className="text-xs font-semibold uppercase tracking-wide text-ink-600">{label}</dt>
      <dd className="text-ink-900">{children || <span className="text-ink-400">—</span>}</dd>
    </div>
  );
}

function yesNo(value: boolean | null | undefined, yes = "Yes", no = "No"): string {
  return value === null || value === undefined ? "" : value ? yes : no;
}

function observedText(observed: number | boolean | null | undefined, unit: string, rule: string): string {
  if (observed === undefined) return "not recorded";
  if (observed === null) return rule.includes("airInlet") ? "did not open" : "did not open";
  if (typeof observed === "boolean") return observed ? "yes" : "no";
  return `${observed.toFixed(rule.startsWith("ag.") ? 2 : 1)} ${rule.startsWith("ag.") ? "in." : unit}`;
}

const repairWords: Record<string, string> = {
  check1: "Check #1",
  check2: "Check #2",
  relief_valve: "Relief valve",
  air_inlet: "Air inlet",
  check: "Check valve",
  shutoff1: "No. 1 shutoff",
  shutoff2: "No. 2 shutoff",
  other: "Other",
  disc_rubber: "disc rubber",
  spring: "spring",
  seat: "seat",
  seat_o_ring: "seat O-ring",
  cover_o_ring: "cover O-ring",
  diaphragm: "diaphragm",
  relief_disc: "relief disc",
  guide: "guide",
};

function PhaseTable({ title, phase, unit }: { title: string; phase: ReportDetail["grade"]["initial"]; unit: string }) {
  return (
    <div>
      <div className="mb-2 flex items-center gap-2">
        <h3 className="text-sm font-semibold text-ink-800">{title}</h3>
        <Badge tone={phase.outcome === "pass" ? "pass" : phase.outcome === "fail" ? "fail" : "caution"}>{phase.outcome === "pass" ? "✓ Pass" : phase.outcome === "fail" ? "✗ Fail" : "Incomplete"}</Badge>
      </div>
      <div className="overflow-x-auto">
        <table className="w-full text-left text-sm">
          <thead className="text-xs uppercase tracking-wide text-ink-600">
            <tr className="border-b border-ink-200">
              <th scope="col" className="py-1.5 pr-3 font-semibold">
                Check
              </th>
              <th scope="col" className="py-1.5 pr-3 font-semibold">
                Observed
              </th>
              <th scope="col" className="py-1.5 pr-3 font-semibold">
                Required
              </th>
              <th scope="col" className="py-1.5 font-semibold">
                Result
              </th>
            </tr>
          </thead>
          <tbody className="divide-y divide-ink-100">
            {phase.findings.map((f) => (
              <tr key={f.rule} className="align-top">
                <td className="py-1.5 pr-3">
                  {f.label}
                  {f.source ? <div className="text-xs text-ink-600">{f.source}</div> : null}
                </td>
                <td className="py-1.5 pr-3 tabular-nums">{observedText(f.observed, unit, f.rule)}</td>
                <td className="py-1.5 pr-3 tabular-nums">{f.required}</td>
                <td className={`py-1.5 font-semibold ${f.passed ? "text-pass-700" : "text-fail-700"}`}>{f.passed ? "✓ met" : "✗ not met"}</td>
              </tr>
            ))}
          </tbody>
        </table>
      </div>
      {phase.missing.length ? <p className="mt-1 text-sm text-caution-700">Not recorded: {phase.missing.join(", ")}.</p> : null}
    </div>
  );
}

/** The whole filed report as the inspector reviews it. */
export function ReportView({ report, timezone }: { report: ReportDetail; timezone: string }) {
  const a = report.assembly;
  const t = report.tester;
  const errors = report.validity.filter((v) => v.severity === "error");
  const warnings = report.validity.filter((v) => v.severity === "warning");
  return (
    <div className="space-y-4">
      {report.signals.length || errors.length || warnings.length ? (
        <Card title="What the checks found">
          <ul className="space-y-2 text-sm">
            {report.signals.map((s) => (
              <li key={s.code + s.message} className="flex gap-2">
                <Badge tone="fail">Signal</Badge>
                <span>{s.message}</span>
              </li>
            ))}
            {errors.map((v) => (
              <li key={v.code + v.message} className="flex gap-2">
                <Badge tone="fail">Error</Badge>
                <span>{v.message}</span>
              </li>
            ))}
            {warnings.map((v) => (
              <li key={v.code + v.message} className="flex gap-2">
                <Badge tone="caution">Warning</Badge>
                <span>{v.message}</span>
              </li>
            ))}
          </ul>
          <p className="mt-3 text-xs text-ink-600">A signal is a reason to look, not a verdict.</p>
        </Card>
      ) : (
        <p className="rounded-md border border-pass-600/30 bg-pass-50 px-4 py-2.5 text-sm text-pass-700">No warning, error or suspicious-report signal was found when this report was filed.</p>
      )}

      <Card title="Assembly and site (as filed)">
        <dl className="grid gap-3 sm:grid-cols-3">
          <Field label="Kind">{a.kind}</Field>
          <Field label="Make / model">{[a.make, a.model].filter(Boolean).join(" ")}</Field>
          <Field label="Serial">{a.serial}</Field>
          <Field label="Size">{a.size}</Field>
          <Field label="Location">{a.location}</Field>
          <Field label="Degree of hazard">{a.hazard}</Field>
          <Field label="Site">{a.siteName}</Field>
          <Field label="Service address">{a.address}</Field>
          <Field label="Account">{a.accountNumber}</Field>
          <Field label="Installation">{report.installation === "replacement" ? `Replacement (previous serial ${report.previousSerial || "not given"})` : report.installation === "new" ? "New installation" : "Existing"}</Field>
          <Field label="Approved orientation">{yesNo(report.orientationApproved)}</Field>
          {a.kind === "RP" || a.kind === "RPDA" ? <Field label="Air gap under the relief port">{yesNo(report.reliefPortAirGapOk)}</Field> : null}
        </dl>
      </Card>

      <Card title="The test">
        <dl className="mb-4 grid gap-3 sm:grid-cols-3">
          <Field label="Tested">{`${formatDay(report.testedOn)}, ${report.testedAt.slice(11, 16)}`}</Field>
          <Field label="Reason">{report.reason + (report.reasonNote ? ` — ${report.reasonNote}` : "")}</Field>
          <Field label="Line pressure">{report.linePressurePsi !== null ? `${report.linePressurePsi.toFixed(1)} psi` : ""}</Field>
          <Field label="Rule-set edition">{report.ruleSetLabel}</Field>
          <Field label="Units">{report.unit}</Field>
          <Field label="Result">
            {report.finalOutcome === "pass" ? (report.wasRepaired ? "Passed after repair" : "Passed") : "Failed"}
          </Field>
        </dl>
        <div className="space-y-5">
          <PhaseTable title="Initial test (as found)" phase={report.grade.initial} unit={report.unit} />
          {report.repairs.length ? (
            <div>
              <h3 className="mb-1 text-sm font-semibold text-ink-800">Repairs</h3>
              <ul className="list-inside list-disc text-sm">
                {report.repairs.map((r, i) => (
                  <li key={i}>
                    {repairWords[r.component] ?? r.component}: {repairWords[r.part] ?? r.part} {r.action}
                    {r.note ? ` — ${r.note}` : ""}
                  </li>
                ))}
              </ul>
            </div>
          ) : null}
          {report.grade.retest ? <PhaseTable title="Retest after repair" phase={report.grade.retest} unit={report.unit} /> : null}
        </div>
        {report.remarks ? <p className="mt-4 text-sm">Remarks: {report.remarks}</p> : null}
      </Card>

      <Card title="Tester and test kit">
        <dl className="grid gap-3 sm:grid-cols-3">
          <Field label="Tester">{t.name}</Field>
          <Field label="Company">{t.company ?? ""}</Field>
          <Field label="Certification">{`${t.certificationNumber}, ${t.certifyingBody}`}</Field>
          <Field label="Certification expires">{formatDay(t.certificationExpiresOn)}</Field>
          <Field label="Kit">{report.kit ? `${report.kit.make} ${report.kit.model}, serial ${report.kit.serial}` : "No kit recorded"}</Field>
          <Field label="Kit last verified">{report.kit ? formatDay(report.kit.lastVerifiedOn) : ""}</Field>
          <Field label="Attested by">{report.attestedName}</Field>
          <Field label="Filed">{formatInstant(report.submittedAt, timezone)}</Field>
          <Field label="Filing fee">{report.feeCents > 0 ? `${(report.feeCents / 100).toFixed(2)} ${report.feeCurrency} (${report.feeStatus})` : "None"}</Field>
        </dl>
      </Card>
    </div>
  );
}
