import type { Metadata } from "next";
import { MonthlyBars } from "@/components/charts/monthly-bars";
import { ComplianceStrip } from "@/components/inspector/compliance-strip";
import { formatCount, formatDay, hazardShort, noticeStageLabel } from "@/components/inspector/format";
import { Card, PageHeader } from "@/components/ui/card";
import { requirePermission } from "@/lib/auth/guards";
import { countOverdueByNoticeStage, getComplianceCounts, getMonthlyTests, listOverdueAssemblies, overdueListSchema, type OverdueListQuery } from "@/lib/data/compliance";
import { listFacilityTypes } from "@/lib/data/inventory-search";
import { getStaffProgramContext } from "@/lib/data/settings";

export const metadata: Metadata = { title: "Compliance" };

const lists = [
  ["overdue", "Overdue for the test"],
  ["repair_overdue", "Past the repair deadline"],
  ["failed_awaiting_repair", "Failed, awaiting repair"],
  ["due_soon", "Due soon"],
  ["never_tested", "Never tested"],
] as const;

function hrefWith(query: OverdueListQuery, changes: Partial<Record<keyof OverdueListQuery, string | undefined>>, hash = "#list"): string {
  const params = new URLSearchParams();
  const merged = { ...query, after: undefined, ...changes } as Record<string, string | undefined>;
  for (const [k, v] of Object.entries(merged)) if (v && !(k === "list" && v === "overdue")) params.set(k, v);
  return `/inspector/compliance${params.size ? `?${params.toString()}` : ""}${hash}`;
}

