"use client";

import { createColumnHelper, flexRender, getCoreRowModel, useReactTable, type PaginationState, type SortingState } from "@tanstack/react-table";
import { useEffect, useMemo, useState } from "react";
import useSWR from "swr";
import { Alert } from "@/components/ui/alert";
import { Button } from "@/components/ui/button";
import { inputClass } from "@/components/ui/field";
import type { MyReportRow, MyReportsPage } from "@/lib/data/tester-reports";
import { OutcomeBadge, ReportStatusBadge } from "./report-status-badge";

export interface ReportFilters {
  status: string;
  from: string;
  to: string;
  q: string;
  sort: string;
  dir: "asc" | "desc";
  page: number;
  pageSize: number;
}

const statusOptions = [
  ["", "All current reports"],
  ["open", "Waiting for review or fee"],
  ["returned", "Returned for correction"],
  ["accepted", "Accepted"],
  ["awaiting_fee", "Filing fee owed"],
  ["all", "All, with replaced revisions"],
] as const;

const sortable = new Set(["reportNumber", "testedOn", "status", "outcome", "submittedAt"]);

async function fetchPage(url: string): Promise<MyReportsPage> {
  const response = await fetch(url);
  const body = (await response.json().catch(() => null)) as (MyReportsPage & { error?: string }) | null;
  if (!response.ok) throw new Error(body?.error ?? "The reports could not be loaded; try again.");
  return body as MyReportsPage;
}

const column = createColumnHelper<MyReportRow>();

