import type { Metadata } from "next";
import { Alert } from "@/components/ui/alert";
import { Badge, type BadgeTone } from "@/components/ui/badge";
import { Card, PageHeader, StatTile } from "@/components/ui/card";
import { inputClass } from "@/components/ui/field";
import { requirePermission } from "@/lib/auth/guards";
import { can } from "@/lib/auth/permissions";
import { getProgramWithSettings } from "@/lib/data/programs";
import { formatLongDate } from "@/lib/data/notices-format";
import { listNoticeRuns, listNotices, noticeAttention, noticeLogFilterSchema, previewTodaysNotices } from "@/lib/data/notices-log";
import { LettersPrintedButton } from "./_components/letters-printed-button";
import { RunPanel } from "./_components/run-panel";

export const metadata: Metadata = { title: "Notices" };

const kindWords: Record<string, string> = { reminder: "Reminder", overdue: "Overdue", final: "Final notice", repair_reminder: "Repair reminder" };
const statusTone: Record<string, BadgeTone> = { sent: "pass", pending: "brand", failed: "fail", letter_ready: "caution", letter_printed: "muted", withdrawn: "muted" };
const statusWords: Record<string, string> = { sent: "sent", pending: "waiting to send", failed: "failed", letter_ready: "letter to print", letter_printed: "letter printed", withdrawn: "withdrawn" };
const runTone: Record<string, BadgeTone> = { running: "brand", finished: "pass", failed: "fail", skipped: "muted" };

function when(iso: string | null): string {
  return iso ? `${iso.slice(0, 10)} ${iso.slice(11, 16)} UTC` : "";
}

