import type { Metadata } from "next";
import { MonthlyBars } from "@/components/charts/monthly-bars";
import { ComplianceStrip } from "@/components/inspector/compliance-strip";
import { formatCount, plural } from "@/components/inspector/format";
import { Card, PageHeader, StatTile } from "@/components/ui/card";
import { requirePermission } from "@/lib/auth/guards";
import { can } from "@/lib/auth/permissions";
import { getComplianceCounts, getMonthlyTests } from "@/lib/data/compliance";
import { listImportJobs } from "@/lib/data/import-jobs";
import { getInventoryCounts } from "@/lib/data/inventory-search";
import { getQueueStats } from "@/lib/data/review-queue";
import { getStaffProgramContext } from "@/lib/data/settings";
import { listTesterApprovals } from "@/lib/data/testers";

export const metadata: Metadata = { title: "Inspector home" };

export default async function InspectorHome() {
  const actor = await requirePermission("reports.review");
  const [context, queue, pending, inventory, compliance, months, imports] = await Promise.all([
    getStaffProgramContext(actor),
    getQueueStats(actor),
    listTesterApprovals(actor, { status: "pending" }),
    getInventoryCounts(actor),
    getComplianceCounts(actor),
    getMonthlyTests(actor),
    can(actor, "inventory.import") ? listImportJobs(actor, 3) : Promise.resolve([]),
  ]);
  const oldestDays = queue.oldestSubmittedAt ? Math.floor((Date.now() - Date.parse(queue.oldestSubmittedAt)) / 86_400_000) : 0;
  const lastYear = months.slice(-12);
  const thisYearFiled = lastYear.reduce((sum, m) => sum + m.filed, 0);
  return (
    <>
      <PageHeader title={context.name} description={`The cross-connection control program on ${context.today}: what waits for you, and where the program stands.`} />
      <section aria-labelledby="work-heading" className="space-y-3">
        <h2 id="work-heading">Waiting for you</h2>
        <div className="grid gap-4 sm:grid-cols-2 lg:grid-cols-5">
          <StatTile label={queue.waiting ? `Reports to review · oldest ${plural(oldestDays, "day")}` : "Reports to review"} value={formatCount(queue.waiting)} tone={oldestDays > 7 ? "fail" : queue.waiting ? "caution" : "pass"} href="/inspector/reports" />
          <StatTile label="Clean passes, ready to accept" value={formatCount(queue.cleanPasses)} tone="brand" href="/inspector/reports?flags=clean" />
          <StatTile label="Reports with findings" value={formatCount(queue.flagged)} tone={queue.flagged ? "caution" : "neutral"} href="/inspector/reports?flags=flagged" />
          <StatTile label="Tester registrations to check" value={formatCount(pending.length)} tone={pending.length ? "caution" : "neutral"} href="/inspector/testers?status=pending" />
          <StatTile label="Field registrations to confirm" value={formatCount(inventory.awaitingConfirmation)} tone={inventory.awaitingConfirmation ? "caution" : "neutral"} href="/inspector/inventory?view=assemblies&show=awaiting" />
        </div>
      </section>

      <div className="mt-8 grid gap-6 xl:grid-cols-[minmax(0,3fr)_minmax(0,2fr)]">
        <Card title="Compliance today" actions={<a href="/inspector/compliance">Open the compliance picture</a>}>
          <ComplianceStrip counts={compliance} dueSoonDays={context.rules.dueSoonDays} listHref={(state) => `/inspector/compliance?list=${state}#list`} />
        </Card>
        <Card title="Inventory" actions={<a href="/inspector/inventory">Search the inventory</a>}>
          <dl className="grid grid-cols-2 gap-4 text-sm">
            <div>
              <dt className="text-ink-600">Sites</dt>
              <dd className="text-2xl font-bold tabular-nums">{formatCount(inventory.sites)}</dd>
            </div>
            <div>
              <dt className="text-ink-600">Assemblies in service</dt>
              <dd className="text-2xl font-bold tabular-nums">{formatCount(inventory.inService)}</dd>
            </div>
            <div>
              <dt className="text-ink-600">Kind does not match the hazard</dt>
              <dd className="text-2xl font-bold tabular-nums">
                <a href="/inspector/inventory?view=assemblies&show=mismatch" className={inventory.mismatches ? "text-caution-700" : "text-ink-900"}>
                  {formatCount(inventory.mismatches)}
                </a>
              </dd>
            </div>
            <div>
              <dt className="text-ink-600">Out of service</dt>
              <dd className="text-2xl font-bold tabular-nums">{formatCount(inventory.outOfService)}</dd>
            </div>
          </dl>
          {imports.length ? (
            <div className="mt-4 border-t border-ink-100 pt-3 text-sm">
              <p className="font-semibold">Recent imports</p>
              <ul className="mt-1 space-y-1">
                {imports.map((job) => (
                  <li key={job.id}>
                    <a href={`/inspector/inventory/import?job=${job.id}`}>{job.fileName}</a> · {job.status === "running" ? `running, ${job.processedRows} of ${job.totalRows}` : job.message ?? job.status}
                  </li>
                ))}
              </ul>
            </div>
          ) : null}
          <p className="mt-4 text-sm">
            <a href="/inspector/inventory/import">Import an inventory CSV</a>
          </p>
        </Card>
      </div>

      <div className="mt-6">
        <Card title={`Tests filed per month · ${formatCount(thisYearFiled)} in the last 12 months`} actions={<a href="/inspector/summary">Yearly summary for the state</a>}>
          <MonthlyBars months={months} title="Tests filed, passed and failed per month over the last two years" />
        </Card>
      </div>
    </>
  );
}
