"use client";

import { createColumnHelper, flexRender, getCoreRowModel, useReactTable } from "@tanstack/react-table";
import { usePathname, useSearchParams } from "next/navigation";
import { useRef, useState } from "react";
import useSWR from "swr";
import { Badge } from "@/components/ui/badge";
import { Button } from "@/components/ui/button";
import type { QueuePage, QueueRow } from "@/lib/data/review-queue";
import { formatCount, formatDay, formatInstant, plural } from "./format";
import { fetchJson, sendJson } from "./send-json";

export interface QueueFilterState {
  kind?: string;
  grade?: string;
  testerId?: string;
  age?: string;
  flags?: string;
  sort?: string;
}

interface ReviewQueueProps {
  initialFilter: QueueFilterState;
  initialPage: QueuePage;
  testers: { id: number; name: string; waiting: number }[];
  timezone: string;
}

const filterKeys = ["kind", "grade", "testerId", "age", "flags", "sort"] as const;
const kinds = ["RP", "RPDA", "DC", "DCDA", "PVB", "SVB", "AG"];
const PAGE_SIZE = 25;

function queryString(filter: QueueFilterState, cursor?: string | null): string {
  const params = new URLSearchParams();
  for (const key of filterKeys) if (filter[key]) params.set(key, filter[key]);
  if (cursor) params.set("cursor", cursor);
  params.set("limit", String(PAGE_SIZE));
  return params.toString();
}

function GradeBadge({ row }: { row: QueueRow }) {
  if (row.finalOutcome === "fail") return <Badge tone="fail">✗ Fail{row.initialOutcome === "incomplete" ? " (incomplete)" : ""}</Badge>;
  if (row.wasRepaired) return <Badge tone="caution">✓ Pass after repair</Badge>;
  return <Badge tone="pass">✓ Pass</Badge>;
}

function CredentialMark({ label, ok, messages }: { label: string; ok: boolean; messages: string[] }) {
  return (
    <span className={`inline-flex items-center gap-1 text-xs font-semibold ${ok ? "text-pass-700" : "text-fail-700"}`} title={ok ? `${label} valid on the test date` : messages.join(" ")}>
      <span aria-hidden="true">{ok ? "✓" : "✗"}</span>
      {label}
      <span className="sr-only">{ok ? " valid on the test date" : `: ${messages.join(" ")}`}</span>
    </span>
  );
}

const signalShort: Record<string, string> = {
  same_as_previous_test: "Same readings as last test",
  many_tests_in_short_time: "Many tests in a short time",
  identical_readings_across_assemblies: "Identical readings across assemblies",
  test_before_installation: "Test before installation",
};

const column = createColumnHelper<QueueRow>();

