import type { Metadata } from "next";
import { Card, PageHeader } from "@/components/ui/card";
import { requirePermission } from "@/lib/auth/guards";
import { programName } from "@/lib/data/programs";

export const metadata: Metadata = { title: "Program admin" };

export default async function AdminHome() {
  const actor = await requirePermission("settings.manage");
  const name = actor.programId ? await programName(actor.programId) : null;
  return (
    <>
      <PageHeader title={name ?? "Program"} description="Program settings, users, notices and the audit log." />
      <div className="grid gap-4 md:grid-cols-2">
        <Card title="Program work">
          <ul className="list-inside list-disc space-y-1">
            <li>
              <a href="/inspector">Inspector&apos;s view of the program</a>
            </li>
            <li>
              <a href="/inspector/testers">Tester roster</a>
            </li>
          </ul>
        </Card>
        <Card title="Administration">
          <ul className="list-inside list-disc space-y-1">
            <li>
              <a href="/admin/mailbox">Mailbox (messages sent in this installation)</a>
            </li>
          </ul>
        </Card>
      </div>
    </>
  );
}
