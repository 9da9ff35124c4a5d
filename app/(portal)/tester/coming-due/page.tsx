import type { Metadata } from "next";
import { ComingDueList } from "@/components/tester/coming-due-list";
import { Card, PageHeader } from "@/components/ui/card";
import { requirePermission } from "@/lib/auth/guards";
import { COMING_DUE_DAYS, listComingDue } from "@/lib/data/tester-coming-due";

export const metadata: Metadata = { title: "Coming due" };

export default async function ComingDuePage() {
  const actor = await requirePermission("tester.home");
  const { today, until, rows } = await listComingDue(actor);
  const repairs = rows.filter((r) => r.why === "repair");
  const due = rows.filter((r) => r.why === "due");
  return (
    <>
      <PageHeader title="Coming due" description={`Assemblies you tested last whose next test falls due between ${today} and ${until} (${COMING_DUE_DAYS} days), and those you failed that still await repair. Call the site contact to book the visit.`} />
      <div className="space-y-6">
        {repairs.length ? (
          <Card title={`Awaiting repair (${repairs.length})`}>
            <ComingDueList rows={repairs} />
          </Card>
        ) : null}
        <Card title={`Due in the next ${COMING_DUE_DAYS} days (${due.length})`}>
          <ComingDueList rows={due} />
        </Card>
      </div>
    </>
  );
}