export function ReviewQueue({ initialFilter, initialPage, testers, timezone }: ReviewQueueProps) {
  const pathname = usePathname();
  const searchParams = useSearchParams();
  const [filter, setFilter] = useState<QueueFilterState>(initialFilter);
  const [cursors, setCursors] = useState<(string | null)[]>([null]);
  const cursor = cursors.at(-1) ?? null;
  const key = `/api/inspector/queue?${queryString(filter, cursor)}`;
  const initialKey = useRef(`/api/inspector/queue?${queryString(initialFilter, null)}`);
  const { data, error, isLoading, mutate } = useSWR<QueuePage, Error>(key, (url: string) => fetchJson<QueuePage>(url), {
    fallbackData: key === initialKey.current ? initialPage : undefined,
    keepPreviousData: true,
    revalidateOnFocus: true,
  });

  const update = (next: QueueFilterState) => {
    setFilter(next);
    setCursors([null]);
    const params = new URLSearchParams(searchParams.toString());
    for (const k of filterKeys) {
      if (next[k]) params.set(k, next[k]);
      else params.delete(k);
    }
    // The address follows the filter (for a reload or a shared link) without a server render:
    // the list itself comes from the API.
    window.history.replaceState(null, "", `${pathname}${params.size ? `?${params.toString()}` : ""}`);
  };
  const set = (k: (typeof filterKeys)[number], value: string) => update({ ...filter, [k]: value || undefined });
  const sortBy = (column: "submitted" | "tested") => {
    const current = filter.sort ?? "oldest";
    const next = column === "submitted" ? (current === "oldest" ? "newest" : "oldest") : current === "tested_oldest" ? "tested_newest" : "tested_oldest";
    set("sort", next === "oldest" ? "" : next);
  };
  const sortMark = (column: "submitted" | "tested") => {
    const current = filter.sort ?? "oldest";
    if (column === "submitted") return current === "oldest" ? " ▲" : current === "newest" ? " ▼" : "";
    return current === "tested_oldest" ? " ▲" : current === "tested_newest" ? " ▼" : "";
  };
  const ariaSort = (column: "submitted" | "tested"): "ascending" | "descending" | "none" => {
    const mark = sortMark(column);
    return mark === " ▲" ? "ascending" : mark === " ▼" ? "descending" : "none";
  };

  // Rebuilt on every render: the header buttons read the current filter.
  const columns = [
      column.accessor("reportNumber", {
        header: "Report",
        cell: (info) => (
          <div>
            <a href={`/inspector/reports/${info.row.original.id}`} className="font-semibold">
              {info.getValue()}
            </a>
            {info.row.original.revision > 1 ? <span className="ml-1 text-xs text-ink-600">rev. {info.row.original.revision}</span> : null}
            {info.row.original.isUnconfirmedAssembly ? (
              <div className="mt-0.5">
                <Badge tone="brand">New assembly to confirm</Badge>
              </div>
            ) : null}
          </div>
        ),
      }),
      column.accessor("submittedAt", {
        id: "submitted",
        header: () => (
          <button type="button" className="font-semibold uppercase tracking-wide" onClick={() => sortBy("submitted")}>
            Waiting{sortMark("submitted")}
          </button>
        ),
        cell: (info) => (
          <div className="whitespace-nowrap">
            <span className={`font-semibold tabular-nums ${info.row.original.waitingDays >= 7 ? "text-fail-700" : info.row.original.waitingDays >= 3 ? "text-caution-700" : ""}`}>{info.row.original.waitingDays === 0 ? "today" : plural(info.row.original.waitingDays, "day")}</span>
            <div className="text-xs text-ink-600">{formatInstant(info.getValue(), timezone)}</div>
          </div>
        ),
      }),
      column.accessor("testedOn", {
        id: "tested",
        header: () => (
          <button type="button" className="font-semibold uppercase tracking-wide" onClick={() => sortBy("tested")}>
            Tested{sortMark("tested")}
          </button>
        ),
        cell: (info) => <span className="whitespace-nowrap">{formatDay(info.getValue())}</span>,
      }),
      column.display({
        id: "assembly",
        header: "Assembly and site",
        cell: ({ row: { original: r } }) => (
          <div className="min-w-48">
            <span className="font-semibold">{r.kind}</span> {r.serial ? <span className="tabular-nums">#{r.serial}</span> : <span className="text-ink-600">no serial</span>}
            <div className="text-sm text-ink-800">
              <a href={`/inspector/sites/${r.siteId}`} className="text-ink-800">
                {r.siteName}
              </a>
            </div>
            <div className="text-xs text-ink-600">{r.address}</div>
          </div>
        ),
      }),
      column.display({
        id: "tester",
        header: "Tester",
        cell: ({ row: { original: r } }) => (
          <div className="min-w-36">
            {r.testerName}
            {r.company ? <div className="text-xs text-ink-600">{r.company}</div> : null}
          </div>
        ),
      }),
      column.display({ id: "grade", header: "Grade", cell: ({ row }) => <GradeBadge row={row.original} /> }),
      column.display({
        id: "credentials",
        header: "On the test date",
        cell: ({ row: { original: r } }) => (
          <div className="flex flex-col gap-0.5">
            <CredentialMark label="Certification" ok={r.certification.isValid} messages={r.certification.messages} />
            <CredentialMark label="Kit" ok={r.kit.isValid} messages={r.kit.messages} />
          </div>
        ),
      }),
      column.display({
        id: "findings",
        header: "Findings",
        cell: ({ row: { original: r } }) =>
          r.warnings.length === 0 && r.signals.length === 0 ? (
            r.isClean ? (
              <span className="text-sm text-pass-700">Clean</span>
            ) : (
              <span className="text-sm text-ink-600">—</span>
            )
          ) : (
            <ul className="min-w-48 space-y-0.5 text-xs">
              {r.signals.map((s) => (
                <li key={s.code} className="font-semibold text-fail-700" title={s.message}>
                  ⚑ {signalShort[s.code] ?? s.code}
                </li>
              ))}
              {r.warnings.map((w) => (
                <li key={w.message} className={w.severity === "error" ? "font-semibold text-fail-700" : "text-caution-700"} title={w.message}>
                  {w.severity === "error" ? "✗" : "!"} {w.message.length > 80 ? `${w.message.slice(0, 78)}…` : w.message}
                </li>
              ))}
            </ul>
          ),
      }),
  ];

  const page = data ?? initialPage;
  const table = useReactTable({ data: page.rows, columns, getCoreRowModel: getCoreRowModel(), manualPagination: true, manualSorting: true, getRowId: (r) => String(r.id) });
  const hasFilter = filterKeys.some((k) => k !== "sort" && filter[k]);
  const pageNumber = cursors.length;

  return (
    <div className="space-y-4">
      <form className="grid gap-3 rounded-lg border border-ink-200 bg-white p-4 shadow-sm sm:grid-cols-2 lg:grid-cols-6" onSubmit={(e) => e.preventDefault()} aria-label="Filter the queue">
        <Select label="Kind" value={filter.kind} onChange={(v) => set("kind", v)} options={[["", "All kinds"], ...kinds.map((k) => [k, k] as [string, string])]} />
        <Select label="Grade" value={filter.grade} onChange={(v) => set("grade", v)} options={[["", "Any grade"], ["pass", "Pass"], ["repaired", "Pass after repair"], ["fail", "Fail"]]} />
        <Select label="Tester" value={filter.testerId} onChange={(v) => set("testerId", v)} options={[["", "All testers"], ...testers.map((t) => [String(t.id), `${t.name} (${t.waiting})`] as [string, string])]} />
        <Select label="Waiting" value={filter.age} onChange={(v) => set("age", v)} options={[["", "Any time"], ["2", "More than 2 days"], ["7", "More than a week"], ["14", "More than 2 weeks"], ["30", "More than 30 days"]]} />
        <Select
          label="Findings"
          value={filter.flags}
          onChange={(v) => set("flags", v)}
          options={[
            ["", "Any"],
            ["clean", "Clean (no findings)"],
            ["flagged", "With findings"],
            ["signals", "Suspicious signals"],
            ["credentials", "Certification or kit problem"],
            ["errors", "Errors in the report"],
          ]}
        />
        <Select
          label="Order"
          value={filter.sort}
          onChange={(v) => set("sort", v)}
          options={[
            ["", "Oldest submitted first"],
            ["newest", "Newest submitted first"],
            ["tested_oldest", "Oldest test first"],
            ["tested_newest", "Newest test first"],
          ]}
        />
      </form>

      <div className="flex flex-wrap items-center justify-between gap-3">
        <p className="text-ink-800" aria-live="polite">
          {hasFilter ? (
            <>
              <span className="font-semibold tabular-nums">{formatCount(page.matching)}</span> of {formatCount(page.total)} waiting reports match.{" "}
              <button type="button" className="text-estuary-700 underline" onClick={() => update({ sort: filter.sort })}>
                Clear the filters
              </button>
            </>
          ) : (
            <>
              <span className="font-semibold tabular-nums">{formatCount(page.total)}</span> {page.total === 1 ? "report is" : "reports are"} waiting for review.
            </>
          )}
          {isLoading ? <span className="ml-2 text-sm text-ink-600">Loading…</span> : null}
        </p>
        <AcceptCleanPasses filter={filter} onDone={() => void mutate()} />
      </div>

      {error ? (
        <p role="alert" className="rounded-md border border-fail-600/30 bg-fail-50 px-4 py-3 text-sm text-fail-700">
          {(error).message}
        </p>
      ) : null}

      <div className="overflow-x-auto rounded-lg border border-ink-200 bg-white shadow-sm">
        <table className="w-full text-left text-sm">
          <thead className="border-b border-ink-200 bg-ink-50 text-xs uppercase tracking-wide text-ink-600">
            {table.getHeaderGroups().map((group) => (
              <tr key={group.id}>
                {group.headers.map((header) => (
                  <th key={header.id} scope="col" className="px-3 py-2.5 font-semibold" aria-sort={header.column.id === "submitted" || header.column.id === "tested" ? ariaSort(header.column.id) : undefined}>
                    {header.isPlaceholder ? null : flexRender(header.column.columnDef.header, header.getContext())}
                  </th>
                ))}
              </tr>
            ))}
          </thead>
          <tbody className="divide-y divide-ink-100">
            {table.getRowModel().rows.map((row) => (
              <tr key={row.id} className="align-top hover:bg-estuary-50/40">
                {row.getVisibleCells().map((cell) => (
                  <td key={cell.id} className="px-3 py-2.5">
                    {flexRender(cell.column.columnDef.cell, cell.getContext())}
                  </td>
                ))}
              </tr>
            ))}
            {page.rows.length === 0 ? (
              <tr>
                <td colSpan={columns.length} className="px-3 py-8 text-center text-ink-600">
                  {hasFilter ? "No waiting report matches these filters." : "The queue is empty: every filed report has been decided."}
                </td>
              </tr>
            ) : null}
          </tbody>
        </table>
      </div>

      <nav className="flex items-center justify-between" aria-label="Queue pages">
        <Button variant="secondary" size="sm" disabled={cursors.length <= 1} onClick={() => setCursors((c) => c.slice(0, -1))}>
          ← Previous
        </Button>
        <span className="text-sm text-ink-600">
          Page {pageNumber} · {PAGE_SIZE} per page
        </span>
        <Button variant="secondary" size="sm" disabled={!page.nextCursor} onClick={() => page.nextCursor && setCursors((c) => [...c, page.nextCursor])}>
          Next →
        </Button>
      </nav>
    </div>
  );
}

function Select({ label, value, onChange, options }: { label: string; value?: string; onChange: (value: string) => void; options: [string, string][] }) {
  const id = `queue-${label.toLowerCase()}`;
  return (
    <div className="space-y-1">
      <label htmlFor={id} className="block text-xs font-semibold uppercase tracking-wide text-ink-600">
        {label}
      </label>
      <select id={id} value={value ?? ""} onChange={(e) => onChange(e.target.value)} className="block w-full rounded-md border border-ink-200 bg-white px-2.5 py-2 text-sm">
        {options.map(([v, text]) => (
          <option key={v} value={v}>
            {text}
          </option>
        ))}
      </select>
    </div>
  );
}

type BatchState =
  | { step: "idle" }
  | { step: "counting" }
  | { step: "confirm"; ids: number[]; isCapped: boolean }
  | { step: "running"; done: number; total: number; accepted: number; skipped: { id: number; reason: string }[] }
  | { step: "done"; accepted: number; skipped: { id: number; reason: string }[] }
  | { step: "error"; message: string };

const BATCH_SIZE = 100;

/**
 * Counts the clean passes in the current filter, asks, then accepts exactly those ids in
 * batches: a report filed after the count is not in the list and is not accepted.
 */
function AcceptCleanPasses({ filter, onDone }: { filter: QueueFilterState; onDone: () => void }) {
  const [state, setState] = useState<BatchState>({ step: "idle" });
  const dialog = useRef<HTMLDialogElement>(null);

  const open = async () => {
    setState({ step: "counting" });
    dialog.current?.showModal();
    try {
      const params = new URLSearchParams();
      for (const k of ["kind", "grade", "testerId", "age"] as const) if (filter[k]) params.set(k, filter[k]);
      const result = await fetchJson<{ ids: number[]; count: number; isCapped: boolean }>(`/api/inspector/queue/clean-passes?${params.toString()}`);
      setState({ step: "confirm", ids: result.ids, isCapped: result.isCapped });
    } catch (error) {
      setState({ step: "error", message: (error as Error).message });
    }
  };

  const run = async (ids: number[]) => {
    let accepted = 0;
    const skipped: { id: number; reason: string }[] = [];
    setState({ step: "running", done: 0, total: ids.length, accepted, skipped });
    for (let i = 0; i < ids.length; i += BATCH_SIZE) {
      const batch = ids.slice(i, i + BATCH_SIZE);
      const result = await sendJson<{ accepted: { id: number }[]; skipped: { id: number; reason: string }[] }>("POST", "/api/inspector/reports/accept-clean", { ids: batch });
      if (!result.ok) {
        setState({ step: "error", message: `${result.error} ${accepted} report${accepted === 1 ? " was" : "s were"} accepted before this.` });
        onDone();
        return;
      }
      accepted += result.data.accepted.length;
      skipped.push(...result.data.skipped);
      setState({ step: "running", done: Math.min(ids.length, i + batch.length), total: ids.length, accepted, skipped: [...skipped] });
    }
    setState({ step: "done", accepted, skipped });
    onDone();
  };

  const close = () => {
    dialog.current?.close();
    setState({ step: "idle" });
  };

  return (
    <>
      <Button onClick={() => void open()} disabled={state.step === "counting"}>
        Accept all clean passes…
      </Button>
      <dialog ref={dialog} className="m-auto w-full max-w-lg rounded-lg border border-ink-200 p-0 shadow-xl backdrop:bg-ink-900/40" onCancel={(e) => state.step === "running" && e.preventDefault()} aria-labelledby="accept-clean-title">
        <div className="space-y-4 p-5">
          <h2 id="accept-clean-title">Accept all clean passes</h2>
          {state.step === "counting" ? <p className="text-ink-600">Counting the clean passes in this filter…</p> : null}
          {state.step === "confirm" ? (
            state.ids.length === 0 ? (
              <>
                <p>No clean passing report waits in this filter.</p>
                <div className="flex justify-end">
                  <Button variant="secondary" onClick={close}>
                    Close
                  </Button>
                </div>
              </>
            ) : (
              <>
                <p>
                  Accept <strong className="tabular-nums">{formatCount(state.ids.length)}</strong> {state.ids.length === 1 ? "report" : "reports"} that passed with no finding at all
                  {filter.kind || filter.grade || filter.testerId || filter.age ? " in the current filter" : ""}?
                </p>
                <p className="text-sm text-ink-600">Each gets its own review, audit entry and compliance certificate, and its tester is e-mailed. Reports that arrive after this count are not included. A report another inspector decides meanwhile is skipped.</p>
                {state.isCapped ? <p className="text-sm text-caution-700">This is the first {formatCount(state.ids.length)}; run it again for the rest.</p> : null}
                <div className="flex justify-end gap-2">
                  <Button variant="secondary" onClick={close}>
                    Cancel
                  </Button>
                  <Button onClick={() => void run(state.ids)}>Accept {formatCount(state.ids.length)}</Button>
                </div>
              </>
            )
          ) : null}
          {state.step === "running" ? (
            <div className="space-y-2" aria-live="polite">
              <p>
                Accepting… {formatCount(state.done)} of {formatCount(state.total)}
              </p>
              <progress className="h-3 w-full accent-estuary-700" max={state.total} value={state.done} />
            </div>
          ) : null}
          {state.step === "done" ? (
            <div className="space-y-3" role="status">
              <p>
                <strong>{plural(state.accepted, "report")}</strong> accepted.
                {state.skipped.length ? ` ${plural(state.skipped.length, "report was", "reports were")} skipped:` : ""}
              </p>
              {state.skipped.length ? (
                <ul className="max-h-40 list-inside list-disc overflow-y-auto text-sm text-ink-800">
                  {state.skipped.map((s) => (
                    <li key={s.id}>{s.reason}</li>
                  ))}
                </ul>
              ) : null}
              <div className="flex justify-end">
                <Button onClick={close}>Close</Button>
              </div>
            </div>
          ) : null}
          {state.step === "error" ? (
            <div className="space-y-3">
              <p role="alert" className="text-fail-700">
                {state.message}
              </p>
              <div className="flex justify-end">
                <Button variant="secondary" onClick={close}>
                  Close
                </Button>
              </div>
            </div>
          ) : null}
        </div>
      </dialog>
    </>
  );
}