/** The tester's reports: sorted, filtered and paginated on the server; a table on a desk, cards on a phone. */
export function MyReportsTable({ initialFilters }: { initialFilters: ReportFilters }) {
  const [filters, setFilters] = useState(initialFilters);
  const [search, setSearch] = useState(initialFilters.q);
  useEffect(() => {
    const id = setTimeout(() => setFilters((f) => (f.q === search.trim() ? f : { ...f, q: search.trim(), page: 1 })), 300);
    return () => clearTimeout(id);
  }, [search]);
  const query = useMemo(() => {
    const params = new URLSearchParams();
    params.set("page", String(filters.page));
    params.set("pageSize", String(filters.pageSize));
    params.set("sort", filters.sort);
    params.set("dir", filters.dir);
    if (filters.status) params.set("status", filters.status);
    if (filters.from) params.set("from", filters.from);
    if (filters.to) params.set("to", filters.to);
    if (filters.q) params.set("q", filters.q);
    return params.toString();
  }, [filters]);
  // The address bar keeps the view, so a reload or a shared link shows the same page.
  useEffect(() => {
    window.history.replaceState(null, "", `/tester/reports?${query}`);
  }, [query]);
  const reports = useSWR<MyReportsPage, Error>(`/api/reports/mine?${query}`, fetchPage, { keepPreviousData: true });
  const { data, isLoading } = reports;
  const error: Error | undefined = reports.error;

  const columns = useMemo(
    () => [
      column.accessor("reportNumber", {
        header: "Report",
        cell: (info) => (
          <a href={`/tester/reports/${info.row.original.id}`} className="font-semibold">
            {info.getValue()}
            {info.row.original.revision > 1 ? ` rev. ${info.row.original.revision}` : ""}
          </a>
        ),
      }),
      column.accessor("testedOn", { header: "Tested", cell: (info) => <span className="tabular-nums">{info.getValue()}</span> }),
      column.accessor("addressLine1", {
        id: "site",
        header: "Site",
        enableSorting: false,
        cell: (info) => (
          <span>
            {info.getValue()}, {info.row.original.city}
            <span className="block text-xs text-ink-600">{info.row.original.siteName}</span>
          </span>
        ),
      }),
      column.accessor("serial", { id: "assembly", header: "Assembly", enableSorting: false, cell: (info) => `${info.row.original.kind} ${info.getValue()}` }),
      column.accessor("finalOutcome", { id: "outcome", header: "Result", cell: (info) => <OutcomeBadge finalOutcome={info.getValue()} wasRepaired={info.row.original.wasRepaired} /> }),
      column.accessor("status", {
        header: "Status",
        cell: (info) => (
          <span>
            <ReportStatusBadge status={info.getValue()} />
            {info.row.original.returnReasons.length ? <span className="mt-1 block max-w-56 text-xs text-fail-700">{info.row.original.returnReasons.join("; ")}</span> : null}
          </span>
        ),
      }),
      column.accessor("submittedAt", { header: "Filed", cell: (info) => <span className="tabular-nums">{info.getValue().slice(0, 10)}</span> }),
    ],
    [],
  );
  const sorting: SortingState = [{ id: filters.sort, desc: filters.dir === "desc" }];
  const pagination: PaginationState = { pageIndex: filters.page - 1, pageSize: filters.pageSize };
  const table = useReactTable({
    data: data?.rows ?? [],
    columns,
    getCoreRowModel: getCoreRowModel(),
    manualPagination: true,
    manualSorting: true,
    pageCount: data?.pageCount ?? -1,
    state: { sorting, pagination },
    onSortingChange: (updater) => {
      const next = typeof updater === "function" ? updater(sorting) : updater;
      const first = next[0];
      setFilters((f) => ({ ...f, sort: first && sortable.has(first.id) ? first.id : "testedOn", dir: first ? (first.desc ? "desc" : "asc") : "desc", page: 1 }));
    },
    onPaginationChange: (updater) => {
      const next = typeof updater === "function" ? updater(pagination) : updater;
      setFilters((f) => ({ ...f, page: next.pageIndex + 1, pageSize: next.pageSize }));
    },
  });
  const set = (patch: Partial<ReportFilters>) => setFilters((f) => ({ ...f, ...patch, page: 1 }));
  const total = data?.total ?? 0;

  return (
    <div className="space-y-4">
      <div className="grid gap-3 rounded-lg border border-ink-200 bg-white px-4 py-3 shadow-sm sm:grid-cols-2 lg:grid-cols-5">
        <label className="block text-sm font-semibold lg:col-span-2">
          Status
          <select className={`${inputClass} mt-1 min-h-12`} value={filters.status} onChange={(e) => set({ status: e.target.value })} data-testid="status-filter">
            {statusOptions.map(([value, label]) => (
              <option key={value} value={value}>
                {label}
              </option>
            ))}
          </select>
        </label>
        <label className="block text-sm font-semibold">
          Tested from
          <input type="date" className={`${inputClass} mt-1 min-h-12`} value={filters.from} onChange={(e) => set({ from: e.target.value })} />
        </label>
        <label className="block text-sm font-semibold">
          to
          <input type="date" className={`${inputClass} mt-1 min-h-12`} value={filters.to} onChange={(e) => set({ to: e.target.value })} />
        </label>
        <label className="block text-sm font-semibold">
          Report number or serial
          <input type="search" className={`${inputClass} mt-1 min-h-12`} value={search} placeholder="QV-2026-…" onChange={(e) => setSearch(e.target.value.slice(0, 40))} />
        </label>
      </div>

      {error ? <Alert tone="danger">{error.message}</Alert> : null}
      <p className="text-sm text-ink-600" aria-live="polite" data-testid="report-count">
        {isLoading && !data ? "Loading…" : `${total.toLocaleString("en-US")} report${total === 1 ? "" : "s"} · page ${filters.page} of ${data?.pageCount ?? 1}`}
      </p>

      {/* Desk: a sortable table. */}
      <div className="hidden overflow-x-auto rounded-lg border border-ink-200 bg-white shadow-sm md:block">
        <table className="min-w-full text-sm">
          <thead className="bg-ink-50 text-left">
            {table.getHeaderGroups().map((group) => (
              <tr key={group.id}>
                {group.headers.map((header) => {
                  const canSort = header.column.getCanSort() && sortable.has(header.column.id);
                  const direction = filters.sort === header.column.id ? filters.dir : null;
                  return (
                    <th key={header.id} scope="col" className="px-3 py-2 font-semibold text-ink-800" aria-sort={direction === "asc" ? "ascending" : direction === "desc" ? "descending" : undefined}>
                      {canSort ? (
                        <button type="button" onClick={header.column.getToggleSortingHandler()} className="inline-flex items-center gap-1 font-semibold hover:text-estuary-700">
                          {flexRender(header.column.columnDef.header, header.getContext())}
                          <span aria-hidden="true">{direction === "asc" ? "▲" : direction === "desc" ? "▼" : "↕"}</span>
                        </button>
                      ) : (
                        flexRender(header.column.columnDef.header, header.getContext())
                      )}
                    </th>
                  );
                })}
              </tr>
            ))}
          </thead>
          <tbody className="divide-y divide-ink-100">
            {table.getRowModel().rows.map((row) => (
              <tr key={row.id} className={row.original.status === "returned" ? "bg-fail-50" : undefined}>
                {row.getVisibleCells().map((cell) => (
                  <td key={cell.id} className="px-3 py-2 align-top">
                    {flexRender(cell.column.columnDef.cell, cell.getContext())}
                  </td>
                ))}
              </tr>
            ))}
          </tbody>
        </table>
      </div>

      {/* Phone: one card per report, with the sort picked from a list. */}
      <div className="md:hidden">
        <label className="mb-2 block text-sm font-semibold">
          Sort by
          <select
            className={`${inputClass} mt-1 min-h-12`}
            value={`${filters.sort}:${filters.dir}`}
            onChange={(e) => {
              const [sort, dir] = e.target.value.split(":");
              set({ sort: sort!, dir: dir as "asc" | "desc" });
            }}
          >
            <option value="testedOn:desc">Newest test first</option>
            <option value="testedOn:asc">Oldest test first</option>
            <option value="submittedAt:desc">Newest filing first</option>
            <option value="status:asc">Status</option>
            <option value="outcome:desc">Failed first</option>
            <option value="reportNumber:asc">Report number</option>
          </select>
        </label>
        <ul className="space-y-2">
          {table.getRowModel().rows.map(({ original: r }) => (
            <li key={r.id}>
              <a href={`/tester/reports/${r.id}`} className={`block rounded-lg border px-4 py-3 text-ink-900 no-underline shadow-sm ${r.status === "returned" ? "border-fail-600/40 bg-fail-50" : "border-ink-200 bg-white"}`}>
                <span className="flex flex-wrap items-center justify-between gap-2">
                  <span className="font-bold text-estuary-800">
                    {r.reportNumber}
                    {r.revision > 1 ? ` rev. ${r.revision}` : ""}
                  </span>
                  <ReportStatusBadge status={r.status} />
                </span>
                <span className="mt-1 block text-sm">
                  {r.addressLine1}, {r.city} · {r.kind} {r.serial}
                </span>
                <span className="mt-1 flex flex-wrap items-center gap-2 text-sm text-ink-600">
                  Tested {r.testedOn} <OutcomeBadge finalOutcome={r.finalOutcome} wasRepaired={r.wasRepaired} />
                </span>
                {r.returnReasons.length ? <span className="mt-1 block text-sm text-fail-700">Returned: {r.returnReasons.join("; ")}</span> : null}
              </a>
            </li>
          ))}
        </ul>
      </div>
      {data && data.rows.length === 0 ? <p className="text-ink-600">No report matches these filters.</p> : null}

      <div className="flex flex-wrap items-center justify-between gap-3">
        <div className="flex gap-2">
          <Button variant="secondary" size="lg" onClick={() => table.previousPage()} disabled={filters.page <= 1}>
            ← Previous
          </Button>
          <Button variant="secondary" size="lg" onClick={() => table.nextPage()} disabled={!data || filters.page >= data.pageCount}>
            Next →
          </Button>
        </div>
        <label className="flex items-center gap-2 whitespace-nowrap text-sm">
          Per page
          <select className={`${inputClass} min-h-12 w-24`} value={filters.pageSize} onChange={(e) => table.setPageSize(Number(e.target.value))}>
            {[10, 20, 50, 100].map((size) => (
              <option key={size} value={size}>
                {size}
              </option>
            ))}
          </select>
        </label>
      </div>
    </div>
  );
}