export default async function CompliancePage({ searchParams }: { searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  const actor = await requirePermission("compliance.view");
  const raw = Object.fromEntries(Object.entries(await searchParams).map(([k, v]) => [k, Array.isArray(v) ? v[0] : v]));
  const query = overdueListSchema.parse({ ...raw, facilityType: raw.facilityType || undefined });
  const filter = { kind: query.kind, hazard: query.hazard, facilityType: query.facilityType };
  const [context, counts, months, stages, list, facilityTypes] = await Promise.all([
    getStaffProgramContext(actor),
    getComplianceCounts(actor, filter),
    getMonthlyTests(actor),
    countOverdueByNoticeStage(actor, filter),
    listOverdueAssemblies(actor, query),
    listFacilityTypes(actor),
  ]);
  const isFiltered = Boolean(filter.kind || filter.hazard || filter.facilityType);
  const listTitle = lists.find(([key]) => key === query.list)?.[1] ?? "Overdue";
  const isRepairList = query.list === "repair_overdue" || query.list === "failed_awaiting_repair";
  return (
    <>
      <PageHeader title="Compliance picture" description={`Every assembly in service by its state on ${formatDay(context.today)}, worked out from its stored test facts under the program's rules. ${isFiltered ? "Filtered as chosen below." : "The whole program."}`} />
      <form className="mb-6 flex flex-wrap items-end gap-3 rounded-lg border border-ink-200 bg-white p-4 shadow-sm" action="/inspector/compliance">
        <input type="hidden" name="list" value={query.list} />
        <div>
          <label htmlFor="kind" className="block text-xs font-semibold uppercase tracking-wide text-ink-600">
            Kind
          </label>
          <select id="kind" name="kind" defaultValue={filter.kind ?? ""} className="rounded-md border border-ink-200 px-2.5 py-2">
            <option value="">All kinds</option>
            {["RP", "RPDA", "DC", "DCDA", "PVB", "SVB", "AG"].map((k) => (
              <option key={k}>{k}</option>
            ))}
          </select>
        </div>
        <div>
          <label htmlFor="hazard" className="block text-xs font-semibold uppercase tracking-wide text-ink-600">
            Hazard
          </label>
          <select id="hazard" name="hazard" defaultValue={filter.hazard ?? ""} className="rounded-md border border-ink-200 px-2.5 py-2">
            <option value="">All hazards</option>
            <option value="severe">Severe health hazard</option>
            <option value="high">High health hazard</option>
            <option value="low">Low hazard</option>
          </select>
        </div>
        <div>
          <label htmlFor="facilityType" className="block text-xs font-semibold uppercase tracking-wide text-ink-600">
            Facility type
          </label>
          <select id="facilityType" name="facilityType" defaultValue={filter.facilityType ?? ""} className="rounded-md border border-ink-200 px-2.5 py-2">
            <option value="">All facilities</option>
            {facilityTypes.map((t) => (
              <option key={t}>{t}</option>
            ))}
          </select>
        </div>
        <button className="rounded-md bg-estuary-700 px-4 py-2 font-semibold text-white">Show</button>
        {isFiltered ? (
          <a href="/inspector/compliance" className="self-center">
            Whole program
          </a>
        ) : null}
      </form>

      <Card title={`${formatCount(counts.inService)} assemblies in service`}>
        <ComplianceStrip counts={counts} dueSoonDays={context.rules.dueSoonDays} listHref={(state) => hrefWith(query, { list: state, stage: undefined })} />
      </Card>

      <div className="mt-6 grid gap-6 xl:grid-cols-[minmax(0,3fr)_minmax(0,1fr)]">
        <Card title={`Tests per month, last 24 months${isFiltered ? " (whole program)" : ""}`}>
          <MonthlyBars months={months} title="Tests filed, passed and failed per month over the last two years" />
        </Card>
        <Card title="Overdue, by notice sent">
          <ul className="space-y-2 text-sm">
            {(
              [
                ["none", "No notice yet this cycle"],
                ["reminder", "Reminder sent"],
                ["overdue", "Overdue notice sent"],
                ["final", "Final notice sent"],
              ] as const
            ).map(([stage, label]) => (
              <li key={stage} className="flex items-center justify-between gap-2">
                <a href={hrefWith(query, { list: "overdue", stage })}>{label}</a>
                <span className="font-semibold tabular-nums">{formatCount(stages[stage])}</span>
              </li>
            ))}
          </ul>
          <p className="mt-3 text-xs text-ink-600">
            Schedule: reminder {context.schedule.reminderDaysBefore} days before due, overdue notice {context.schedule.overdueDaysAfter} day{context.schedule.overdueDaysAfter === 1 ? "" : "s"} after, final notice {context.schedule.finalDaysAfter} days after.
          </p>
        </Card>
      </div>

      <div id="list" className="mt-6">
        <Card
          title={`${listTitle}${query.stage ? ` · ${query.stage === "none" ? "no notice yet" : noticeStageLabel[query.stage]?.toLowerCase()}` : ""}`}
          actions={<a href={`/api/inspector/compliance/list?${new URLSearchParams(Object.entries({ ...query, after: undefined, format: "csv" }).filter(([, v]) => v).map(([k, v]) => [k, String(v)])).toString()}`}>Download the whole list (CSV)</a>}
        >
          <nav className="mb-4 flex flex-wrap gap-2 text-sm" aria-label="Lists">
            {lists.map(([key, label]) => (
              <a key={key} href={hrefWith(query, { list: key, stage: undefined })} aria-current={query.list === key ? "page" : undefined} className={`rounded-full border px-3 py-1 no-underline ${query.list === key ? "border-estuary-700 bg-estuary-700 text-white" : "border-ink-200 bg-white text-ink-800"}`}>
                {label} ({formatCount(counts.counts[key])})
              </a>
            ))}
          </nav>
          {list.rows.length === 0 ? (
            <p className="py-4 text-center text-ink-600">Nothing in this list{isFiltered ? " for this filter" : ""}.</p>
          ) : (
            <div className="overflow-x-auto">
              <table className="w-full text-left text-sm">
                <thead className="border-b border-ink-200 text-xs uppercase tracking-wide text-ink-600">
                  <tr>
                    <th className="py-2 pr-3">Site</th>
                    <th className="py-2 pr-3">Assembly</th>
                    <th className="py-2 pr-3">Hazard</th>
                    <th className="py-2 pr-3">{isRepairList ? "Repair due" : "Test due"}</th>
                    <th className="py-2 pr-3">{query.list === "due_soon" ? "In" : "Late by"}</th>
                    <th className="py-2 pr-3">Last test</th>
                    <th className="py-2">Notice this cycle</th>
                  </tr>
                </thead>
                <tbody className="divide-y divide-ink-100">
                  {list.rows.map((r) => (
                    <tr key={r.assemblyId} className="align-top">
                      <td className="py-2 pr-3">
                        <a href={`/inspector/sites/${r.siteId}`} className="font-semibold">
                          {r.siteName}
                        </a>
                        <div className="text-xs text-ink-600">
                          {r.address} · {r.accountNumber}
                        </div>
                      </td>
                      <td className="py-2 pr-3">
                        <a href={`/inspector/assemblies/${r.assemblyId}`}>
                          {r.kind} {r.serial ? `#${r.serial}` : ""}
                        </a>
                        <div className="text-xs text-ink-600">{r.location}</div>
                      </td>
                      <td className="py-2 pr-3">{hazardShort[r.hazard]}</td>
                      <td className="whitespace-nowrap py-2 pr-3">{formatDay(r.dueOn) || "—"}</td>
                      <td className={`whitespace-nowrap py-2 pr-3 tabular-nums ${r.daysLate !== null && r.daysLate > 0 ? "font-semibold text-fail-700" : ""}`}>{r.daysLate === null ? "—" : r.daysLate > 0 ? `${formatCount(r.daysLate)} days` : `${formatCount(-r.daysLate)} days`}</td>
                      <td className="whitespace-nowrap py-2 pr-3">{formatDay(r.lastTestedOn) || "none"}</td>
                      <td className="py-2">{r.noticeStage ? noticeStageLabel[r.noticeStage] : <span className="text-ink-600">none yet</span>}</td>
                    </tr>
                  ))}
                </tbody>
              </table>
            </div>
          )}
          {list.next ? (
            <p className="mt-4 text-center">
              <a href={hrefWith(query, { after: list.next })} className="font-semibold">
                Next {50} →
              </a>
            </p>
          ) : null}
        </Card>
      </div>
    </>
  );
}
