import type { Metadata } from "next";
import { ReturnReasonsEditor } from "@/components/admin/return-reasons-editor";
import { Card, PageHeader } from "@/components/ui/card";
import { requirePermission } from "@/lib/auth/guards";
import { listReturnReasons } from "@/lib/data/settings";

export const metadata: Metadata = { title: "Return reasons" };

export default async function ReturnReasonsPage() {
  const actor = await requirePermission("settings.manage");
  const reasons = await listReturnReasons(actor, { includeInactive: true });
  return (
    <>
      <p className="mb-2 text-sm">
        <a href="/admin/settings">← Program settings</a>
      </p>
      <PageHeader title="Return reasons" description="The reasons inspectors pick from when they return a report; the tester receives the reason and what to do. A reason is never deleted: reports keep the words they were returned with, and a retired reason just leaves the list." />
      <Card>
        <ReturnReasonsEditor reasons={reasons.map((r) => ({ id: r.id, label: r.label, guidance: r.guidance, isActive: r.isActive }))} />
      </Card>
    </>
  );
}