export default async function NoticesPage({ searchParams }: { searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  const actor = await requirePermission("notices.view");
  const filter = noticeLogFilterSchema.parse(await searchParams);
  const [preview, attention, runs, log, program] = await Promise.all([previewTodaysNotices(actor), noticeAttention(actor), listNoticeRuns(actor), listNotices(actor, filter), getProgramWithSettings(actor.programId!)]);
  const settings = program?.settings;
  const running = runs.find((r) => r.status === "running") ?? null;
  const withLetters = runs.filter((r) => r.hasLetters);
  const canRun = can(actor, "notices.run");
  const query = (changes: Record<string, string | number>) => {
    const params = new URLSearchParams({ status: filter.status, kind: filter.kind, q: filter.q, page: String(filter.page), ...Object.fromEntries(Object.entries(changes).map(([k, v]) => [k, String(v)])) });
    return `?${params.toString()}`;
  };
  return (
    <>
      <PageHeader
        title="Notices"
        description={
          settings
            ? `Reminders ${settings.reminderDaysBefore} days before the due date, the overdue notice ${settings.overdueDaysAfter} day${settings.overdueDaysAfter === 1 ? "" : "s"} after it, the final notice ${settings.finalDaysAfter} days after it (service may be discontinued ${settings.discontinueDaysAfterFinal} days later), and repair reminders ${settings.repairReminderDaysBefore} days before a repair deadline. Each notice is recorded before it is sent and goes out once.`
            : "Owner notices, each recorded before it is sent and sent once."
        }
        actions={canRun ? <a href="/admin/settings">Change the schedule</a> : undefined}
      />
      <div className="space-y-6">
        <div className="grid gap-6 lg:grid-cols-2">
          <Card title={preview.today ? `Today, ${formatLongDate(preview.today)}` : "Today"}>
            {preview.problems.length ? (
              <Alert tone="danger" title="The notices cannot run">
                <ul className="list-inside list-disc">
                  {preview.problems.map((p) => (
                    <li key={p}>{p}</li>
                  ))}
                </ul>
              </Alert>
            ) : (
              <p className="mb-4 text-ink-700">
                Still to send today: {preview.byKind.reminder} reminders, {preview.byKind.overdue} overdue notices, {preview.byKind.final} final notices and {preview.byKind.repair_reminder} repair reminders ({preview.emails} by e-mail, {preview.letters} by letter).
              </p>
            )}
            <RunPanel canRun={canRun && preview.problems.length === 0} running={running} />
          </Card>
          <div className="grid grid-cols-2 content-start gap-3">
            <StatTile label="Waiting for a retry" value={attention.waitingRetry} tone={attention.waitingRetry ? "caution" : "neutral"} href={query({ status: "waiting", page: 1 })} />
            <StatTile label="Gave up: need a person" value={attention.gaveUp} tone={attention.gaveUp ? "fail" : "neutral"} href={query({ status: "failed", page: 1 })} />
            <StatTile label="Letters to print" value={attention.lettersToPrint} tone={attention.lettersToPrint ? "caution" : "neutral"} href={query({ status: "letters", page: 1 })} />
            <StatTile label="Being sent" value={attention.inFlight} tone="neutral" />
          </div>
        </div>

        {withLetters.length ? (
          <Card title="Printed letters">
            <ul className="divide-y divide-ink-100">
              {withLetters.map((r) => (
                <li key={r.id} className="flex flex-wrap items-center justify-between gap-2 py-2">
                  <span>
                    {formatLongDate(r.runOn)}: {r.letters} letter{r.letters === 1 ? "" : "s"} (run #{r.id}) {r.lettersPrinted ? <Badge tone="muted">printed</Badge> : <Badge tone="caution">to print</Badge>}
                  </span>
                  <span className="flex items-center gap-3">
                    <a href={`/api/notices/runs/${r.id}/letters`}>Download the letters (PDF)</a>
                    {r.lettersPrinted ? null : <LettersPrintedButton runId={r.id} />}
                  </span>
                </li>
              ))}
            </ul>
            <p className="mt-2 text-sm text-ink-600">One letter per page, for contacts with no e-mail address; each carries the site&apos;s account number and a one-time sign-in code. Mail them the day they are printed.</p>
          </Card>
        ) : null}

        <Card title="Runs">
          {runs.length === 0 ? (
            <p className="text-ink-600">No run yet.</p>
          ) : (
            <div className="-mx-5 overflow-x-auto">
              <table className="w-full min-w-[44rem] text-left text-sm">
                <thead className="border-b border-ink-100 text-xs uppercase tracking-wide text-ink-600">
                  <tr>
                    <th className="px-5 py-2">Started</th>
                    <th className="px-3 py-2">By</th>
                    <th className="px-3 py-2">Status</th>
                    <th className="px-3 py-2 text-right">Planned</th>
                    <th className="px-3 py-2 text-right">Sent</th>
                    <th className="px-3 py-2 text-right">Failed</th>
                    <th className="px-3 py-2 text-right">Letters</th>
                    <th className="px-5 py-2">Log</th>
                  </tr>
                </thead>
                <tbody className="divide-y divide-ink-100">
                  {runs.map((r) => (
                    <tr key={r.id} className="align-top">
                      <td className="px-5 py-2 whitespace-nowrap">
                        #{r.id} · {when(r.startedAt)}
                      </td>
                      <td className="px-3 py-2">{r.trigger === "button" ? (r.startedByName ?? "an admin") : "schedule"}</td>
                      <td className="px-3 py-2">
                        <Badge tone={runTone[r.status] ?? "neutral"}>{r.status}</Badge>
                      </td>
                      <td className="px-3 py-2 text-right tabular-nums">{r.planned}</td>
                      <td className="px-3 py-2 text-right tabular-nums">{r.sent}</td>
                      <td className="px-3 py-2 text-right tabular-nums">{r.failed}</td>
                      <td className="px-3 py-2 text-right tabular-nums">{r.letters}</td>
                      <td className="px-5 py-2">
                        <details>
                          <summary className="cursor-pointer">{r.log.at(-1)?.replace(/^\S+ /, "").slice(0, 80) ?? "—"}</summary>
                          <pre className="mt-2 max-w-xl whitespace-pre-wrap rounded bg-ink-50 p-2 text-xs">{r.log.join("\n")}</pre>
                        </details>
                      </td>
                    </tr>
                  ))}
                </tbody>
              </table>
            </div>
          )}
        </Card>

        <Card title={`Notice log (${log.total})`}>
          <form className="mb-4 grid gap-3 sm:grid-cols-[1fr_1fr_2fr_auto] sm:items-end" method="get">
            <label className="text-sm font-semibold">
              Status
              <select name="status" defaultValue={filter.status} className={`${inputClass} mt-1`}>
                <option value="all">All</option>
                <option value="sent">Sent</option>
                <option value="waiting">Waiting to send or retry</option>
                <option value="failed">Failed</option>
                <option value="letters">Letters</option>
                <option value="withdrawn">Withdrawn</option>
              </select>
            </label>
            <label className="text-sm font-semibold">
              Notice
              <select name="kind" defaultValue={filter.kind} className={`${inputClass} mt-1`}>
                <option value="all">All</option>
                <option value="reminder">Reminders</option>
                <option value="overdue">Overdue notices</option>
                <option value="final">Final notices</option>
                <option value="repair_reminder">Repair reminders</option>
              </select>
            </label>
            <label className="text-sm font-semibold">
              Recipient, address or account
              <input name="q" defaultValue={filter.q} className={`${inputClass} mt-1`} maxLength={100} />
            </label>
            <button type="submit" className="rounded-md border border-ink-200 bg-white px-4 py-2.5 font-semibold hover:bg-ink-50">
              Filter
            </button>
          </form>
          {log.rows.length === 0 ? (
            <p className="text-ink-600">No notices match.</p>
          ) : (
            <div className="-mx-5 overflow-x-auto">
              <table className="w-full min-w-[56rem] text-left text-sm">
                <thead className="border-b border-ink-100 text-xs uppercase tracking-wide text-ink-600">
                  <tr>
                    <th className="px-5 py-2">Planned</th>
                    <th className="px-3 py-2">Notice</th>
                    <th className="px-3 py-2">To</th>
                    <th className="px-3 py-2">Assembly</th>
                    <th className="px-3 py-2">Status</th>
                    <th className="px-5 py-2">Message id or error</th>
                  </tr>
                </thead>
                <tbody className="divide-y divide-ink-100">
                  {log.rows.map((n) => (
                    <tr key={n.id} className="align-top">
                      <td className="px-5 py-2 whitespace-nowrap">{n.plannedOnWords}</td>
                      <td className="px-3 py-2">
                        {kindWords[n.kind] ?? n.kind}
                        <span className="block text-xs text-ink-600">due {n.dueCycleWords}</span>
                      </td>
                      <td className="px-3 py-2 break-all">{n.recipient}</td>
                      <td className="px-3 py-2">
                        <a href={`/inspector/assemblies/${n.assemblyId}`}>{n.location || "assembly"}</a>
                        <span className="block text-xs text-ink-600">{n.siteLine}</span>
                      </td>
                      <td className="px-3 py-2 whitespace-nowrap">
                        <Badge tone={statusTone[n.status] ?? "neutral"}>{statusWords[n.status] ?? n.status}</Badge>
                        <span className="block text-xs text-ink-600">
                          {n.sentAt ? when(n.sentAt) : n.nextAttemptAt ? `retry after ${when(n.nextAttemptAt)}` : ""}
                          {n.attempts > 1 ? ` · ${n.attempts} attempts` : ""}
                        </span>
                      </td>
                      <td className="px-5 py-2 text-xs break-all">{n.lastError ? <span className={n.status === "withdrawn" ? "text-ink-600" : "text-fail-700"}>{n.lastError}</span> : (n.messageId ?? "")}</td>
                    </tr>
                  ))}
                </tbody>
              </table>
            </div>
          )}
          {log.pages > 1 ? (
            <nav className="mt-3 flex items-center justify-between text-sm" aria-label="Notice log pages">
              {filter.page > 1 ? <a href={query({ page: filter.page - 1 })}>Newer</a> : <span />}
              <span className="text-ink-600">
                Page {log.page} of {log.pages}
              </span>
              {filter.page < log.pages ? <a href={query({ page: filter.page + 1 })}>Older</a> : <span />}
            </nav>
          ) : null}
        </Card>
      </div>
    </>
  );
}
