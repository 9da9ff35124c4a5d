import type { Metadata } from "next";
import { formatInstant } from "@/components/inspector/format";
import { Alert } from "@/components/ui/alert";
import { ButtonLink } from "@/components/ui/button";
import { InputError } from "@/lib/errors";
import { Card, PageHeader } from "@/components/ui/card";
import { requirePermission } from "@/lib/auth/guards";
import { auditQuerySchema, getAuditFilterOptions, listAuditLog } from "@/lib/data/audit-log";
import { getStaffProgramContext } from "@/lib/data/settings";

export const metadata: Metadata = { title: "Audit log" };

function entityHref(type: string, id: string): string | null {
  switch (type) {
    case "test_report":
      return `/inspector/reports/${id}`;
    case "assembly":
      return `/inspector/assemblies/${id}`;
    case "site":
      return `/inspector/sites/${id}`;
    case "owner":
      return `/inspector/owners/${id}`;
    case "tester_approval":
      return `/inspector/testers/${id}`;
    case "import_job":
      return `/inspector/inventory/import?job=${id}`;
    default:
      return null;
  }
}

function Change({ before, after }: { before: unknown; after: unknown }) {
  if (before === null && after === null) return null;
  const text = (v: unknown) => (v === null || v === undefined ? "" : JSON.stringify(v, null, 1).slice(0, 2000));
  return (
    <details className="text-xs">
      <summary className="cursor-pointer text-estuary-700">details</summary>
      <div className="mt-1 grid gap-2 sm:grid-cols-2">
        {before !== null ? (
          <pre className="overflow-x-auto whitespace-pre-wrap rounded bg-ink-50 p-2">
            <span className="font-semibold">before </span>
            {text(before)}
          </pre>
        ) : null}
        {after !== null ? (
          <pre className="overflow-x-auto whitespace-pre-wrap rounded bg-ink-50 p-2">
            <span className="font-semibold">after </span>
            {text(after)}
          </pre>
        ) : null}
      </div>
    </details>
  );
}

