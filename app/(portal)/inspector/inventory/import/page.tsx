import type { Metadata } from "next";
import { formatInstant } from "@/components/inspector/format";
import { ImportWizard } from "@/components/inspector/import-wizard";
import { Card, PageHeader } from "@/components/ui/card";
import { requirePermission } from "@/lib/auth/guards";
import { listImportJobs } from "@/lib/data/import-jobs";
import { getStaffProgramContext } from "@/lib/data/settings";

export const metadata: Metadata = { title: "Import an inventory" };

export default async function ImportPage({ searchParams }: { searchParams: Promise<{ job?: string }> }) {
  const actor = await requirePermission("inventory.import");
  const [jobs, context] = await Promise.all([listImportJobs(actor, 10), getStaffProgramContext(actor)]);
  const requested = Number((await searchParams).job);
  const shown = Number.isInteger(requested) ? jobs.find((j) => j.id === requested) : undefined;
  return (
    <>
      <p className="mb-2 text-sm">
        <a href="/inspector/inventory">← Inventory</a>
      </p>
      <PageHeader
        title="Import an inventory"
        description="Bring an existing list of sites, owners and assemblies in from a spreadsheet. Every row is checked first; rows with a problem are left out and listed in a report you can download, fix and import again. Importing the same file twice adds nothing twice: sites match on their account number, assemblies on make and serial (or on site and location)."
      />
      <ImportWizard initialJobId={shown?.id} initialJobFile={shown?.fileName} />
      <div className="mt-8">
        <Card title="Recent imports">
          {jobs.length === 0 ? (
            <p className="text-ink-600">No import yet.</p>
          ) : (
            <table className="w-full text-left text-sm">
              <thead className="border-b border-ink-200 text-xs uppercase tracking-wide text-ink-600">
                <tr>
                  <th className="py-2 pr-3">File</th>
                  <th className="py-2 pr-3">Started</th>
                  <th className="py-2 pr-3">By</th>
                  <th className="py-2 pr-3">Rows</th>
                  <th className="py-2">Result</th>
                </tr>
              </thead>
              <tbody className="divide-y divide-ink-100">
                {jobs.map((job) => (
                  <tr key={job.id} className="align-top">
                    <td className="py-2 pr-3">
                      <a href={`/inspector/inventory/import?job=${job.id}`}>{job.fileName}</a>
                    </td>
                    <td className="py-2 pr-3">{formatInstant(job.startedAt, context.timezone)}</td>
                    <td className="py-2 pr-3">{job.startedBy}</td>
                    <td className="py-2 pr-3 tabular-nums">{job.totalRows.toLocaleString("en-US")}</td>
                    <td className="py-2">
                      {job.status === "running" ? `running (${job.processedRows.toLocaleString("en-US")} done)` : job.message}
                      {job.errorFileId ? (
                        <>
                          {" "}
                          <a href={`/api/files/${job.errorFileId}`}>rows not imported (CSV)</a>
                        </>
                      ) : null}
                    </td>
                  </tr>
                ))}
              </tbody>
            </table>
          )}
        </Card>
      </div>
    </>
  );
}
