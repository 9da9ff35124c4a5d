import type { Metadata } from "next";
import { formatCount, formatDay, hazardShort, stateLabel, stateTone } from "@/components/inspector/format";
import { Badge } from "@/components/ui/badge";
import { ButtonLink } from "@/components/ui/button";
import { Card, PageHeader } from "@/components/ui/card";
import { requirePermission } from "@/lib/auth/guards";
import { getInventoryCounts, inventorySearchSchema, searchInventory, type InventorySearch } from "@/lib/data/inventory-search";

export const metadata: Metadata = { title: "Inventory" };

const views = [
  ["sites", "Sites"],
  ["assemblies", "Assemblies"],
  ["owners", "Owners"],
] as const;

function hrefWith(search: InventorySearch, changes: Partial<Record<keyof InventorySearch, string | number | undefined>>): string {
  const params = new URLSearchParams();
  const merged = { ...search, after: 0, ...changes } as Record<string, unknown>;
  for (const [key, value] of Object.entries(merged)) {
    if (value === undefined || value === "" || value === 0 || (key === "show" && value === "all") || (key === "view" && value === "sites")) continue;
    params.set(key, typeof value === "number" ? String(value) : typeof value === "string" ? value : "");
  }
  return `/inspector/inventory${params.size ? `?${params.toString()}` : ""}`;
}