export default async function AuditPage({ searchParams }: { searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  const actor = await requirePermission("audit.view");
  const raw = Object.fromEntries(Object.entries(await searchParams).map(([k, v]) => [k, (Array.isArray(v) ? v[0] : v) || undefined]));
  const query = auditQuerySchema.parse(raw);
  const [options, context] = await Promise.all([getAuditFilterOptions(actor), getStaffProgramContext(actor)]);
  let page: Awaited<ReturnType<typeof listAuditLog>> = { rows: [], next: null };
  let problem: string | null = null;
  try {
    page = await listAuditLog(actor, query);
  } catch (error) {
    if (!(error instanceof InputError)) throw error;
    problem = error.message;
  }
  const filterParams = new URLSearchParams(Object.entries({ ...query, before: undefined }).filter(([, v]) => v !== undefined && v !== "").map(([k, v]) => [k, String(v)]));
  const groups = [...new Set(options.actionGroups.map((a) => `${a.split(".")[0]}.`))];
  return (
    <>
      <PageHeader
        title="Audit log"
        description="Every change of state in the program, newest first: who did what to which record, with the values before and after. Entries are never changed or removed."
        actions={
          <ButtonLink href={`/api/admin/audit/csv${filterParams.size ? `?${filterParams.toString()}` : ""}`} variant="secondary" size="sm">
            Export these entries (CSV)
          </ButtonLink>
        }
      />
      <form className="mb-4 grid gap-3 rounded-lg border border-ink-200 bg-white p-4 shadow-sm sm:grid-cols-3 lg:grid-cols-6" action="/admin/audit">
        <div>
          <label htmlFor="actorId" className="block text-xs font-semibold uppercase tracking-wide text-ink-600">
            Who
          </label>
          <select id="actorId" name="actorId" defaultValue={query.actorId ? String(query.actorId) : ""} className="block w-full rounded-md border border-ink-200 px-2 py-2 text-sm">
            <option value="">Anyone</option>
            {options.actors.map((a) => (
              <option key={a.id} value={a.id}>
                {a.name}
              </option>
            ))}
          </select>
        </div>
        <div>
          <label htmlFor="action" className="block text-xs font-semibold uppercase tracking-wide text-ink-600">
            Action
          </label>
          <select id="action" name="action" defaultValue={query.action ?? ""} className="block w-full rounded-md border border-ink-200 px-2 py-2 text-sm">
            <option value="">Any action</option>
            {groups.map((g) => (
              <optgroup key={g} label={g.slice(0, -1)}>
                <option value={g}>any {g.slice(0, -1)} action</option>
                {options.actionGroups
                  .filter((a) => a.startsWith(g))
                  .map((a) => (
                    <option key={a} value={a}>
                      {a}
                    </option>
                  ))}
              </optgroup>
            ))}
          </select>
        </div>
        <div>
          <label htmlFor="entityType" className="block text-xs font-semibold uppercase tracking-wide text-ink-600">
            Record
          </label>
          <select id="entityType" name="entityType" defaultValue={query.entityType ?? ""} className="block w-full rounded-md border border-ink-200 px-2 py-2 text-sm">
            <option value="">Any record</option>
            {options.entityTypes.map((t) => (
              <option key={t}>{t}</option>
            ))}
          </select>
        </div>
        <div>
          <label htmlFor="entityId" className="block text-xs font-semibold uppercase tracking-wide text-ink-600">
            Record id
          </label>
          <input id="entityId" name="entityId" defaultValue={query.entityId ?? ""} className="block w-full rounded-md border border-ink-200 px-2 py-2 text-sm" />
        </div>
        <div>
          <label htmlFor="from" className="block text-xs font-semibold uppercase tracking-wide text-ink-600">
            From
          </label>
          <input id="from" name="from" type="date" defaultValue={query.from ?? ""} className="block w-full rounded-md border border-ink-200 px-2 py-2 text-sm" />
        </div>
        <div>
          <label htmlFor="to" className="block text-xs font-semibold uppercase tracking-wide text-ink-600">
            To
          </label>
          <input id="to" name="to" type="date" defaultValue={query.to ?? ""} className="block w-full rounded-md border border-ink-200 px-2 py-2 text-sm" />
        </div>
        <div className="flex gap-2 sm:col-span-3 lg:col-span-6">
          <button className="rounded-md bg-estuary-700 px-4 py-2 font-semibold text-white">Filter</button>
          {filterParams.size ? (
            <a href="/admin/audit" className="self-center">
              Clear
            </a>
          ) : null}
        </div>
      </form>
      {problem ? (
        <div className="mb-4">
          <Alert tone="danger">{problem}</Alert>
        </div>
      ) : null}
      <Card>
        <div className="overflow-x-auto">
          <table className="w-full text-left text-sm">
            <thead className="border-b border-ink-200 text-xs uppercase tracking-wide text-ink-600">
              <tr>
                <th className="py-2 pr-3">When</th>
                <th className="py-2 pr-3">Who</th>
                <th className="py-2 pr-3">Action</th>
                <th className="py-2 pr-3">Record</th>
                <th className="py-2">Change</th>
              </tr>
            </thead>
            <tbody className="divide-y divide-ink-100">
              {page.rows.map((r) => {
                const href = entityHref(r.entityType, r.entityId);
                return (
                  <tr key={r.id} className="align-top">
                    <td className="whitespace-nowrap py-2 pr-3">{formatInstant(r.at, context.timezone)}</td>
                    <td className="py-2 pr-3">{r.actorName ?? <span className="text-ink-600">system</span>}</td>
                    <td className="py-2 pr-3 font-mono text-xs">{r.action}</td>
                    <td className="py-2 pr-3">
                      {r.entityType} {href ? <a href={href}>#{r.entityId}</a> : `#${r.entityId}`}
                    </td>
                    <td className="py-2">
                      <Change before={r.before} after={r.after} />
                    </td>
                  </tr>
                );
              })}
            </tbody>
          </table>
        </div>
        {page.rows.length === 0 ? <p className="py-6 text-center text-ink-600">No entry matches.</p> : null}
        {page.next ? (
          <p className="mt-4 text-center">
            <a href={`/admin/audit?${new URLSearchParams({ ...Object.fromEntries(filterParams), before: page.next }).toString()}`} className="font-semibold">
              Older entries →
            </a>
          </p>
        ) : null}
      </Card>
    </>
  );
}
