import { StateBar } from "@/components/charts/state-bar";
import type { ComplianceCounts } from "@/lib/data/compliance";
import { formatCount } from "./format";

export const stateColors: Record<string, string> = {
  current: "#1f7a3d",
  due_soon: "#e8c27a",
  overdue: "#b42318",
  failed_awaiting_repair: "#c9912e",
  repair_overdue: "#6b1510",
  never_tested: "#8a9593",
  inactive: "#d9e0dd",
};

const order = ["current", "due_soon", "overdue", "failed_awaiting_repair", "repair_overdue", "never_tested"] as const;
const labels: Record<(typeof order)[number], string> = {
  current: "Current",
  due_soon: "Due within 30 days",
  overdue: "Overdue",
  failed_awaiting_repair: "Failed, awaiting repair",
  repair_overdue: "Past the repair deadline",
  never_tested: "Never tested",
};

/** The program's assemblies in service by state today, each linked to its list. */
export function ComplianceStrip({ counts, listHref, dueSoonDays }: { counts: ComplianceCounts; listHref: (state: string) => string; dueSoonDays: number }) {
  const segments = order.map((key) => ({ key, label: key === "due_soon" ? `Due within ${dueSoonDays} days` : labels[key], count: counts.counts[key], color: stateColors[key]!, href: key === "current" ? undefined : listHref(key) }));
  return (
    <div className="space-y-3">
      <StateBar segments={segments} title="Assemblies in service by compliance state" />
      <ul className="grid gap-2 sm:grid-cols-3 lg:grid-cols-6">
        {segments.map((s) => {
          const share = counts.inService ? (s.count / counts.inService) * 100 : 0;
          const body = (
            <>
              <span className="flex items-center gap-1.5 text-xs font-semibold uppercase tracking-wide text-ink-600">
                <span className="inline-block h-2.5 w-2.5 rounded-sm" style={{ backgroundColor: s.color }} aria-hidden="true" />
                {s.label}
              </span>
              <span className="mt-0.5 block text-2xl font-bold tabular-nums text-ink-900">{formatCount(s.count)}</span>
              <span className="text-xs text-ink-600">{share.toFixed(1)}% of {formatCount(counts.inService)}</span>
            </>
          );
          return (
            <li key={s.key}>
              {s.href ? (
                <a href={s.href} className="block rounded-md border border-ink-200 bg-white px-3 py-2 no-underline hover:border-estuary-300 hover:no-underline">
                  {body}
                </a>
              ) : (
                <div className="rounded-md border border-ink-200 bg-white px-3 py-2">{body}</div>
              )}
            </li>
          );
        })}
      </ul>
      <p className="text-xs text-ink-600">
        As of {counts.today}. Out of service (removed, replaced or awaiting confirmation): {formatCount(counts.counts.inactive)}.
      </p>
    </div>
  );
}
