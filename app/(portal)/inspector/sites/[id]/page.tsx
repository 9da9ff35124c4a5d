import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { formatDay, hazardShort, noticeStageLabel, stateLabel, stateTone } from "@/components/inspector/format";
import { AddOwnerForm, AssemblyForm, OwnerLinkControls, SiteForm } from "@/components/inspector/inventory-forms";
import { Badge } from "@/components/ui/badge";
import { Card, PageHeader } from "@/components/ui/card";
import { requirePermission } from "@/lib/auth/guards";
import { can } from "@/lib/auth/permissions";
import { listFacilityTypes } from "@/lib/data/inventory-search";
import { getSiteForStaff } from "@/lib/data/inventory-sites";
import { NotFoundError } from "@/lib/errors";

export const metadata: Metadata = { title: "Site" };

export default async function SitePage({ params }: { params: Promise<{ id: string }> }) {
  const actor = await requirePermission("inventory.view");
  const id = Number((await params).id);
  if (!Number.isInteger(id) || id <= 0) notFound();
  const site = await getSiteForStaff(actor, id).catch((error: unknown) => {
    if (error instanceof NotFoundError) notFound();
    throw error;
  });
  const canManage = can(actor, "inventory.manage");
  const facilityTypes = canManage ? await listFacilityTypes(actor) : [];
  const inService = site.assemblies.filter((a) => a.status === "active" || a.status === "awaiting_confirmation");
  const outOfService = site.assemblies.filter((a) => a.status === "removed" || a.status === "replaced");
  return (
    <>
      <p className="mb-2 text-sm">
        <a href="/inspector/inventory">← Inventory</a>
      </p>
      <PageHeader
        title={site.name}
        description={`${[site.addressLine1, site.addressLine2, site.city, site.postalCode].filter(Boolean).join(", ")} · account ${site.accountNumber} · ${hazardShort[site.hazard]} hazard${site.facilityType ? ` · ${site.facilityType}` : ""}${site.isActive ? "" : " · inactive"}`}
      />
      <div className="grid gap-6 lg:grid-cols-[minmax(0,3fr)_minmax(0,2fr)]">
        <div className="space-y-6">
          <Card title={`Assemblies in service (${inService.length})`}>
            {inService.length === 0 ? <p className="text-ink-600">No assembly in service at this site.</p> : null}
            <ul className="divide-y divide-ink-100">
              {inService.map((a) => (
                <li key={a.id} className="py-3">
                  <div className="flex flex-wrap items-center gap-2">
                    <a href={`/inspector/assemblies/${a.id}`} className="font-semibold">
                      {a.kind} {a.serial ? `#${a.serial}` : "(no serial)"}
                    </a>
                    {a.status === "awaiting_confirmation" ? <Badge tone="brand">Field registration to confirm</Badge> : <Badge tone={stateTone[a.state]}>{stateLabel[a.state]}</Badge>}
                    {a.noticeStage ? <Badge tone="muted">{noticeStageLabel[a.noticeStage]}</Badge> : null}
                  </div>
                  <p className="text-sm text-ink-600">
                    {[a.make, a.model, a.size].filter(Boolean).join(" · ")} · {a.location || "location not recorded"} · {hazardShort[a.hazard]} hazard
                  </p>
                  <p className="text-sm">
                    Last test {a.lastTestedOn ? `${formatDay(a.lastTestedOn)} (${a.lastOutcome})` : "none on file"} · {a.repairDueOn ? `repair due ${formatDay(a.repairDueOn)}` : a.nextDueOn ? `next due ${formatDay(a.nextDueOn)}` : "no due date yet"}
                  </p>
                  {a.warnings.map((w) => (
                    <p key={w} className="text-sm text-caution-700">
                      ⚠ {w}
                    </p>
                  ))}
                </li>
              ))}
            </ul>
          </Card>
          {outOfService.length ? (
            <Card title={`Out of service (${outOfService.length})`}>
              <ul className="space-y-1 text-sm">
                {outOfService.map((a) => (
                  <li key={a.id}>
                    <a href={`/inspector/assemblies/${a.id}`}>
                      {a.kind} {a.serial ? `#${a.serial}` : "(no serial)"}
                    </a>{" "}
                    — {a.status} {formatDay(a.removedOn)}
                  </li>
                ))}
              </ul>
            </Card>
          ) : null}
          {canManage ? (
            <Card>
              <details>
                <summary className="cursor-pointer font-semibold text-estuary-700">Add an assembly to this site</summary>
                <div className="mt-4">
                  <AssemblyForm mode="create" siteId={site.id} values={{ kind: "RP", make: "", model: "", size: "", serial: "", location: "", hazard: site.hazard, backpressurePossible: false, installedOn: null, notes: "" }} />
                </div>
              </details>
            </Card>
          ) : null}
        </div>
        <div className="space-y-6">
          <Card title={`Owners and managers (${site.owners.length})`}>
            {site.owners.length === 0 ? <p className="text-ink-600">No contact on file: notices cannot reach anyone.</p> : null}
            <ul className="divide-y divide-ink-100">
              {site.owners.map((o) => (
                <li key={o.ownerId} className="space-y-1 py-3">
                  <p>
                    <a href={`/inspector/owners/${o.ownerId}`} className="font-semibold">
                      {o.name}
                    </a>{" "}
                    <span className="text-sm text-ink-600">({o.relation})</span>
                  </p>
                  <p className="text-sm text-ink-700">{[o.email ?? "no e-mail — notices by letter", o.phone].filter(Boolean).join(" · ")}</p>
                  <p className="text-xs text-ink-600">
                    {o.receivesNotices ? "Receives notices" : "Does not receive notices"} · owner portal: {o.portal === "none" ? "not invited" : o.portal}
                  </p>
                  {canManage ? <OwnerLinkControls siteId={site.id} ownerId={o.ownerId} receivesNotices={o.receivesNotices} canInvite={Boolean(o.email)} portal={o.portal} /> : null}
                </li>
              ))}
            </ul>
            {canManage ? (
              <details className="mt-3">
                <summary className="cursor-pointer font-semibold text-estuary-700">Add a contact</summary>
                <div className="mt-3">
                  <AddOwnerForm siteId={site.id} />
                </div>
              </details>
            ) : null}
          </Card>
          {canManage ? (
            <Card>
              <details>
                <summary className="cursor-pointer font-semibold text-estuary-700">Edit the site</summary>
                <div className="mt-4">
                  <SiteForm
                siteId={site.id}
                facilityTypes={facilityTypes}
                values={{ accountNumber: site.accountNumber, name: site.name, addressLine1: site.addressLine1, addressLine2: site.addressLine2, city: site.city, postalCode: site.postalCode, hazard: site.hazard, facilityType: site.facilityType, contactName: site.contactName, contactPhone: site.contactPhone, notes: site.notes, isActive: site.isActive }}
                  />
                </div>
              </details>
            </Card>
          ) : null}
        </div>
      </div>
    </>
  );
}