export default async function InventoryPage({ searchParams }: { searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  const actor = await requirePermission("inventory.view");
  const raw = Object.fromEntries(Object.entries(await searchParams).map(([k, v]) => [k, Array.isArray(v) ? v[0] : v]));
  const search = inventorySearchSchema.parse(raw);
  const [result, counts] = await Promise.all([searchInventory(actor, search), getInventoryCounts(actor)]);
  return (
    <>
      <PageHeader
        title="Inventory"
        description="The program's sites, their assemblies and owners. Search by account number, serial, name or street; account numbers and serials match from their start."
        actions={
          <>
            <ButtonLink href="/inspector/sites/new" variant="secondary" size="sm">
              Add a site
            </ButtonLink>
            <ButtonLink href="/inspector/inventory/import" size="sm">
              Import a CSV
            </ButtonLink>
          </>
        }
      />
      <div className="mb-4 flex flex-wrap gap-2 text-sm">
        <a className="rounded-full border border-ink-200 bg-white px-3 py-1 no-underline" href={hrefWith(search, { view: "sites", show: "all", q: "" })}>
          {formatCount(counts.sites)} sites
        </a>
        <a className="rounded-full border border-ink-200 bg-white px-3 py-1 no-underline" href={hrefWith(search, { view: "assemblies", show: "all", q: "" })}>
          {formatCount(counts.inService)} assemblies in service
        </a>
        <a className={`rounded-full border px-3 py-1 no-underline ${counts.awaitingConfirmation ? "border-estuary-300 bg-estuary-50" : "border-ink-200 bg-white"}`} href={hrefWith(search, { view: "assemblies", show: "awaiting", q: "" })}>
          {formatCount(counts.awaitingConfirmation)} field registrations to confirm
        </a>
        <a className={`rounded-full border px-3 py-1 no-underline ${counts.mismatches ? "border-caution-600/40 bg-caution-50 text-caution-700" : "border-ink-200 bg-white"}`} href={hrefWith(search, { view: "assemblies", show: "mismatch", q: "" })}>
          ⚠ {formatCount(counts.mismatches)} kind does not match the hazard
        </a>
        <a className="rounded-full border border-ink-200 bg-white px-3 py-1 no-underline" href={hrefWith(search, { view: "assemblies", show: "out_of_service", q: "" })}>
          {formatCount(counts.outOfService)} out of service
        </a>
      </div>
      <Card>
        <nav aria-label="What to search" className="mb-4 flex gap-1 border-b border-ink-100">
          {views.map(([view, label]) => (
            <a key={view} href={hrefWith(search, { view, show: view === "assemblies" ? search.show : "all" })} aria-current={search.view === view ? "page" : undefined} className={`-mb-px border-b-2 px-4 py-2 font-semibold no-underline ${search.view === view ? "border-estuary-700 text-estuary-800" : "border-transparent text-ink-600 hover:text-ink-900"}`}>
              {label}
            </a>
          ))}
        </nav>
        <form className="mb-4 flex flex-wrap items-end gap-3" action="/inspector/inventory">
          <input type="hidden" name="view" value={search.view} />
          <div className="min-w-64 flex-1">
            <label htmlFor="q" className="block text-xs font-semibold uppercase tracking-wide text-ink-600">
              Search
            </label>
            <input id="q" name="q" type="search" defaultValue={search.q} placeholder={search.view === "owners" ? "Name, e-mail or phone" : search.view === "assemblies" ? "Serial, account, site name, street or location" : "Account, site name, street or contact"} className="block w-full rounded-md border border-ink-200 px-3 py-2" />
          </div>
          {search.view === "assemblies" ? (
            <>
              <div>
                <label htmlFor="show" className="block text-xs font-semibold uppercase tracking-wide text-ink-600">
                  Show
                </label>
                <select id="show" name="show" defaultValue={search.show} className="rounded-md border border-ink-200 px-2.5 py-2">
                  <option value="all">All</option>
                  <option value="awaiting">Field registrations to confirm</option>
                  <option value="mismatch">Kind does not match the hazard</option>
                  <option value="out_of_service">Out of service</option>
                </select>
              </div>
              <div>
                <label htmlFor="kind" className="block text-xs font-semibold uppercase tracking-wide text-ink-600">
                  Kind
                </label>
                <select id="kind" name="kind" defaultValue={search.kind ?? ""} className="rounded-md border border-ink-200 px-2.5 py-2">
                  <option value="">All</option>
                  {["RP", "RPDA", "DC", "DCDA", "PVB", "SVB", "AG"].map((k) => (
                    <option key={k}>{k}</option>
                  ))}
                </select>
              </div>
            </>
          ) : null}
          {search.view !== "owners" ? (
            <div>
              <label htmlFor="hazard" className="block text-xs font-semibold uppercase tracking-wide text-ink-600">
                Hazard
              </label>
              <select id="hazard" name="hazard" defaultValue={search.hazard ?? ""} className="rounded-md border border-ink-200 px-2.5 py-2">
                <option value="">All</option>
                <option value="severe">Severe</option>
                <option value="high">High</option>
                <option value="low">Low</option>
              </select>
            </div>
          ) : null}
          <button className="rounded-md bg-estuary-700 px-4 py-2 font-semibold text-white">Search</button>
        </form>

        {result.view === "sites" ? (
          <table className="w-full text-left text-sm">
            <thead className="border-b border-ink-200 text-xs uppercase tracking-wide text-ink-600">
              <tr>
                <th className="py-2 pr-3">Account</th>
                <th className="py-2 pr-3">Site</th>
                <th className="py-2 pr-3">Address</th>
                <th className="py-2 pr-3">Facility</th>
                <th className="py-2 pr-3">Hazard</th>
                <th className="py-2">Assemblies</th>
              </tr>
            </thead>
            <tbody className="divide-y divide-ink-100">
              {result.hits.map((s) => (
                <tr key={s.id}>
                  <td className="py-2 pr-3 tabular-nums">{s.accountNumber}</td>
                  <td className="py-2 pr-3">
                    <a href={`/inspector/sites/${s.id}`} className="font-semibold">
                      {s.name}
                    </a>
                    {s.isActive ? null : <span className="ml-2 text-xs text-ink-600">(inactive)</span>}
                  </td>
                  <td className="py-2 pr-3">{s.address}</td>
                  <td className="py-2 pr-3">{s.facilityType}</td>
                  <td className="py-2 pr-3">{hazardShort[s.hazard]}</td>
                  <td className="py-2 tabular-nums">{s.assemblyCount}</td>
                </tr>
              ))}
            </tbody>
          </table>
        ) : null}

        {result.view === "assemblies" ? (
          <table className="w-full text-left text-sm">
            <thead className="border-b border-ink-200 text-xs uppercase tracking-wide text-ink-600">
              <tr>
                <th className="py-2 pr-3">Assembly</th>
                <th className="py-2 pr-3">Site</th>
                <th className="py-2 pr-3">Hazard</th>
                <th className="py-2 pr-3">Status today</th>
                <th className="py-2">Warnings</th>
              </tr>
            </thead>
            <tbody className="divide-y divide-ink-100">
              {result.hits.map((a) => (
                <tr key={a.id} className="align-top">
                  <td className="py-2 pr-3">
                    <a href={`/inspector/assemblies/${a.id}`} className="font-semibold">
                      {a.kind} {a.serial ? `#${a.serial}` : "(no serial)"}
                    </a>
                    <div className="text-xs text-ink-600">{[a.make, a.model].filter(Boolean).join(" ")} · {a.location}</div>
                  </td>
                  <td className="py-2 pr-3">
                    <a href={`/inspector/sites/${a.siteId}`}>{a.siteName}</a>
                    <div className="text-xs text-ink-600">{a.address}</div>
                  </td>
                  <td className="py-2 pr-3">{hazardShort[a.hazard]}</td>
                  <td className="py-2 pr-3">
                    {a.status === "awaiting_confirmation" ? <Badge tone="brand">To confirm</Badge> : a.status === "active" ? <Badge tone={stateTone[a.state]}>{stateLabel[a.state]}</Badge> : <Badge tone="neutral">{a.status === "replaced" ? "Replaced" : "Removed"}</Badge>}
                    {a.nextDueOn && a.status === "active" ? <div className="text-xs text-ink-600">due {formatDay(a.nextDueOn)}</div> : null}
                  </td>
                  <td className="py-2 text-xs text-caution-700">
                    {a.warnings.map((w) => (
                      <p key={w}>⚠ {w}</p>
                    ))}
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        ) : null}

        {result.view === "owners" ? (
          <table className="w-full text-left text-sm">
            <thead className="border-b border-ink-200 text-xs uppercase tracking-wide text-ink-600">
              <tr>
                <th className="py-2 pr-3">Owner</th>
                <th className="py-2 pr-3">E-mail</th>
                <th className="py-2 pr-3">Phone</th>
                <th className="py-2 pr-3">Sites</th>
                <th className="py-2">Owner portal</th>
              </tr>
            </thead>
            <tbody className="divide-y divide-ink-100">
              {result.hits.map((o) => (
                <tr key={o.id}>
                  <td className="py-2 pr-3">
                    <a href={`/inspector/owners/${o.id}`} className="font-semibold">
                      {o.name}
                    </a>
                  </td>
                  <td className="py-2 pr-3">{o.email ?? <span className="text-ink-600">none — letters</span>}</td>
                  <td className="py-2 pr-3">{o.phone}</td>
                  <td className="py-2 pr-3 tabular-nums">{o.siteCount}</td>
                  <td className="py-2">{o.portal === "active" ? "uses it" : o.portal === "invited" ? "invited" : o.portal === "disabled" ? "disabled" : "—"}</td>
                </tr>
              ))}
            </tbody>
          </table>
        ) : null}

        {result.hits.length === 0 ? <p className="py-6 text-center text-ink-600">Nothing matches{search.q ? ` “${search.q}”` : ""}.</p> : null}
        {result.nextAfter ? (
          <p className="mt-4 text-center">
            <a href={hrefWith(search, { after: result.nextAfter })} className="font-semibold">
              More results →
            </a>
          </p>
        ) : null}
      </Card>
    </>
  );
}
