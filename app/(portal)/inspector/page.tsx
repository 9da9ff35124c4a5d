import type { Metadata } from "next";
import { Card, PageHeader, StatTile } from "@/components/ui/card";
import { requirePermission } from "@/lib/auth/guards";
import { programName } from "@/lib/data/programs";
import { listTesterApprovals } from "@/lib/data/testers";

export const metadata: Metadata = { title: "Inspector home" };

export default async function InspectorHome() {
  const actor = await requirePermission("reports.review");
  const pending = await listTesterApprovals(actor, { status: "pending" });
  const name = actor.programId ? await programName(actor.programId) : null;
  return (
    <>
      <PageHeader title={name ?? "Program"} description="The cross-connection control program at a glance." />
      <div className="grid gap-4 sm:grid-cols-2 lg:grid-cols-4">
        <StatTile label="Tester registrations to check" value={pending.length} tone={pending.length ? "caution" : "neutral"} href="/inspector/testers" />
      </div>
      <div className="mt-6">
        <Card title="Work">
          <ul className="list-inside list-disc space-y-1">
            <li>
              <a href="/inspector/testers">Tester roster and registrations</a>
            </li>
          </ul>
        </Card>
      </div>
    </>
  );
}
