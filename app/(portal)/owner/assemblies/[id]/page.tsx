import type { Metadata } from "next";
import { notFound } from "next/navigation";
import { Alert } from "@/components/ui/alert";
import { ButtonLink } from "@/components/ui/button";
import { Card, PageHeader } from "@/components/ui/card";
import { requirePermission } from "@/lib/auth/guards";
import { NotFoundError } from "@/lib/errors";
import { getOwnerAssembly } from "@/lib/data/owner-portal";
import { StateBadge } from "../../_components/state-badge";

export const metadata: Metadata = { title: "Assembly" };

export default async function OwnerAssemblyPage({ params }: { params: Promise<{ id: string }> }) {
  const actor = await requirePermission("owner.portal");
  const { id } = await params;
  const assemblyId = Number(id);
  if (!Number.isInteger(assemblyId) || assemblyId <= 0) notFound();
  const detail = await getOwnerAssembly(actor, assemblyId).catch((error: unknown) => {
    if (error instanceof NotFoundError) notFound();
    throw error;
  });
  const { site, assembly: a, history, notices } = detail;
  const isFailed = a.state === "failed_awaiting_repair" || a.state === "repair_overdue";
  return (
    <>
      <p className="mb-2 text-sm">
        <a href="/owner">My sites</a> <span className="text-ink-400">/</span> {site.name}
      </p>
      <PageHeader
        title={`${a.kindLabel}`}
        description={`${a.location} · ${site.name}, ${site.addressLine1}, ${site.city} · account ${site.accountNumber}`}
        actions={
          <>
            {a.currentCertificateCode ? <ButtonLink href={`/api/certificates/${a.currentCertificateCode}/pdf`}>Download certificate</ButtonLink> : null}
            <ButtonLink href="/testers" variant="secondary">
              Find a certified tester
            </ButtonLink>
          </>
        }
      />
      <div className="grid gap-6 lg:grid-cols-[2fr_1fr]">
        <div className="space-y-6">
          <Card title={<span className="flex items-center gap-3">Where it stands <StateBadge tone={a.tone} label={a.stateLabel} /></span>}>
            <p className={`text-lg ${a.tone === "fail" ? "font-semibold text-fail-700" : "text-ink-900"}`}>{a.statement}</p>
            {a.reportNote ? (
              <div className="mt-3">
                <Alert tone="warning">{a.reportNote}</Alert>
              </div>
            ) : null}
            {isFailed ? (
              <div className="mt-3">
                <Alert tone="warning" title="About repairs">
                  Repairs mean shutting off the building&apos;s water and opening spring-loaded parts under pressure. They are work for a certified tester or licensed plumber, following the assembly maker&apos;s instructions and local codes. After the repair, the assembly must pass a retest.
                </Alert>
              </div>
            ) : null}
          </Card>

          <Card title={`Test history (${history.length})`}>
            {history.length === 0 ? (
              <p className="text-ink-600">No test of this assembly is on file.</p>
            ) : (
              <ol className="divide-y divide-ink-100">
                {history.map((r) => (
                  <li key={r.id} className="flex flex-col gap-1 py-3 sm:flex-row sm:justify-between sm:gap-4">
                    <div>
                      <p className="font-semibold">
                        {r.testedOnWords}: <span className={r.isPass ? "text-pass-700" : "text-fail-700"}>{r.resultWords}</span>
                      </p>
                      <p className="text-sm text-ink-700">
                        Tested by {r.testerName}
                        {r.testerCompany ? ` (${r.testerCompany})` : ""} · report {r.reportNumber}
                      </p>
                      <p className={`text-sm ${r.status === "returned" ? "font-semibold text-caution-700" : "text-ink-600"}`}>{r.statusWords}</p>
                    </div>
                    <div className="flex shrink-0 flex-col gap-1 text-sm sm:items-end">
                      <a href={r.reportPdfUrl}>Test report (PDF)</a>
                      {r.certificateCode ? <a href={`/api/certificates/${r.certificateCode}/pdf`}>Certificate (PDF)</a> : null}
                    </div>
                  </li>
                ))}
              </ol>
            )}
          </Card>
        </div>

        <div className="space-y-6">
          <Card title="The assembly">
            <dl className="grid grid-cols-[7rem_1fr] gap-x-3 gap-y-1.5 text-sm">
              <dt className="font-semibold text-ink-700">Kind</dt>
              <dd>{a.kindLabel}</dd>
              <dt className="font-semibold text-ink-700">Make, model</dt>
              <dd>{[a.make, a.model].filter(Boolean).join(" ") || "not recorded"}</dd>
              <dt className="font-semibold text-ink-700">Size</dt>
              <dd>{a.size || "not recorded"}</dd>
              <dt className="font-semibold text-ink-700">Serial</dt>
              <dd>{a.serial || "not recorded"}</dd>
              <dt className="font-semibold text-ink-700">Location</dt>
              <dd>{a.location}</dd>
              <dt className="font-semibold text-ink-700">Installed</dt>
              <dd>{a.installedOnWords ?? "not recorded"}</dd>
              <dt className="font-semibold text-ink-700">Next test due</dt>
              <dd>{a.dueOnWords ?? "not known"}</dd>
            </dl>
          </Card>
          <Card title="Notices about it">
            {notices.length === 0 ? (
              <p className="text-sm text-ink-600">The program has sent no notice about this assembly.</p>
            ) : (
              <ul className="space-y-1.5 text-sm">
                {notices.map((n, i) => (
                  <li key={i}>
                    <span className="font-semibold">{n.kindWords}</span>, {n.onWords}, {n.channelWords} ({n.statusWords})
                  </li>
                ))}
              </ul>
            )}
          </Card>
          <Card title="The program">
            <p className="text-sm">
              {site.programName}
              <br />
              {site.programPhone}
              <br />
              <a href={`mailto:${site.programEmail}`}>{site.programEmail}</a>
            </p>
          </Card>
        </div>
      </div>
    </>
  );
}
