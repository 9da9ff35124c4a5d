import type { Metadata } from "next";
import { formatCount, formatDay } from "@/components/inspector/format";
import { ButtonLink } from "@/components/ui/button";
import { Card, PageHeader } from "@/components/ui/card";
import { requirePermission } from "@/lib/auth/guards";
import { getYearlySummary, listSummaryYears, summaryColumns } from "@/lib/data/summary";
import { assemblyKindLabels, assemblyKinds, hazardLabels, hazards, type SummaryCounts } from "@/lib/rules";

export const metadata: Metadata = { title: "Yearly summary" };

function Cells({ counts, isBold = false }: { counts: SummaryCounts; isBold?: boolean }) {
  return (
    <>
      {summaryColumns.map((c) => (
        <td key={c.key} className={`px-2 py-1.5 text-right tabular-nums ${isBold ? "font-bold" : ""}`}>
          {formatCount(counts[c.key])}
        </td>
      ))}
    </>
  );
}

export default async function SummaryPage({ searchParams }: { searchParams: Promise<{ year?: string }> }) {
  const actor = await requirePermission("summary.view");
  const years = await listSummaryYears(actor);
  const requested = Number((await searchParams).year);
  // Last year by default: the state summary is filed after the year closes.
  const year = years.includes(requested) ? requested : (years[1] ?? years[0]!);
  const summary = await getYearlySummary(actor, year);
  const kindsPresent = assemblyKinds.filter((k) => summary.rows.some((r) => r.kind === k));
  const hazardsPresent = hazards.filter((h) => summary.rows.some((r) => r.hazard === h));
  return (
    <>
      <PageHeader
        title={`Program summary ${year}`}
        description="The yearly figures for the state drinking-water agency: assemblies by kind and degree of hazard — in service, tested, passed on the first test, failed, repaired, overdue at year end, new installations and removals."
        actions={
          <>
            <ButtonLink href={`/api/inspector/summary/${year}/csv`} variant="secondary" size="sm">
              Download CSV
            </ButtonLink>
            <ButtonLink href={`/api/inspector/summary/${year}/pdf`} size="sm">
              Download PDF
            </ButtonLink>
          </>
        }
      />
      <form className="mb-4 flex items-end gap-3" action="/inspector/summary">
        <div>
          <label htmlFor="year" className="block text-xs font-semibold uppercase tracking-wide text-ink-600">
            Year
          </label>
          <select id="year" name="year" defaultValue={String(year)} className="rounded-md border border-ink-200 bg-white px-2.5 py-2">
            {years.map((y) => (
              <option key={y}>{y}</option>
            ))}
          </select>
        </div>
        <button className="rounded-md bg-estuary-700 px-4 py-2 font-semibold text-white">Show</button>
      </form>
      <Card title={`${summary.programName} · ${year}`}>
        <div className="overflow-x-auto">
          <table className="w-full text-sm">
            <thead className="border-b border-ink-200 text-xs uppercase tracking-wide text-ink-600">
              <tr>
                <th scope="col" className="px-2 py-2 text-left">
                  Kind
                </th>
                <th scope="col" className="px-2 py-2 text-left">
                  Hazard
                </th>
                {summaryColumns.map((c) => (
                  <th key={c.key} scope="col" className="px-2 py-2 text-right">
                    {c.label}
                  </th>
                ))}
              </tr>
            </thead>
            <tbody className="divide-y divide-ink-100">
              {summary.rows.map((r) => (
                <tr key={`${r.kind}-${r.hazard}`}>
                  <th scope="row" className="px-2 py-1.5 text-left font-normal">
                    <span className="font-semibold">{r.kind}</span> <span className="text-ink-600">{assemblyKindLabels[r.kind]}</span>
                  </th>
                  <td className="px-2 py-1.5">{hazardLabels[r.hazard]}</td>
                  <Cells counts={r} />
                </tr>
              ))}
              {summary.rows.length === 0 ? (
                <tr>
                  <td colSpan={2 + summaryColumns.length} className="px-2 py-6 text-center text-ink-600">
                    No assembly in the inventory for {year}.
                  </td>
                </tr>
              ) : null}
            </tbody>
            <tbody className="border-t-2 border-ink-200 bg-ink-50">
              {kindsPresent.map((k) => (
                <tr key={k}>
                  <th scope="row" className="px-2 py-1.5 text-left font-semibold">
                    {k}
                  </th>
                  <td className="px-2 py-1.5 text-ink-600">all hazards</td>
                  <Cells counts={summary.byKind[k]} />
                </tr>
              ))}
              {hazardsPresent.map((h) => (
                <tr key={h}>
                  <th scope="row" className="px-2 py-1.5 text-left font-normal text-ink-600">
                    all kinds
                  </th>
                  <td className="px-2 py-1.5 font-semibold">{hazardLabels[h]}</td>
                  <Cells counts={summary.byHazard[h]} />
                </tr>
              ))}
              <tr className="border-t-2 border-estuary-700 bg-estuary-50">
                <th scope="row" className="px-2 py-2 text-left font-bold">
                  All assemblies
                </th>
                <td />
                <Cells counts={summary.totals} isBold />
              </tr>
            </tbody>
          </table>
        </div>
      </Card>
      <div className="mt-6">
        <Card title="How the figures are counted">
          <ul className="list-inside list-disc space-y-1 text-sm text-ink-700">
            {summary.notes.map((n) => (
              <li key={n}>{n}</li>
            ))}
          </ul>
          <p className="mt-3 text-xs text-ink-600">Computed on {formatDay(summary.generatedOn)} from the filed reports and the inventory; nothing is kept by hand.</p>
        </Card>
      </div>
    </>
  );
}
