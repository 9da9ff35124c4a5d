import { ReadingChartLegend, ReadingHistoryChart } from "@/components/charts/reading-history-chart";
import { Badge } from "@/components/ui/badge";
import type { AssemblyHistory } from "@/lib/data/review-history";
import { formatDay } from "./format";

const statusText: Record<string, string> = { queued: "waiting", accepted: "accepted", returned: "returned", superseded: "replaced", awaiting_fee: "fee due" };

/** An assembly's test history: a small chart per differential, then every report. */
export function AssemblyHistoryView({ history, currentReportId, isNarrow = false }: { history: AssemblyHistory; currentReportId?: number; isNarrow?: boolean }) {
  const reportHref = (id: number) => `/inspector/reports/${id}`;
  if (history.reports.length === 0) return <p className="text-ink-600">No test has been filed for this assembly yet.</p>;
  return (
    <div className="space-y-4">
      {history.series.length ? (
        <>
          <div className={`grid gap-3 ${isNarrow ? "sm:grid-cols-2 lg:grid-cols-1" : "sm:grid-cols-2"}`}>
            {history.series.map((s) => (
              <ReadingHistoryChart key={s.key} label={s.label} unit={s.unit} minimum={s.minimum} points={s.points} highlightReportId={currentReportId} />
            ))}
          </div>
          <ReadingChartLegend />
        </>
      ) : null}
      <div className="overflow-x-auto">
        <table className="w-full text-left text-sm">
          <caption className="sr-only">Every report filed for this assembly</caption>
          <thead className="text-xs uppercase tracking-wide text-ink-600">
            <tr className="border-b border-ink-200">
              <th scope="col" className="py-1.5 pr-2 font-semibold">
                Tested
              </th>
              <th scope="col" className="py-1.5 pr-2 font-semibold">
                Report
              </th>
              <th scope="col" className="py-1.5 pr-2 font-semibold">
                Result
              </th>
              <th scope="col" className="py-1.5 pr-2 font-semibold">
                Tester
              </th>
              <th scope="col" className="py-1.5 font-semibold">
                Status
              </th>
            </tr>
          </thead>
          <tbody className="divide-y divide-ink-100">
            {[...history.reports].reverse().map((r) => (
              <tr key={r.id} className={r.id === currentReportId ? "bg-estuary-50" : r.isCounted ? "" : "text-ink-600"}>
                <td className="whitespace-nowrap py-1.5 pr-2">{formatDay(r.testedOn)}</td>
                <td className="py-1.5 pr-2">
                  {r.id === currentReportId ? (
                    <span className="font-semibold">{r.reportNumber} (this one)</span>
                  ) : (
                    <a href={reportHref(r.id)}>{r.reportNumber}</a>
                  )}
                  {r.revision > 1 ? <span className="text-xs"> rev. {r.revision}</span> : null}
                </td>
                <td className="py-1.5 pr-2">
                  {r.finalOutcome === "pass" ? <Badge tone="pass">{r.wasRepaired ? "Pass after repair" : "Pass"}</Badge> : <Badge tone="fail">Fail</Badge>}
                </td>
                <td className="py-1.5 pr-2">{r.testerName}</td>
                <td className="py-1.5">
                  {statusText[r.status] ?? r.status}
                  {r.decidedBy ? <span className="text-xs text-ink-600"> · {r.decidedBy}</span> : null}
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      </div>
    </div>
  );
}
