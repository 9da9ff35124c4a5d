// How a filed report's findings read on screen and on paper. Pure.
import { formatReading } from "@/lib/rules";

/** A finding's observed value as the tester would say it. */
export function describeObserved(finding: { rule: string; observed?: number | boolean | null }, unit: "psid" | "kPa"): string {
  const { observed, rule } = finding;
  if (observed === null || observed === undefined) return "Did not open";
  if (typeof observed === "boolean") return observed ? "Yes" : "No";
  if (rule.startsWith("ag.")) return `${observed} in.`;
  if (rule === "rp.check1.exceedsRelief" || rule === "rp.buffer.min") return `${formatReading(observed, unit)} margin`;
  return formatReading(observed, unit);
}

/** "≥ 2.0 psid" → "at least 2.0 psid" (the PDF's shipped font has no "≥"; the words read as well). */
export function describeRequired(required: string | undefined): string {
  return (required ?? "").replace(/≥\s*/g, "at least ");
}

/** "held to ≥ 2.0 psid" for a minimum, "required: closed tight" for a yes/no check. */
export function describeRequirement(required: string | undefined): string {
  const text = (required ?? "").trim();
  return /^[≥>]/.test(text) ? `held to ${text}` : `required: ${text}`;
}
