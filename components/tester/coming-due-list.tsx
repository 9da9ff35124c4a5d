import { Badge } from "@/components/ui/badge";
import { ButtonLink } from "@/components/ui/button";
import type { ComingDueAssembly } from "@/lib/data/tester-coming-due";

const dayWords = (days: number) => (days < 0 ? `${-days} day${days === -1 ? "" : "s"} ago` : days === 0 ? "today" : days === 1 ? "tomorrow" : `in ${days} days`);

/** Assemblies a tester last tested that come due soon (or await repair), with the site contact to call. */
export function ComingDueList({ rows, isCompact = false }: { rows: ComingDueAssembly[]; isCompact?: boolean }) {
  if (rows.length === 0) return <p className="text-sm text-ink-600">None of the assemblies you last tested comes due in the next 60 days.</p>;
  return (
    <ul className="divide-y divide-ink-100">
      {rows.map((row) => (
        <li key={row.id} className="flex flex-wrap items-start justify-between gap-3 py-3" data-assembly={row.id}>
          <div className="min-w-0">
            <p className="font-semibold">
              {row.site.addressLine1}, {row.site.city}
            </p>
            <p className="text-sm text-ink-600">
              {row.kind} {row.serial} · {row.site.name}
              {isCompact ? "" : ` · ${row.location} · ${row.programName}`}
            </p>
            {row.site.contactName || row.site.contactPhone ? (
              <p className="text-sm">
                Contact: {row.site.contactName}
                {row.site.contactPhone ? (
                  <>
                    {" · "}
                    <a href={`tel:${row.site.contactPhone.replace(/[^0-9+]/g, "")}`}>{row.site.contactPhone}</a>
                  </>
                ) : null}
              </p>
            ) : null}
          </div>
          <div className="flex w-full flex-wrap items-center justify-between gap-2 sm:w-auto sm:flex-col sm:items-end sm:text-right">
            <span className="flex items-center gap-2 sm:flex-col sm:items-end sm:gap-1">
              {row.why === "repair" ? <Badge tone="fail">Repair due {row.repairDueOn}</Badge> : <Badge tone={row.daysLeft <= 14 ? "caution" : "brand"}>Due {row.nextDueOn}</Badge>}
              <span className="text-xs text-ink-600">{dayWords(row.daysLeft)}</span>
            </span>
            {isCompact ? null : (
              <ButtonLink href={`/tester/reports/new?assembly=${row.id}`} variant="secondary" className="min-h-12">
                Start a test
              </ButtonLink>
            )}
          </div>
        </li>
      ))}
    </ul>
  );
}
