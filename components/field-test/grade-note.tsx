import type { Finding } from "@/lib/rules";
import type { MinimumText } from "@/lib/forms/readings";
import { describeRequirement } from "@/lib/forms/report-display";

/**
 * Beside a reading: the live grade (pass or fail), what it was held to and the published
 * source; before anything is typed, the minimum it will be held to.
 */
export function GradeNote({ id, findings, minimums }: { id: string; findings: Finding[] | undefined; minimums: MinimumText[] | undefined }) {
  if (findings && findings.length) {
    return (
      <ul id={id} className="space-y-1" aria-live="polite">
        {findings.map((finding) => (
          <li key={finding.rule} className={`rounded-md px-3 py-2 text-sm ${finding.passed ? "bg-pass-50 text-pass-700" : "bg-fail-50 text-fail-700"}`} data-rule={finding.rule} data-result={finding.passed ? "pass" : "fail"}>
            <span className="font-bold">{finding.passed ? "✓ Pass" : "✗ Fail"}</span>
            <span className="text-ink-800"> · {describeRequirement(finding.required)}</span>
            <span className="mt-0.5 block text-xs text-ink-600">Source: {finding.source}</span>
          </li>
        ))}
      </ul>
    );
  }
  if (minimums && minimums.length) {
    return (
      <ul id={id} className="space-y-1">
        {minimums.map((minimum) => (
          <li key={minimum.rule} className="rounded-md bg-ink-50 px-3 py-2 text-sm text-ink-600 first-letter:uppercase">
            {describeRequirement(minimum.required)}
            <span className="mt-0.5 block text-xs">Source: {minimum.source}</span>
          </li>
        ))}
      </ul>
    );
  }
  return (
    <p id={id} className="text-sm text-ink-600">
      Recorded for the report; not graded by this rule set.
    </p>
  );
}
