import type { Metadata } from "next";
import { Alert } from "@/components/ui/alert";
import { ButtonLink } from "@/components/ui/button";
import { Card, PageHeader, StatTile } from "@/components/ui/card";
import { requirePermission } from "@/lib/auth/guards";
import { getOwnerOverview } from "@/lib/data/owner-portal";
import { ContactEmailForm } from "./_components/contact-email-form";
import { StateBadge } from "./_components/state-badge";

export const metadata: Metadata = { title: "My sites" };

export default async function OwnerHome() {
  const actor = await requirePermission("owner.portal");
  const { sites, actions, counts, needsEmail } = await getOwnerOverview(actor);
  const assemblyCount = sites.reduce((n, s) => n + s.assemblies.length, 0);
  return (
    <>
      <PageHeader
        title="My sites"
        description="Each backflow assembly at your properties, where it stands with the water program, and what to do next."
        actions={
          <ButtonLink href="/testers" variant="secondary">
            Find a certified tester
          </ButtonLink>
        }
      />
      <div className="space-y-6">
        {needsEmail ? (
          <Card title="Get notices by e-mail">
            <p className="mb-3 text-ink-700">
              You signed in with the code from a letter. Add an e-mail address and the program&apos;s next notices come by e-mail, each with a link that signs you in.
            </p>
            <ContactEmailForm />
          </Card>
        ) : null}

        {assemblyCount > 0 ? (
          <div className="grid grid-cols-2 gap-3 md:grid-cols-4">
            <StatTile label="In compliance" value={counts.current} tone="pass" />
            <StatTile label="Due within 30 days" value={counts.due_soon} tone="caution" />
            <StatTile label="Overdue" value={counts.overdue + counts.repair_overdue} tone="fail" />
            <StatTile label="Failed, awaiting repair" value={counts.failed_awaiting_repair} tone="caution" />
          </div>
        ) : null}

        {actions.length > 0 ? (
          <Card title={`What needs doing (${actions.length})`}>
            <ul className="divide-y divide-ink-100">
              {actions.map((action) => (
                <li key={action.assemblyId} className="flex flex-col gap-1 py-3 sm:flex-row sm:items-start sm:justify-between sm:gap-4">
                  <div>
                    <p className={action.tone === "fail" ? "font-semibold text-fail-700" : "font-semibold text-ink-900"}>{action.text}</p>
                    {action.note ? <p className="mt-1 text-sm text-caution-700">{action.note}</p> : null}
                    <p className="text-sm text-ink-600">{action.siteName}</p>
                  </div>
                  <a href={`/owner/assemblies/${action.assemblyId}`} className="shrink-0 text-sm font-semibold">
                    Details and history
                  </a>
                </li>
              ))}
            </ul>
            <p className="mt-3 text-sm text-ink-600">
              A certified tester tests the assembly and files the report with the program; you do not send anything yourself. <a href="/testers">Find a certified tester</a>.
            </p>
          </Card>
        ) : assemblyCount > 0 ? (
          <Alert tone="success" title="Everything is in order">
            Every assembly at your sites is in compliance. The program reminds you before the next test is due.
          </Alert>
        ) : null}

        {sites.map((site) => (
          <Card
            key={site.id}
            title={
              <span>
                {site.name}
                <span className="block text-sm font-normal text-ink-600">
                  {site.addressLine1}, {site.city} · account {site.accountNumber} · {site.programName}
                </span>
              </span>
            }
          >
            {site.assemblies.length === 0 ? (
              <p className="text-ink-600">No assemblies are recorded at this site.</p>
            ) : (
              <>
                {/* Phones: one block per assembly. */}
                <ul className="divide-y divide-ink-100 sm:hidden">
                  {site.assemblies.map((a) => (
                    <li key={a.id} className="space-y-1 py-3">
                      <a href={`/owner/assemblies/${a.id}`} className="block font-semibold">
                        {a.kindLabel}
                      </a>
                      <p className="text-sm text-ink-600">
                        {a.location}
                        {a.serial ? ` · serial ${a.serial}` : ""}
                      </p>
                      <p className="flex flex-wrap items-center gap-2 text-sm">
                        <StateBadge tone={a.tone} label={a.reportState === "returned" && a.state === "current" ? "Current; report returned" : a.stateLabel} />
                        <span>{a.state === "failed_awaiting_repair" || a.state === "repair_overdue" ? `Repair by ${a.repairDueOnWords}` : a.dueOnWords ? `Due by ${a.dueOnWords}` : ""}</span>
                      </p>
                      {a.currentCertificateCode ? (
                        <a href={`/api/certificates/${a.currentCertificateCode}/pdf`} className="inline-block min-h-11 py-2 text-sm font-semibold">
                          Certificate (PDF)
                        </a>
                      ) : null}
                    </li>
                  ))}
                </ul>
                <div className="-mx-5 hidden overflow-x-auto sm:block">
                  <table className="w-full min-w-[40rem] text-left text-sm">
                    <thead className="border-b border-ink-100 text-xs uppercase tracking-wide text-ink-600">
                      <tr>
                        <th className="px-5 py-2 font-semibold">Assembly</th>
                        <th className="px-3 py-2 font-semibold">Status</th>
                        <th className="px-3 py-2 font-semibold">Due by</th>
                        <th className="px-3 py-2 font-semibold">Last test</th>
                        <th className="px-5 py-2 font-semibold">
                          <span className="sr-only">Links</span>
                        </th>
                      </tr>
                    </thead>
                    <tbody className="divide-y divide-ink-100">
                      {site.assemblies.map((a) => (
                        <tr key={a.id} className="align-top">
                          <td className="px-5 py-3">
                            <a href={`/owner/assemblies/${a.id}`} className="font-semibold">
                              {a.kindLabel}
                            </a>
                            <span className="block text-ink-600">
                              {a.location}
                              {a.serial ? ` · serial ${a.serial}` : ""}
                            </span>
                          </td>
                          <td className="px-3 py-3">
                            <StateBadge tone={a.tone} label={a.reportState === "returned" && a.state === "current" ? "Current; report returned" : a.stateLabel} />
                          </td>
                          <td className="px-3 py-3 whitespace-nowrap">
                            {a.state === "failed_awaiting_repair" || a.state === "repair_overdue" ? `Repair by ${a.repairDueOnWords}` : (a.dueOnWords ?? "—")}
                          </td>
                          <td className="px-3 py-3 whitespace-nowrap">{a.lastTestedOnWords ?? "none on file"}</td>
                          <td className="px-5 py-3 text-right whitespace-nowrap">
                            {a.currentCertificateCode ? (
                              <a href={`/api/certificates/${a.currentCertificateCode}/pdf`}>Certificate (PDF)</a>
                            ) : (
                              <span className="text-ink-400">No current certificate</span>
                            )}
                          </td>
                        </tr>
                      ))}
                    </tbody>
                  </table>
                </div>
              </>
            )}
            <p className="mt-3 text-sm text-ink-600">
              Questions? {site.programName}: {site.programPhone} · <a href={`mailto:${site.programEmail}`}>{site.programEmail}</a>
            </p>
          </Card>
        ))}

        {sites.length === 0 ? (
          <Alert tone="info" title="No sites yet">
            No sites are linked to your account. If you received a notice or a letter from a water program, use the link or the code in it, or call the program office.
          </Alert>
        ) : null}
      </div>
    </>
  );
}
