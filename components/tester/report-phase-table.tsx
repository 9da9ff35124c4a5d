import type { DisplayPhase } from "@/lib/reports/grade-storage";
import { describeObserved, describeRequirement } from "@/lib/forms/report-display";

/** One phase of a filed report: each finding with what was recorded, what it was held to, and the source. */
export function ReportPhaseTable({ title, phase, unit }: { title: string; phase: DisplayPhase; unit: "psid" | "kPa" }) {
  return (
    <section aria-label={title} className="rounded-lg border border-ink-200 bg-white shadow-sm">
      <header className="flex items-center justify-between gap-2 border-b border-ink-100 px-4 py-3">
        <h2 className="text-base font-semibold">{title}</h2>
        <span className={`rounded-full px-3 py-0.5 text-sm font-bold ${phase.outcome === "pass" ? "bg-pass-50 text-pass-700" : "bg-fail-50 text-fail-700"}`}>{phase.outcome === "pass" ? "Pass" : phase.outcome === "fail" ? "Fail" : "Incomplete"}</span>
      </header>
      <ul className="divide-y divide-ink-100">
        {phase.findings.map((finding, index) => (
          <li key={`${finding.rule}-${index}`} className="grid gap-1 px-4 py-2.5 sm:grid-cols-[1fr_8rem_1fr_4rem] sm:items-baseline sm:gap-3">
            <span className="font-medium">{finding.label}</span>
            <span className="tabular-nums">{describeObserved(finding, unit)}</span>
            <span className="text-sm text-ink-600 first-letter:uppercase">
              {describeRequirement(finding.required)}
              {finding.source ? <span className="block text-xs">Source: {finding.source}</span> : null}
            </span>
            <span className={`font-bold ${finding.passed ? "text-pass-700" : "text-fail-700"}`}>{finding.passed ? "✓ Pass" : "✗ Fail"}</span>
          </li>
        ))}
      </ul>
    </section>
  );
}
