import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { AssemblyHistoryView } from "@/components/inspector/assembly-history";
import { formatDay, hazardShort, noticeStageLabel, stateLabel, stateTone } from "@/components/inspector/format";
import { AssemblyForm, AssemblyStatusForm, MergeForm } from "@/components/inspector/inventory-forms";
import { Alert } from "@/components/ui/alert";
import { Badge } from "@/components/ui/badge";
import { Card, PageHeader } from "@/components/ui/card";
import { requirePermission } from "@/lib/auth/guards";
import { can } from "@/lib/auth/permissions";
import { getAssemblyForStaff, listMergeCandidates } from "@/lib/data/inventory-assemblies";
import { NotFoundError } from "@/lib/errors";

export const metadata: Metadata = { title: "Assembly" };

export default async function AssemblyPage({ params }: { params: Promise<{ id: string }> }) {
  const actor = await requirePermission("inventory.view");
  const id = Number((await params).id);
  if (!Number.isInteger(id) || id <= 0) notFound();
  const a = await getAssemblyForStaff(actor, id).catch((error: unknown) => {
    if (error instanceof NotFoundError) notFound();
    throw error;
  });
  const canManage = can(actor, "inventory.manage") && a.mergedIntoId === null;
  const isAwaiting = a.status === "awaiting_confirmation";
  const candidates = isAwaiting && canManage ? await listMergeCandidates(actor, a.id) : [];
  const values = { kind: a.kind, make: a.make, model: a.model, size: a.size, serial: a.serial, location: a.location, hazard: a.hazard, backpressurePossible: a.backpressurePossible, installedOn: a.installedOn, notes: a.notes };
  return (
    <>
      <p className="mb-2 text-sm">
        <a href={`/inspector/sites/${a.siteId}`}>← {a.site.name}</a>
      </p>
      <PageHeader
        title={
          <span className="flex flex-wrap items-center gap-3">
            {a.kind} {a.serial ? `#${a.serial}` : "(no serial)"}
            {isAwaiting ? <Badge tone="brand">Field registration to confirm</Badge> : a.status === "active" ? <Badge tone={stateTone[a.state]}>{stateLabel[a.state]}</Badge> : <Badge tone="neutral">{a.mergedIntoId ? "Merged" : a.status === "replaced" ? "Replaced" : "Removed"}</Badge>}
          </span>
        }
        description={`${[a.make, a.model, a.size].filter(Boolean).join(" · ") || "make and model not recorded"} · ${a.location || "location not recorded"} · ${a.site.name}, ${a.site.address} (account ${a.site.accountNumber})`}
      />
      {a.mergedIntoId ? (
        <div className="mb-4">
          <Alert tone="info" title="Merged">
            This field registration was merged into <a href={`/inspector/assemblies/${a.mergedIntoId}`}>assembly #{a.mergedIntoId}</a>; its reports are there.
          </Alert>
        </div>
      ) : null}
      {a.warnings.length ? (
        <div className="mb-4">
          <Alert tone="warning" title="The kind of assembly and the hazard">
            <ul className="space-y-1">
              {a.warnings.map((w) => (
                <li key={w}>{w}</li>
              ))}
            </ul>
            <p className="mt-2 text-xs">The purveyor decides the protection a service needs; local codes govern.</p>
          </Alert>
        </div>
      ) : null}
      <div className="grid gap-6 lg:grid-cols-[minmax(0,3fr)_minmax(0,2fr)]">
        <div className="space-y-6">
          <Card title="Where it stands">
            <dl className="grid gap-4 text-sm sm:grid-cols-3">
              <div>
                <dt className="text-xs font-semibold uppercase text-ink-600">Last test</dt>
                <dd>{a.lastTestedOn ? `${formatDay(a.lastTestedOn)} · ${a.lastOutcome === "pass" ? "passed" : "failed"}` : "none on file"}</dd>
              </div>
              <div>
                <dt className="text-xs font-semibold uppercase text-ink-600">Last pass</dt>
                <dd>{formatDay(a.lastPassedOn) || "—"}</dd>
              </div>
              <div>
                <dt className="text-xs font-semibold uppercase text-ink-600">{a.repairDueOn ? "Repair and retest due" : "Next test due"}</dt>
                <dd className="font-semibold">{formatDay(a.repairDueOn ?? a.nextDueOn) || "—"}</dd>
              </div>
              <div>
                <dt className="text-xs font-semibold uppercase text-ink-600">Installed</dt>
                <dd>{formatDay(a.installedOn) || "unknown"}</dd>
              </div>
              <div>
                <dt className="text-xs font-semibold uppercase text-ink-600">Hazard</dt>
                <dd>
                  {hazardShort[a.hazard]} (site: {hazardShort[a.site.hazard] ?? a.site.hazard}){a.backpressurePossible ? " · backpressure possible" : ""}
                </dd>
              </div>
              <div>
                <dt className="text-xs font-semibold uppercase text-ink-600">Notices</dt>
                <dd>{a.noticeStage ? noticeStageLabel[a.noticeStage] : "none this cycle"}</dd>
              </div>
              {a.removedOn ? (
                <div>
                  <dt className="text-xs font-semibold uppercase text-ink-600">Out of service since</dt>
                  <dd>{formatDay(a.removedOn)}</dd>
                </div>
              ) : null}
              {a.replacedBy ? (
                <div>
                  <dt className="text-xs font-semibold uppercase text-ink-600">Replaced by</dt>
                  <dd>
                    <a href={`/inspector/assemblies/${a.replacedBy.id}`}>{a.replacedBy.label}</a>
                  </dd>
                </div>
              ) : null}
              {a.replaces.length ? (
                <div>
                  <dt className="text-xs font-semibold uppercase text-ink-600">Replaces</dt>
                  <dd>
                    {a.replaces.map((r) => (
                      <a key={r.id} href={`/inspector/assemblies/${r.id}`} className="block">
                        {r.label}
                      </a>
                    ))}
                  </dd>
                </div>
              ) : null}
              {a.registeredBy ? (
                <div>
                  <dt className="text-xs font-semibold uppercase text-ink-600">Registered from the field by</dt>
                  <dd>{a.registeredBy}</dd>
                </div>
              ) : null}
            </dl>
            {a.notes ? <p className="mt-4 whitespace-pre-line text-sm text-ink-700">{a.notes}</p> : null}
          </Card>
          <Card title="Test history">
            <AssemblyHistoryView history={a.history} />
          </Card>
        </div>
        <div className="space-y-6">
          {isAwaiting && canManage ? (
            <>
              <Card title="Confirm the registration">
                <p className="mb-3 text-sm text-ink-600">Check the details against the data plate or the tester&apos;s photo, correct them if needed, and confirm: the assembly then counts in the inventory and its due dates run.</p>
                <AssemblyForm mode="confirm" assemblyId={a.id} values={values} />
              </Card>
              <Card title="…or merge it into one already on file">
                <p className="mb-3 text-sm text-ink-600">When the tester registered an assembly the program already has, its reports move to that one and this registration is kept out of service.</p>
                <MergeForm assemblyId={a.id} candidates={candidates} />
              </Card>
            </>
          ) : null}
          {!isAwaiting && canManage ? (
            <>
              <Card title="Edit the record">
                <AssemblyForm mode="edit" assemblyId={a.id} values={values} />
              </Card>
              <Card title={a.status === "active" ? "Removed or replaced?" : "Back in service?"}>
                <AssemblyStatusForm assemblyId={a.id} status={a.status} today={a.today} hazard={a.hazard} />
              </Card>
            </>
          ) : null}
        </div>
      </div>
    </>
  );
}
